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
