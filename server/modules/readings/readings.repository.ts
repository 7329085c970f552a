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

/** Rollup resolutions kept at ingest (epoch-aligned intervals), finest first. */
export const ROLLUP_RESOLUTIONS_MS = [60_000, 900_000, 3_600_000] as const;
const MINUTE_MS = 60_000;
const HOUR_MS = 3_600_000;

/** What a batch adds to one rollup cell: min, max, sum and count of its new readings there. */
export interface RollupCell {
  benchId: number;
  quantity: Quantity;
  resolutionMs: number;
  startMs: number;
  min: number;
  max: number;
  sum: number;
  count: number;
}

/**
 * Where a series' three tiers meet: raw readings in [from, minuteFrom) and [minuteTo, to), 1-minute
 * rollups up to the coarse boundaries, rollups of coarseMs (1 min, 15 min or 1 h; a divisor of
 * bucketMs, at most half of it) in [coarseFrom, coarseTo).
 */
function tierBounds(fromMs: number, toMs: number, bucketMs: number) {
  const coarseMs = [...ROLLUP_RESOLUTIONS_MS].reverse().find((r) => r * 2 <= bucketMs && bucketMs % r === 0) ?? MINUTE_MS;
  const minuteFromMs = Math.min(toMs, Math.ceil(fromMs / MINUTE_MS) * MINUTE_MS);
  const minuteToMs = Math.max(minuteFromMs, Math.floor(toMs / MINUTE_MS) * MINUTE_MS);
  const coarseFromMs = Math.min(minuteToMs, Math.max(minuteFromMs, Math.ceil(minuteFromMs / coarseMs) * coarseMs));
  const coarseToMs = Math.max(coarseFromMs, Math.floor(minuteToMs / coarseMs) * coarseMs);
  return { coarseMs, minuteFromMs, minuteToMs, coarseFromMs, coarseToMs };
}

/** Bucket rows of several benches and quantities (ordered by bench, quantity, bucket) as series per bench and quantity. */
export function groupSeriesRows(
  rows: readonly { benchId: number; quantity: Quantity; bucket: number; min: number; mean: number; max: number; count: number }[],
  fromMs: number,
  bucketMs: number,
): Map<number, Map<Quantity, SeriesPoint[]>> {
  const out = new Map<number, Map<Quantity, SeriesPoint[]>>();
  for (const r of rows) {
    let bench = out.get(r.benchId);
    if (!bench) out.set(r.benchId, (bench = new Map()));
    let points = bench.get(r.quantity);
    if (!points) bench.set(r.quantity, (points = []));
    points.push({ timeMs: fromMs + r.bucket * bucketMs, min: r.min, mean: r.mean, max: r.max, count: r.count });
  }
  return out;
}

/** The minutes seriesTierBounds may ask isGone about: those the range starts or ends inside. */
export function edgeMinutes(fromMs: number, toMs: number): number[] {
  const startMinuteMs = Math.floor(fromMs / MINUTE_MS) * MINUTE_MS;
  const endMinuteMs = Math.floor(toMs / MINUTE_MS) * MINUTE_MS;
  return [...new Set([...(startMinuteMs < fromMs ? [startMinuteMs] : []), ...(endMinuteMs < toMs ? [endMinuteMs] : [])])];
}

/**
 * tierBounds, except that a range end inside a minute whose raw readings retention deleted reads
 * that whole minute from its 1-minute rollup (the raw tier at that end becomes empty), rather than
 * lose the readings in it. Like every rolled-up minute it goes to the bucket its start falls in,
 * and it may hold up to 59 s of readings just outside the range. isGone is asked only about
 * edgeMinutes(fromMs, toMs).
 */
