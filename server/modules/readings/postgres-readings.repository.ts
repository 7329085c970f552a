import type pg from "pg";
import type { Quantity } from "../../../shared/schemas/quantities.js";
import type { SeriesPoint } from "../../../shared/schemas/readings.js";
import type { ReadingStore } from "./reading-store.js";
import { edgeMinutes, groupSeriesRows, newestPerSeries, rollupCellsOf, ROLLUP_RESOLUTIONS_MS, seriesTierBounds, type LatestRow, type ReadingRow } from "./readings.repository.js";

const MINUTE_MS = 60_000;
const HOUR_MS = 3_600_000;
/**
 * First key of the two-key advisory locks that guard a bench's rollups (the second is the bench
 * id): ingest holds them shared while it adds to rollups, a stale-hour rebuild exclusively while it
 * deletes and rewrites them. The two-key form never collides with single-bigint advisory locks.
 */
const BENCH_ROLLUPS_LOCK = 0x726f6c6c;

// Every multi-row statement sorts its rows by the table's key: two instances writing the same
// cells then take their row locks in the same order and cannot deadlock. The order across tables
// is fixed too: readings, the benches' rollup locks, latest, rollups. A rebuild takes the bench
// locks first, so an ingest holding latest or rollup rows never waits for one.
const INSERT_READINGS = `INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id)
  SELECT * FROM unnest($1::text[], $2::text[], $3::bigint[], $4::float8[], $5::int[]) AS r(sensor_id, quantity, time_ms, value, bench_id)
  ORDER BY sensor_id, quantity, time_ms
  ON CONFLICT DO NOTHING
  RETURNING sensor_id, quantity, time_ms`;
// Only moves forward: a late, re-sent or out-of-order reading never replaces a newer one.
const UPSERT_LATEST = `INSERT INTO latest_reading (sensor_id, quantity, time_ms, value, bench_id)
  SELECT * FROM unnest($1::text[], $2::text[], $3::bigint[], $4::float8[], $5::int[]) AS r(sensor_id, quantity, time_ms, value, bench_id)
  ORDER BY sensor_id, quantity
  ON CONFLICT (sensor_id, quantity) DO UPDATE
    SET time_ms = excluded.time_ms, value = excluded.value, bench_id = excluded.bench_id
    WHERE excluded.time_ms > latest_reading.time_ms`;
// unnest yields the (sorted) array in order, so the locks are taken in that order.
const LOCK_BENCHES_SHARED = `SELECT pg_advisory_xact_lock_shared(${BENCH_ROLLUPS_LOCK}, b) FROM unnest($1::int[]) AS b`;
const LOCK_BENCHES = `SELECT pg_advisory_xact_lock(${BENCH_ROLLUPS_LOCK}, b) FROM unnest($1::int[]) AS b`;
const UPSERT_ROLLUPS = `INSERT INTO reading_rollup (bench_id, quantity, resolution_ms, start_ms, min, max, sum, count)
  SELECT * FROM unnest($1::int[], $2::text[], $3::bigint[], $4::bigint[], $5::float8[], $6::float8[], $7::float8[], $8::int[])
    AS c(bench_id, quantity, resolution_ms, start_ms, min, max, sum, count)
  ORDER BY bench_id, quantity, resolution_ms, start_ms
  ON CONFLICT (bench_id, quantity, resolution_ms, start_ms) DO UPDATE
    SET min = LEAST(reading_rollup.min, excluded.min), max = GREATEST(reading_rollup.max, excluded.max),
        sum = reading_rollup.sum + excluded.sum, count = reading_rollup.count + excluded.count`;

