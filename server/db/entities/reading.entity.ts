import { EntitySchema } from "typeorm";
import type { Quantity } from "../../../shared/schemas/quantities.js";

/**
 * One stored value (SI units). The primary key (sensor, quantity, time) makes a re-sent reading
 * land once; WITHOUT ROWID keeps a series contiguous on disk. bench_id is the bench the sensor was
 * on when it measured, so a probe moved later keeps its old readings on the old bench.
 */
export interface Reading {
  sensorId: string;
  quantity: Quantity;
  timeMs: number;
  value: number;
  benchId: number | null;
}

export const ReadingEntity = new EntitySchema<Reading>({
  name: "Reading",
  tableName: "reading",
  withoutRowid: true,
  columns: {
    sensorId: { type: "varchar", name: "sensor_id", primary: true, length: 64 },
    quantity: { type: "varchar", primary: true, length: 32 },
    timeMs: { type: "integer", name: "time_ms", primary: true },
    value: { type: "real" },
    benchId: { type: "integer", name: "bench_id", nullable: true },
  },
  indices: [{ name: "idx_reading_bench_quantity_time", columns: ["benchId", "quantity", "timeMs"] }],
});

/** The newest reading per sensor and quantity, kept up to date at ingest for the dashboard. */
export interface LatestReading {
  sensorId: string;
  quantity: Quantity;
  timeMs: number;
  value: number;
  benchId: number | null;
}

export const LatestReadingEntity = new EntitySchema<LatestReading>({
  name: "LatestReading",
  tableName: "latest_reading",
  columns: {
    sensorId: { type: "varchar", name: "sensor_id", primary: true, length: 64 },
    quantity: { type: "varchar", primary: true, length: 32 },
    timeMs: { type: "integer", name: "time_ms" },
    value: { type: "real" },
    benchId: { type: "integer", name: "bench_id", nullable: true },
  },
  indices: [{ name: "idx_latest_reading_bench", columns: ["benchId"] }],
});

/**
 * min/sum/max/count of a bench's readings of one quantity over one aligned interval (1 min,
 * 15 min or 1 h, epoch-aligned), kept up to date at ingest in the same transaction as the readings,
 * so a long chart reads a bounded number of rows. The mean is sum / count.
 */
export interface ReadingRollup {
  benchId: number;
  quantity: Quantity;
  resolutionMs: number;
  startMs: number;
  min: number;
  max: number;
  sum: number;
  count: number;
}

export const ReadingRollupEntity = new EntitySchema<ReadingRollup>({
  name: "ReadingRollup",
  tableName: "reading_rollup",
  withoutRowid: true,
  columns: {
    benchId: { type: "integer", name: "bench_id", primary: true },
    quantity: { type: "varchar", primary: true, length: 32 },
    resolutionMs: { type: "integer", name: "resolution_ms", primary: true },
    startMs: { type: "integer", name: "start_ms", primary: true },
    min: { type: "real" },
    max: { type: "real" },
    sum: { type: "real" },
    count: { type: "integer" },
  },
});

/**
 * Hours of a bench's rollups that no longer match its readings because readings were re-filed to
 * another bench (a back-dated sensor move). A trigger on reading.bench_id fills it; the readings
 * repository rebuilds those hours from the readings before it serves a series.
 */
export interface ReadingRollupStale {
  benchId: number;
  quantity: Quantity;
  hourMs: number;
}

export const ReadingRollupStaleEntity = new EntitySchema<ReadingRollupStale>({
  name: "ReadingRollupStale",
  tableName: "reading_rollup_stale",
  withoutRowid: true,
  columns: {
    benchId: { type: "integer", name: "bench_id", primary: true },
    quantity: { type: "varchar", primary: true, length: 32 },
    hourMs: { type: "integer", name: "hour_ms", primary: true },
  },
});