export function seriesTierBounds(fromMs: number, toMs: number, bucketMs: number, isGone: (minuteMs: number) => boolean) {
  const startMinuteMs = Math.floor(fromMs / MINUTE_MS) * MINUTE_MS;
  const endMinuteMs = Math.floor(toMs / MINUTE_MS) * MINUTE_MS;
  const fromEdgeMs = startMinuteMs < fromMs && isGone(startMinuteMs) ? startMinuteMs : fromMs;
  let toEdgeMs = toMs;
  if (endMinuteMs < toMs) {
    // A range inside one minute whose raw readings are gone reads that minute whole.
    if (endMinuteMs === startMinuteMs && fromEdgeMs < fromMs) toEdgeMs = endMinuteMs + MINUTE_MS;
    else if (endMinuteMs >= fromMs && isGone(endMinuteMs)) toEdgeMs = endMinuteMs + MINUTE_MS;
  }
  return tierBounds(fromEdgeMs, toEdgeMs, bucketMs);
}

/** The newest of the rows per sensor and quantity (the first of equal times): what latest_reading is offered. */
export function newestPerSeries(rows: readonly ReadingRow[]): ReadingRow[] {
  const newest = new Map<string, ReadingRow>();
  for (const row of rows) {
    const key = `${row.sensorId}\u0000${row.quantity}`;
    const seen = newest.get(key);
    if (!seen || row.timeMs > seen.timeMs) newest.set(key, row);
  }
  return [...newest.values()];
}

/** The rollup cells of every resolution that newly stored rows add to; rows without a bench add nothing. */
export function rollupCellsOf(stored: readonly ReadingRow[]): RollupCell[] {
  const minutes = new Map<string, RollupCell>();
  for (const row of stored) {
    if (row.benchId === null) continue;
    const startMs = Math.floor(row.timeMs / MINUTE_MS) * MINUTE_MS;
    const key = `${row.benchId}\u0000${row.quantity}\u0000${startMs}`;
    const cell = minutes.get(key);
    if (cell) {
      if (row.value < cell.min) cell.min = row.value;
      if (row.value > cell.max) cell.max = row.value;
      cell.sum += row.value;
      cell.count++;
    } else {
      minutes.set(key, { benchId: row.benchId, quantity: row.quantity, resolutionMs: MINUTE_MS, startMs, min: row.value, max: row.value, sum: row.value, count: 1 });
    }
  }
  const cells = [...minutes.values()];
  for (const resolutionMs of ROLLUP_RESOLUTIONS_MS.slice(1)) {
    const merged = new Map<string, RollupCell>();
    for (const cell of minutes.values()) {
      const startMs = Math.floor(cell.startMs / resolutionMs) * resolutionMs;
      const key = `${cell.benchId}\u0000${cell.quantity}\u0000${startMs}`;
      const into = merged.get(key);
      if (into) {
        into.min = Math.min(into.min, cell.min);
        into.max = Math.max(into.max, cell.max);
        into.sum += cell.sum;
        into.count += cell.count;
      } else merged.set(key, { ...cell, resolutionMs, startMs });
    }
    cells.push(...merged.values());
  }
  return cells;
}

/**
 * SQL for readings through prepared statements on the raw better-sqlite3 handle: the ingest hot
 * path and chart reads are too hot for the query builder (STACK.md, measured).
 */
export class ReadingsRepository {
  private readonly insertReading: BetterSqlite3.Statement;
  private readonly upsertLatest: BetterSqlite3.Statement;
  private readonly selectSeries: BetterSqlite3.Statement;
  private readonly selectZoneSeries: BetterSqlite3.Statement;
  private readonly explainZoneSeries: BetterSqlite3.Statement;
  private readonly selectLatestForBenches: BetterSqlite3.Statement;
  private readonly insertBatch: (rows: ReadingRow[]) => ReadingRow[];
  private readonly upsertRollup: BetterSqlite3.Statement;
  private readonly selectStale: BetterSqlite3.Statement;
  private readonly selectRawGone: BetterSqlite3.Statement;
  private readonly rebuildStaleHours: (hours: { benchId: number; quantity: Quantity; hourMs: number }[]) => void;