const HOURS = `unnest($1::int[], $2::text[], $3::bigint[]) AS h(bench_id, quantity, hour_ms)`;
const SELECT_STALE = `SELECT bench_id AS "benchId", quantity, hour_ms AS "hourMs" FROM reading_rollup_stale ORDER BY bench_id, quantity, hour_ms LIMIT 250`;
const LOCK_STALE = `LOCK TABLE reading_rollup_stale IN SHARE ROW EXCLUSIVE MODE`;
// Under the locks: only hours still stale are rebuilt (another instance may have done them meanwhile).
const CLAIM_STALE = `DELETE FROM reading_rollup_stale s USING ${HOURS}
  WHERE s.bench_id = h.bench_id AND s.quantity = h.quantity AND s.hour_ms = h.hour_ms
  RETURNING s.bench_id AS "benchId", s.quantity, s.hour_ms AS "hourMs"`;
// The planner takes each hour's range join for one row and would hash-join a scan of the whole
// table; what is wanted is one index range scan per hour (SET LOCAL: this transaction only).
const NESTED_LOOPS_ONLY = [`SET LOCAL enable_hashjoin = off`, `SET LOCAL enable_mergejoin = off`];
const DELETE_HOURS = `DELETE FROM reading_rollup r USING ${HOURS}
  WHERE r.bench_id = h.bench_id AND r.quantity = h.quantity AND r.resolution_ms IN (${ROLLUP_RESOLUTIONS_MS.join(", ")})
    AND r.start_ms >= h.hour_ms AND r.start_ms < h.hour_ms + ${HOUR_MS}`;
// Aggregated per hour (a lateral subquery with GROUP BY stays a nested loop over the hours).
// time_ms is bigint, so / is integer division: the floor, as in SQLite, for epoch times.
const MINUTES_OF_HOURS = `INSERT INTO reading_rollup (bench_id, quantity, resolution_ms, start_ms, min, max, sum, count)
  SELECT h.bench_id, h.quantity, ${MINUTE_MS}, m.start_ms, m.min, m.max, m.sum, m.count
    FROM ${HOURS} CROSS JOIN LATERAL (
      SELECT (r.time_ms / ${MINUTE_MS}) * ${MINUTE_MS} AS start_ms, MIN(r.value) AS min, MAX(r.value) AS max, SUM(r.value) AS sum, COUNT(*) AS count
        FROM reading r WHERE r.bench_id = h.bench_id AND r.quantity = h.quantity AND r.time_ms >= h.hour_ms AND r.time_ms < h.hour_ms + ${HOUR_MS}
       GROUP BY r.time_ms / ${MINUTE_MS}) AS m`;
const COARSE_OF_HOURS = `INSERT INTO reading_rollup (bench_id, quantity, resolution_ms, start_ms, min, max, sum, count)
  SELECT h.bench_id, h.quantity, g.resolution_ms, c.start_ms, c.min, c.max, c.sum, c.count
    FROM ${HOURS} CROSS JOIN (VALUES ${ROLLUP_RESOLUTIONS_MS.slice(1).map((r) => `(${r}::bigint)`).join(", ")}) AS g(resolution_ms)
    CROSS JOIN LATERAL (
      SELECT (e.start_ms / g.resolution_ms) * g.resolution_ms AS start_ms, MIN(e.min) AS min, MAX(e.max) AS max, SUM(e.sum) AS sum, SUM(e.count) AS count
        FROM reading_rollup e WHERE e.bench_id = h.bench_id AND e.quantity = h.quantity AND e.resolution_ms = ${MINUTE_MS}
         AND e.start_ms >= h.hour_ms AND e.start_ms < h.hour_ms + ${HOUR_MS}
       GROUP BY e.start_ms / g.resolution_ms) AS c`;

/**
 * A series from three tiers, as ReadingsRepository reads it on SQLite: raw readings for the
 * partial minutes at either end, 1-minute rollups up to the coarse boundaries, coarse rollups in
 * between; a rollup goes to the bucket its start falls in. Parameters: $1 from, $2 bucket width,
 * $3 to, $4/$5 the 1-minute tier's bounds, $6/$7 the coarse tier's, $8 its resolution; `where`
 * picks the series from $9 and $10. Bucket keys are bigint division, truncated as SQLite's cast is.
 */
