import type { DataSource } from "typeorm";
import { dewPointC, vapourPressureDeficitKPa } from "../../../shared/domain/psychrometrics.js";
import { nightMinMax, timeInWindow, type GapRule, type Period, type TimedValue, type TimeInWindow } from "../../../shared/domain/time-in-window.js";
import type { WindowedQuantity } from "../../../shared/schemas/quantities.js";
import { Statements } from "../../db/statements.js";

/** Whole minutes at least, so a short period never splits into slivers. */
const MIN_BUCKET_MS = 60_000;

export interface SampledSeries {
  samples: TimedValue[];
  /** True when the readings were read as bucket means (too many to walk one by one). */
  sampled: boolean;
  gapRule: GapRule;
}

export interface AirPair {
  timeMs: number;
  tC: number;
  rhPct: number;
}

export interface AirMoistureExtremes {
  pairCount: number;
  dewPoint: { min: TimedValue; max: TimedValue } | null;
  vpd: { min: TimedValue; max: TimedValue } | null;
  dewPointMargin: TimedValue | null;
  sampled: boolean;
}

const WHERE = `bench_id = @benchId AND quantity = @quantity AND time_ms >= @fromMs AND time_ms < @toMs`;
// Air temperature and humidity of one probe at one time (one SenML pack); the primary key serves the join.
const PAIRS = `FROM reading t JOIN reading h ON h.sensor_id = t.sensor_id AND h.quantity = 'air.humidity' AND h.time_ms = t.time_ms
  WHERE t.bench_id = @benchId AND t.quantity = 'air.temperature' AND t.time_ms >= @fromMs AND t.time_ms < @toMs`;

// Both databases divide a bigint by a bigint as integers; the cast is for SQLite, where JS numbers
// bind as REAL (STACK.md). Rows at the same time are ordered by sensor, so a hold ends the same way on both.
const ENVIRONMENT_SQL = {
  count: `SELECT COUNT(*) AS n FROM reading WHERE ${WHERE}`,
  raw: `SELECT time_ms AS "timeMs", value FROM reading WHERE ${WHERE} ORDER BY time_ms, sensor_id`,
  buckets: `SELECT CAST((time_ms - @fromMs) / @bucketMs AS INTEGER) AS bucket, AVG(value) AS value
              FROM reading WHERE ${WHERE} GROUP BY bucket ORDER BY bucket`,
  // SQLite fills the bare column (time_ms) from the row that holds the MIN / MAX, the earliest of
  // equal ones (it walks the time index); PostgreSQL has no bare columns and sorts for the same row.
  min: {
    sqlite: `SELECT MIN(value) AS value, time_ms AS "timeMs", COUNT(*) AS n FROM reading WHERE ${WHERE}`,
    postgres: `SELECT value, time_ms AS "timeMs", COUNT(*) OVER () AS n FROM reading WHERE ${WHERE} ORDER BY value, time_ms LIMIT 1`,
  },
  max: {
    sqlite: `SELECT MAX(value) AS value, time_ms AS "timeMs" FROM reading WHERE ${WHERE}`,
    postgres: `SELECT value, time_ms AS "timeMs" FROM reading WHERE ${WHERE} ORDER BY value DESC, time_ms LIMIT 1`,
  },
  pairCount: `SELECT COUNT(*) AS n ${PAIRS}`,
  pairs: `SELECT t.time_ms AS "timeMs", t.value AS "tC", h.value AS "rhPct" ${PAIRS} ORDER BY t.time_ms, t.sensor_id`,
  pairBuckets: `SELECT CAST((t.time_ms - @fromMs) / @bucketMs AS INTEGER) AS bucket, t.sensor_id AS "sensorId",
                       AVG(t.value) AS "tC", AVG(h.value) AS "rhPct", MIN(t.time_ms) AS "timeMs"
                  ${PAIRS} GROUP BY bucket, t.sensor_id ORDER BY bucket, t.sensor_id`,
};

/**
 * What the readings of a bench say over a period, read with hand-written SQL on SQLite's raw handle
 * or PostgreSQL's pool (the reading table is the big one; STACK.md). Extremes are exact SQL MIN/MAX.
 * Time in window runs the shared sample-and-hold computation (shared/domain/time-in-window.ts) over
 * the readings when there are at most `maxSamples` of them, else over bucket means (SQL GROUP BY), so
 * memory and time stay bounded however long the period.
 *
 * A silence longer than `gapLimitMs` (the sensor-silent delay) counts as no data.
 */
export class BenchEnvironment {
  private readonly sql: Statements<keyof typeof ENVIRONMENT_SQL>;

  constructor(
    dataSource: DataSource,
    private readonly gapLimitMs: number,
  ) {
    this.sql = new Statements(dataSource, ENVIRONMENT_SQL);
  }