  constructor(db: BetterSqlite3.Database) {
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
    // Adding to a rollup is idempotent with the reading insert: only rows that were new are added.
    this.upsertRollup = db.prepare(
      `INSERT INTO reading_rollup (bench_id, quantity, resolution_ms, start_ms, min, max, sum, count)
       VALUES (@benchId, @quantity, @resolutionMs, @startMs, @min, @max, @sum, @count)
       ON CONFLICT (bench_id, quantity, resolution_ms, start_ms) DO UPDATE
         SET min = MIN(min, excluded.min), max = MAX(max, excluded.max), sum = sum + excluded.sum, count = count + excluded.count`,
    );
    // A series from three tiers: raw readings for the partial minutes at either end, 1-minute
    // rollups up to the coarse resolution's boundaries, coarse rollups in between. Every reading in
    // [from, to) is counted once; a rollup goes to the bucket its start falls in. Bucket keys need
    // an explicit integer cast: JS numbers bind as REAL (STACK.md). `keys` are extra columns to
    // group by (bench and quantity for a zone), `where` picks the series.
    const tiers = (keys: string, where: string) => {
      const rawPart = (lo: string, hi: string) =>
        `SELECT ${keys} CAST((time_ms - @fromMs) / @bucketMs AS INTEGER) AS bucket, value AS mn, value AS mx, value AS sm, 1 AS n
           FROM reading WHERE ${where} AND time_ms >= @${lo} AND time_ms < @${hi}`;
      const rollupPart = (resolution: string, lo: string, hi: string) =>
        `SELECT ${keys} CAST((start_ms - @fromMs) / @bucketMs AS INTEGER) AS bucket, min AS mn, max AS mx, sum AS sm, count AS n
           FROM reading_rollup WHERE ${where} AND resolution_ms = ${resolution} AND start_ms >= @${lo} AND start_ms < @${hi}`;
      return `${rawPart("fromMs", "minuteFromMs")}
         UNION ALL ${rawPart("minuteToMs", "toMs")}
         UNION ALL ${rollupPart(String(MINUTE_MS), "minuteFromMs", "coarseFromMs")}
         UNION ALL ${rollupPart(String(MINUTE_MS), "coarseToMs", "minuteToMs")}
         UNION ALL ${rollupPart("@coarseMs", "coarseFromMs", "coarseToMs")}`;
    };
    this.selectSeries = db.prepare(
      `SELECT bucket, MIN(mn) AS min, SUM(sm) / SUM(n) AS mean, MAX(mx) AS max, SUM(n) AS count FROM (
         ${tiers("", "bench_id = @benchId AND quantity = @quantity")}
       ) GROUP BY bucket ORDER BY bucket`,
    );
    // Every series of several benches in one statement (a zone's chart). The lists arrive as JSON
    // arrays; SQLite turns each IN (json_each) into index look-ups on the rollups' primary key and
    // the readings' (bench, quantity, time) index (tested with EXPLAIN QUERY PLAN).
    const zoneSeriesSql = `SELECT bench_id AS benchId, quantity, bucket, MIN(mn) AS min, SUM(sm) / SUM(n) AS mean, MAX(mx) AS max, SUM(n) AS count FROM (
         ${tiers("bench_id, quantity,", "bench_id IN (SELECT value FROM json_each(@benchIds)) AND quantity IN (SELECT value FROM json_each(@quantities))")}
       ) GROUP BY bench_id, quantity, bucket ORDER BY bench_id, quantity, bucket`;
    this.selectZoneSeries = db.prepare(zoneSeriesSql);
    this.explainZoneSeries = db.prepare(`EXPLAIN QUERY PLAN ${zoneSeriesSql}`);
    this.selectStale = db.prepare(`SELECT bench_id AS benchId, quantity, hour_ms AS hourMs FROM reading_rollup_stale LIMIT 250`);
    // A minute of any of the series whose 1-minute rollup counts more readings than remain raw:
    // retention (modules/retention) deleted its raw readings, always a whole minute at a time.
    this.selectRawGone = db.prepare(
      `SELECT EXISTS (SELECT 1 FROM reading_rollup e
         WHERE e.bench_id IN (SELECT value FROM json_each(@benchIds)) AND e.quantity IN (SELECT value FROM json_each(@quantities))
           AND e.resolution_ms = ${MINUTE_MS} AND e.start_ms = @minuteMs
           AND e.count > (SELECT COUNT(*) FROM reading x WHERE x.bench_id = e.bench_id AND x.quantity = e.quantity AND x.time_ms >= e.start_ms AND x.time_ms < e.start_ms + ${MINUTE_MS})) AS gone`,
    );
    // Naming every resolution lets each delete walk the primary key (bench, quantity, resolution,
    // start) to the hour; without it SQLite scans the series' whole history once per stale hour.
    const deleteHour = db.prepare(
      `DELETE FROM reading_rollup WHERE bench_id = @benchId AND quantity = @quantity AND resolution_ms IN (${ROLLUP_RESOLUTIONS_MS.join(", ")})
         AND start_ms >= @hourMs AND start_ms < @hourMs + ${HOUR_MS}`,
    );
    const minutesOfHour = db.prepare(
      `INSERT INTO reading_rollup SELECT bench_id, quantity, ${MINUTE_MS}, (time_ms / ${MINUTE_MS}) * ${MINUTE_MS}, MIN(value), MAX(value), SUM(value), COUNT(*)
         FROM reading WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @hourMs AND time_ms < @hourMs + ${HOUR_MS}
        GROUP BY time_ms / ${MINUTE_MS}`,
    );
    const coarseOfHour = db.prepare(
      `INSERT INTO reading_rollup SELECT bench_id, quantity, @resolutionMs, (start_ms / @resolutionMs) * @resolutionMs, MIN(min), MAX(max), SUM(sum), SUM(count)
         FROM reading_rollup WHERE bench_id = @benchId AND quantity = @quantity AND resolution_ms = ${MINUTE_MS} AND start_ms >= @hourMs AND start_ms < @hourMs + ${HOUR_MS}
        GROUP BY start_ms / @resolutionMs`,
    );
    const deleteStale = db.prepare(`DELETE FROM reading_rollup_stale WHERE bench_id = @benchId AND quantity = @quantity AND hour_ms = @hourMs`);
    // Up to 250 stale hours per transaction (a write lock of tens of ms): one commit each cost more than the rebuild itself.
    this.rebuildStaleHours = db.transaction((hours: { benchId: number; quantity: Quantity; hourMs: number }[]) => {
      for (const stale of hours) {
        deleteHour.run(stale);
        minutesOfHour.run(stale);
        for (const resolutionMs of ROLLUP_RESOLUTIONS_MS.slice(1)) coarseOfHour.run({ ...stale, resolutionMs });
        deleteStale.run(stale);
      }
    });
    this.selectLatestForBenches = db.prepare(
      `SELECT sensor_id AS sensorId, bench_id AS benchId, quantity, time_ms AS timeMs, value
         FROM latest_reading WHERE bench_id IS NOT NULL`,
    );
    this.insertBatch = db.transaction((rows: ReadingRow[]) => {
      const stored: ReadingRow[] = [];
      for (const row of rows) {
        if (this.insertReading.run(row).changes === 0) continue; // already stored: a re-send
        stored.push(row);
      }
      for (const row of newestPerSeries(stored)) this.upsertLatest.run(row);
      for (const cell of rollupCellsOf(stored)) this.upsertRollup.run(cell);
      return stored;
    });
  }