function tiers(keys: string, where: string): string {
  const rawPart = (lo: string, hi: string) =>
    `SELECT ${keys} (time_ms - $1::bigint) / $2::bigint AS bucket, value AS mn, value AS mx, value AS sm, 1 AS n
       FROM reading WHERE ${where} AND time_ms >= ${lo}::bigint AND time_ms < ${hi}::bigint`;
  const rollupPart = (resolution: string, lo: string, hi: string) =>
    `SELECT ${keys} (start_ms - $1::bigint) / $2::bigint AS bucket, min AS mn, max AS mx, sum AS sm, count AS n
       FROM reading_rollup WHERE ${where} AND resolution_ms = ${resolution} AND start_ms >= ${lo}::bigint AND start_ms < ${hi}::bigint`;
  return `${rawPart("$1", "$4")}
    UNION ALL ${rawPart("$5", "$3")}
    UNION ALL ${rollupPart(String(MINUTE_MS), "$4", "$6")}
    UNION ALL ${rollupPart(String(MINUTE_MS), "$7", "$5")}
    UNION ALL ${rollupPart("$8::bigint", "$6", "$7")}`;
}

const SELECT_SERIES = `SELECT bucket, MIN(mn) AS min, SUM(sm) / SUM(n) AS mean, MAX(mx) AS max, SUM(n) AS count FROM (
    ${tiers("", "bench_id = $9::int AND quantity = $10::text")}
  ) AS t GROUP BY bucket ORDER BY bucket`;
const SELECT_ZONE_SERIES = `SELECT bench_id AS "benchId", quantity, bucket, MIN(mn) AS min, SUM(sm) / SUM(n) AS mean, MAX(mx) AS max, SUM(n) AS count FROM (
    ${tiers("bench_id, quantity,", "bench_id = ANY($9::int[]) AND quantity = ANY($10::text[])")}
  ) AS t GROUP BY bench_id, quantity, bucket ORDER BY bench_id, quantity, bucket`;
// The edge minutes (of those asked) whose 1-minute rollup, in any of the series, counts more
// readings than remain raw: retention deleted their raw readings, always a whole minute at a time.
const SELECT_RAW_GONE = `SELECT m AS "minuteMs" FROM unnest($3::bigint[]) AS m
  WHERE EXISTS (SELECT 1 FROM reading_rollup e
    WHERE e.bench_id = ANY($1::int[]) AND e.quantity = ANY($2::text[]) AND e.resolution_ms = ${MINUTE_MS} AND e.start_ms = m
      AND e.count > (SELECT COUNT(*) FROM reading x WHERE x.bench_id = e.bench_id AND x.quantity = e.quantity AND x.time_ms >= e.start_ms AND x.time_ms < e.start_ms + ${MINUTE_MS}))`;
const SELECT_LATEST = `SELECT sensor_id AS "sensorId", bench_id AS "benchId", quantity, time_ms AS "timeMs", value
  FROM latest_reading WHERE bench_id IS NOT NULL`;

interface StaleHour {
  benchId: number;
  quantity: Quantity;
  hourMs: number;
}

interface BucketRow {
  bucket: number;
  min: number;
  mean: number;
  max: number;
  count: number;
}

const readingKey = (sensorId: string, quantity: string, timeMs: number) => `${sensorId}\u0000${quantity}\u0000${timeMs}`;

function hourColumns(hours: readonly StaleHour[]): unknown[] {
  return [hours.map((h) => h.benchId), hours.map((h) => h.quantity), hours.map((h) => h.hourMs)];
}

/**
 * Readings on PostgreSQL, with ReadingsRepository's semantics: multi-row statements over arrays
 * (unnest) on the pool TypeORM opened, one transaction per batch, safe with several instances
 * writing at once.
 */