  private bucketMs(period: Period, maxSamples: number): number {
    return Math.max(MIN_BUCKET_MS, Math.ceil((period.toMs - period.fromMs) / maxSamples / MIN_BUCKET_MS) * MIN_BUCKET_MS);
  }

  /** Lowest and highest reading of a quantity in [fromMs, toMs); null without readings. */
  async extremes(benchId: number, quantity: WindowedQuantity, period: Period): Promise<{ min: TimedValue; max: TimedValue; count: number } | null> {
    const args = { benchId, quantity, fromMs: period.fromMs, toMs: period.toMs };
    const min = await this.sql.get<{ value: number | null; timeMs: number | null; n: number }>("min", args);
    if (!min || min.value === null || min.timeMs === null || min.n === 0) return null;
    const max = (await this.sql.get<{ value: number; timeMs: number }>("max", args))!;
    return { min: { value: min.value, timeMs: min.timeMs }, max: { value: max.value, timeMs: max.timeMs }, count: min.n };
  }

  /**
   * The readings of a quantity around a period — from one gap limit before it to one after, since
   * those decide the holds across its edges — raw, or as bucket means (at bucket starts) when more
   * than `maxSamples`. With buckets the gap limit grows to 1.5 buckets, so a missing bucket is no data.
   */
  async series(benchId: number, quantity: WindowedQuantity, period: Period, maxSamples: number): Promise<SampledSeries> {
    const args = { benchId, quantity, fromMs: period.fromMs - this.gapLimitMs, toMs: period.toMs + this.gapLimitMs };
    const { n } = (await this.sql.get<{ n: number }>("count", args))!;
    if (n <= maxSamples) {
      return { samples: await this.sql.all<TimedValue>("raw", args), sampled: false, gapRule: { expectedIntervalMs: this.gapLimitMs, gapMultiple: 1 } };
    }
    const bucketMs = this.bucketMs({ fromMs: args.fromMs, toMs: args.toMs }, maxSamples);
    const rows = await this.sql.all<{ bucket: number; value: number }>("buckets", { ...args, bucketMs });
    return {
      samples: rows.map((r) => ({ timeMs: args.fromMs + r.bucket * bucketMs, value: r.value })),
      sampled: true,
      gapRule: { expectedIntervalMs: Math.max(this.gapLimitMs, 1.5 * bucketMs), gapMultiple: 1 },
    };
  }

  /**
   * Time inside, below and above a window over a period (shared time-in-window), with the sampling
   * flag. `window` null: every minute with data counts as inside (nothing to be out of).
   */
  async timeInWindow(
    benchId: number,
    quantity: WindowedQuantity,
    window: { min: number; max: number } | null,
    period: Period,
    maxSamples: number,
  ): Promise<{ result: TimeInWindow; sampled: boolean }> {
    const series = await this.series(benchId, quantity, period, maxSamples);
    const result = timeInWindow(series.samples, window ?? { min: -Infinity, max: Infinity }, period, series.gapRule);
    return { result, sampled: series.sampled };
  }

  /** Dew point, VPD and the smallest air − dew point over the period, from paired air readings. */
  async airMoisture(benchId: number, period: Period, maxPairs: number): Promise<AirMoistureExtremes> {
    const args = { benchId, fromMs: period.fromMs, toMs: period.toMs };
    const { n } = (await this.sql.get<{ n: number }>("pairCount", args))!;
    let pairs: AirPair[];
    let sampled = false;
    if (n <= maxPairs) pairs = await this.sql.all<AirPair>("pairs", args);
    else {
      pairs = await this.sql.all<AirPair>("pairBuckets", { ...args, bucketMs: this.bucketMs(period, maxPairs) });
      sampled = true;
    }
    const dew: TimedValue[] = [];
    const vpd: TimedValue[] = [];
    const margin: TimedValue[] = [];
    for (const p of pairs) {
      const td = dewPointC(p.tC, p.rhPct);
      const d = vapourPressureDeficitKPa(p.tC, p.rhPct);
      if (td !== undefined) {
        dew.push({ timeMs: p.timeMs, value: td });
        margin.push({ timeMs: p.timeMs, value: p.tC - td });
      }
      if (d !== undefined) vpd.push({ timeMs: p.timeMs, value: d });
    }
    const all = { fromMs: -Infinity, toMs: Infinity };
    const dewExtremes = nightMinMax(dew, all);
    const vpdExtremes = nightMinMax(vpd, all);
    const marginExtremes = nightMinMax(margin, all);
    return {
      pairCount: n,
      dewPoint: dewExtremes ? { min: dewExtremes.min, max: dewExtremes.max } : null,
      vpd: vpdExtremes ? { min: vpdExtremes.min, max: vpdExtremes.max } : null,
      dewPointMargin: marginExtremes?.min ?? null,
      sampled,
    };
  }
}