  /** Store a batch in one transaction; returns the rows that were new (duplicates are skipped). */
  insertReadings(rows: ReadingRow[]): ReadingRow[] {
    return this.insertBatch(rows);
  }

  /** Rebuild rollup hours a back-dated sensor move made stale (normally there are none); exports call it before reading rollups. */
  refreshStaleRollups(): void {
    for (let round = 0; round < 100; round++) {
      const stale = this.selectStale.all() as { benchId: number; quantity: Quantity; hourMs: number }[];
      if (stale.length === 0) return;
      this.rebuildStaleHours(stale);
    }
  }

  /**
   * min/mean/max per bucket for one bench and quantity over [fromMs, toMs), buckets of bucketMs
   * from fromMs. Reads rollups of coarseMs (1 min, 15 min or 1 h; a divisor of bucketMs, at most
   * half of it) for whole intervals and raw readings only for the partial minutes at the ends.
   */
  series(benchId: number, quantity: Quantity, fromMs: number, toMs: number, bucketMs: number): SeriesPoint[] {
    this.refreshStaleRollups();
    const rows = this.selectSeries.all({ benchId, quantity, fromMs, toMs, bucketMs, ...this.tierBoundsOverGoneMinutes([benchId], [quantity], fromMs, toMs, bucketMs) }) as {
      bucket: number;
      min: number;
      mean: number;
      max: number;
      count: number;
    }[];
    return rows.map((r) => ({ timeMs: fromMs + r.bucket * bucketMs, min: r.min, mean: r.mean, max: r.max, count: r.count }));
  }

