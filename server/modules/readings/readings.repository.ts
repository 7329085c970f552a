import type BetterSqlite3 from "better-sqlite3";
import type { Quantity } from "../../../shared/schemas/quantities.js";
import type { SeriesPoint } from "../../../shared/schemas/readings.js";

/** One reading on its way to storage, in stored (SI) units. */
export interface ReadingRow {
  sensorId: string;
  benchId: number | null;
  quantity: Quantity;
  timeMs: number;
  value: number;
}

export interface LatestRow {
  sensorId: string;
  benchId: number | null;
  quantity: Quantity;
  timeMs: number;
  value: number;
}

/**
 * SQL for readings through prepared statements on the raw better-sqlite3 handle: the ingest hot
 * path and chart reads are too hot for the query builder (STACK.md, measured).
 */
export class ReadingsRepository {
  private readonly insertReading: BetterSqlite3.Statement;
  private readonly upsertLatest: BetterSqlite3.Statement;
  private readonly selectSeries: BetterSqlite3.Statement;
  private readonly selectLatestForBenches: BetterSqlite3.Statement;
  private readonly insertBatch: (rows: ReadingRow[]) => ReadingRow[];

  constructor(private readonly db: BetterSqlite3.Database) {
    this.insertReading = db.prepare(
      `INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id)
       VALUES (@sensorId, @quantity, @timeMs, @value, @benchId)
       ON CONFLICT DO NOTHING`,
    );
    // Only moves forward: a late, re-sent or out-of-order reading never replaces a newer one.
    this.upsertLatest = db.prepare(
      `INSERT INTO latest_reading (sensor_id, quantity, time_ms, value, bench_id)
       VALUES (@sensorId, @quantity, @timeMs, @value, @benchId)
       ON CONFLICT (sensor_id, quantity) DO UPDATE
         SET time_ms = excluded.time_ms, value = excluded.value, bench_id = excluded.bench_id
         WHERE excluded.time_ms > latest_reading.time_ms`,
    );
    // Bucket keys need an explicit integer cast: JS numbers bind as REAL (STACK.md).
    this.selectSeries = db.prepare(
      `SELECT CAST((time_ms - @fromMs) / @bucketMs AS INTEGER) AS bucket,
              MIN(value) AS min, AVG(value) AS mean, MAX(value) AS max, COUNT(*) AS count
         FROM reading
        WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @fromMs AND time_ms < @toMs
        GROUP BY bucket ORDER BY bucket`,
    );
    this.selectLatestForBenches = db.prepare(
      `SELECT sensor_id AS sensorId, bench_id AS benchId, quantity, time_ms AS timeMs, value
         FROM latest_reading WHERE bench_id IS NOT NULL`,
    );
    this.insertBatch = db.transaction((rows: ReadingRow[]) => {
      const stored: ReadingRow[] = [];
      const newest = new Map<string, ReadingRow>();
      for (const row of rows) {
        if (this.insertReading.run(row).changes === 0) continue; // already stored: a re-send
        stored.push(row);
        const key = `${row.sensorId}\u0000${row.quantity}`;
        const seen = newest.get(key);
        if (!seen || row.timeMs > seen.timeMs) newest.set(key, row);
      }
      for (const row of newest.values()) this.upsertLatest.run(row);
      return stored;
    });
  }

  /** Store a batch in one transaction; returns the rows that were new (duplicates are skipped). */
  insertReadings(rows: ReadingRow[]): ReadingRow[] {
    return this.insertBatch(rows);
  }

  /** min/mean/max per bucket for one bench and quantity over [fromMs, toMs). */
  series(benchId: number, quantity: Quantity, fromMs: number, toMs: number, bucketMs: number): SeriesPoint[] {
    const rows = this.selectSeries.all({ benchId, quantity, fromMs, toMs, bucketMs }) as {
      bucket: number;
      min: number;
      mean: number;
      max: number;
      count: number;
    }[];
    return rows.map((r) => ({ timeMs: fromMs + r.bucket * bucketMs, min: r.min, mean: r.mean, max: r.max, count: r.count }));
  }

  /** The newest reading per sensor and quantity, for every sensor on a bench. */
  latestOnBenches(): LatestRow[] {
    return this.selectLatestForBenches.all() as LatestRow[];
  }

  countReadings(): number {
    return (this.db.prepare("SELECT COUNT(*) AS n FROM reading").get() as { n: number }).n;
  }
}