export class PostgresReadingsRepository implements ReadingStore {
  constructor(private readonly pool: pg.Pool) {}

  async insertReadings(rows: ReadingRow[]): Promise<ReadingRow[]> {
    // A key twice in one batch is stored once, the first time, as on SQLite.
    const unique = new Map<string, ReadingRow>();
    for (const row of rows) {
      const key = readingKey(row.sensorId, row.quantity, row.timeMs);
      if (!unique.has(key)) unique.set(key, row);
    }
    if (unique.size === 0) return [];
    return this.transaction(async (client) => {
      const offered = [...unique.values()];
      const inserted = await client.query<{ sensor_id: string; quantity: string; time_ms: number }>({
        name: "readings:insert",
        text: INSERT_READINGS,
        values: [offered.map((r) => r.sensorId), offered.map((r) => r.quantity), offered.map((r) => r.timeMs), offered.map((r) => r.value), offered.map((r) => r.benchId)],
      });
      if (inserted.rows.length === 0) return [];
      // The new rows in the order given (RETURNING gives them in key order).
      const isNew = new Set(inserted.rows.map((r) => readingKey(r.sensor_id, r.quantity, r.time_ms)));
      const stored = offered.filter((r) => isNew.has(readingKey(r.sensorId, r.quantity, r.timeMs)));

      const cells = rollupCellsOf(stored);
      const benches = [...new Set(cells.map((c) => c.benchId))].sort((a, b) => a - b);
      if (benches.length > 0) await client.query({ name: "readings:lock-benches-shared", text: LOCK_BENCHES_SHARED, values: [benches] });
      const newest = newestPerSeries(stored);
      await client.query({
        name: "readings:upsert-latest",
        text: UPSERT_LATEST,
        values: [newest.map((r) => r.sensorId), newest.map((r) => r.quantity), newest.map((r) => r.timeMs), newest.map((r) => r.value), newest.map((r) => r.benchId)],
      });
      if (cells.length > 0) {
        await client.query({
          name: "readings:upsert-rollups",
          text: UPSERT_ROLLUPS,
          values: [
            cells.map((c) => c.benchId),
            cells.map((c) => c.quantity),
            cells.map((c) => c.resolutionMs),
            cells.map((c) => c.startMs),
            cells.map((c) => c.min),
            cells.map((c) => c.max),
            cells.map((c) => c.sum),
            cells.map((c) => c.count),
          ],
        });
      }
      return stored;
    });
  }

  async refreshStaleRollups(): Promise<void> {
    for (let round = 0; round < 100; round++) {
      const stale = (await this.pool.query<StaleHour>(SELECT_STALE)).rows;
      if (stale.length === 0) return;
      // Up to 250 hours per transaction, as on SQLite. The benches' exclusive locks wait for
      // ingest transactions adding to their rollups and hold new ones off until the commit, so
      // the rebuild from raw readings and the additions never overlap. The table lock does the
      // same for re-files: their trigger's insert (which takes no row lock when the hour is
      // already marked) waits, or is waited for, so no re-file commits unseen behind a claim.
      await this.transaction(async (client) => {
        const benches = [...new Set(stale.map((h) => h.benchId))].sort((a, b) => a - b);
        await client.query(LOCK_BENCHES, [benches]);
        await client.query(LOCK_STALE);
        const claimed = (await client.query<StaleHour>(CLAIM_STALE, hourColumns(stale))).rows;
        if (claimed.length === 0) return;
        for (const setting of NESTED_LOOPS_ONLY) await client.query(setting);
        await client.query(DELETE_HOURS, hourColumns(claimed));
        await client.query(MINUTES_OF_HOURS, hourColumns(claimed));
        await client.query(COARSE_OF_HOURS, hourColumns(claimed));
      });
    }
  }