  /**
   * The series of several benches and quantities at once, on one bucket grid: what series() gives
   * for each pair, read in one statement. Pairs without readings are absent from the map.
   */
  seriesOfBenches(benchIds: readonly number[], quantities: readonly Quantity[], fromMs: number, toMs: number, bucketMs: number): Map<number, Map<Quantity, SeriesPoint[]>> {
    this.refreshStaleRollups();
    if (benchIds.length === 0 || quantities.length === 0) return new Map();
    const rows = this.selectZoneSeries.all(this.zoneSeriesParams(benchIds, quantities, fromMs, toMs, bucketMs)) as {
      benchId: number;
      quantity: Quantity;
      bucket: number;
      min: number;
      mean: number;
      max: number;
      count: number;
    }[];
    return groupSeriesRows(rows, fromMs, bucketMs);
  }

  /** SQLite's plan for seriesOfBenches (EXPLAIN QUERY PLAN, one line per step), to check it uses the indexes. */
  seriesOfBenchesPlan(benchIds: readonly number[], quantities: readonly Quantity[], fromMs: number, toMs: number, bucketMs: number): string[] {
    const rows = this.explainZoneSeries.all(this.zoneSeriesParams(benchIds, quantities, fromMs, toMs, bucketMs)) as { detail: string }[];
    return rows.map((r) => r.detail);
  }

  private zoneSeriesParams(benchIds: readonly number[], quantities: readonly Quantity[], fromMs: number, toMs: number, bucketMs: number) {
    return { benchIds: JSON.stringify(benchIds), quantities: JSON.stringify(quantities), fromMs, toMs, bucketMs, ...this.tierBoundsOverGoneMinutes(benchIds, quantities, fromMs, toMs, bucketMs) };
  }

  private tierBoundsOverGoneMinutes(benchIds: readonly number[], quantities: readonly Quantity[], fromMs: number, toMs: number, bucketMs: number) {
    const isGone = (minuteMs: number) =>
      (this.selectRawGone.get({ benchIds: JSON.stringify(benchIds), quantities: JSON.stringify(quantities), minuteMs }) as { gone: number }).gone === 1;
    return seriesTierBounds(fromMs, toMs, bucketMs, isGone);
  }

  /** The newest reading per sensor and quantity, for every sensor on a bench. */
  latestOnBenches(): LatestRow[] {
    return this.selectLatestForBenches.all() as LatestRow[];
  }

}