  async series(benchId: number, quantity: Quantity, fromMs: number, toMs: number, bucketMs: number): Promise<SeriesPoint[]> {
    await this.refreshStaleRollups();
    const bounds = await this.tierBoundsOverGoneMinutes([benchId], [quantity], fromMs, toMs, bucketMs);
    const { rows } = await this.pool.query<BucketRow>({ name: "readings:series", text: SELECT_SERIES, values: [...this.tierValues(fromMs, toMs, bucketMs, bounds), benchId, quantity] });
    return rows.map((r) => ({ timeMs: fromMs + r.bucket * bucketMs, min: r.min, mean: r.mean, max: r.max, count: r.count }));
  }

  async seriesOfBenches(benchIds: readonly number[], quantities: readonly Quantity[], fromMs: number, toMs: number, bucketMs: number): Promise<Map<number, Map<Quantity, SeriesPoint[]>>> {
    await this.refreshStaleRollups();
    if (benchIds.length === 0 || quantities.length === 0) return new Map();
    const bounds = await this.tierBoundsOverGoneMinutes(benchIds, quantities, fromMs, toMs, bucketMs);
    const { rows } = await this.pool.query<BucketRow & { benchId: number; quantity: Quantity }>({
      name: "readings:series-of-benches",
      text: SELECT_ZONE_SERIES,
      values: [...this.tierValues(fromMs, toMs, bucketMs, bounds), benchIds, quantities],
    });
    return groupSeriesRows(rows, fromMs, bucketMs);
  }

  /** PostgreSQL's plan for seriesOfBenches (EXPLAIN, one line per step), to check it reaches both tables through their indexes. */
  async seriesOfBenchesPlan(benchIds: readonly number[], quantities: readonly Quantity[], fromMs: number, toMs: number, bucketMs: number): Promise<string[]> {
    const bounds = await this.tierBoundsOverGoneMinutes(benchIds, quantities, fromMs, toMs, bucketMs);
    const { rows } = await this.pool.query<{ "QUERY PLAN": string }>(`EXPLAIN ${SELECT_ZONE_SERIES}`, [...this.tierValues(fromMs, toMs, bucketMs, bounds), benchIds, quantities]);
    return rows.map((r) => r["QUERY PLAN"]);
  }

  async latestOnBenches(): Promise<LatestRow[]> {
    return (await this.pool.query<LatestRow>({ name: "readings:latest-on-benches", text: SELECT_LATEST })).rows;
  }

  private tierValues(fromMs: number, toMs: number, bucketMs: number, b: ReturnType<typeof seriesTierBounds>): number[] {
    return [fromMs, bucketMs, toMs, b.minuteFromMs, b.minuteToMs, b.coarseFromMs, b.coarseToMs, b.coarseMs];
  }

  /** seriesTierBounds, with the edge minutes' "raw gone" answers fetched in one statement first. */
  private async tierBoundsOverGoneMinutes(benchIds: readonly number[], quantities: readonly Quantity[], fromMs: number, toMs: number, bucketMs: number) {
    const minutes = edgeMinutes(fromMs, toMs);
    const gone = new Set<number>();
    if (minutes.length > 0) {
      const { rows } = await this.pool.query<{ minuteMs: number }>({ name: "readings:raw-gone", text: SELECT_RAW_GONE, values: [benchIds, quantities, minutes] });
      for (const r of rows) gone.add(r.minuteMs);
    }
    return seriesTierBounds(fromMs, toMs, bucketMs, (minuteMs) => gone.has(minuteMs));
  }

  private async transaction<T>(work: (client: pg.PoolClient) => Promise<T>): Promise<T> {
    const client = await this.pool.connect();
    try {
      await client.query("BEGIN");
      const result = await work(client);
      await client.query("COMMIT");
      client.release();
      return result;
    } catch (err) {
      // A connection that cannot even roll back is dropped from the pool rather than reused.
      const isBroken = await client.query("ROLLBACK").then(
        () => false,
        () => true,
      );
      client.release(isBroken);
      throw err;
    }
  }
}
