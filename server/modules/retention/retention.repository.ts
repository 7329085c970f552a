import type { DataSource } from "typeorm";
import { QUANTITIES, type Quantity } from "../../../shared/schemas/quantities.js";
import { rawDatabase } from "../../db/data-source.js";
import { Statements, type SqlParams } from "../../db/statements.js";

const MINUTE_MS = 60_000;
const HOUR_MS = 3_600_000;

/** Where a retention pass stands: the (bench, quantity) series it is in and the time it has reached. */
export interface RetentionCursor {
  series: number;
  fromMs: number;
}

/** What decides which raw readings may go, fixed for one pass. */
export interface RetentionRules {
  /** Hour-aligned: only readings before it are looked at. */
  cutoffMs: number;
  /** Batches closed at or after this time still protect their readings (as open ones do). */
  keepBatchesClosedSinceMs: number;
  /** Readings this close to a batch's placement are kept too (reports read that far around it). */
  marginMs: number;
  /** Most rows one chunk deletes or examines. */
  chunkRows: number;
}

export interface ChunkResult {
  deletedRows: number;
  /** Bench-hours whose readings went. */
  deletedHours: number;
  /** Bench-hours kept because a rollup is missing, short of the raw readings, or marked stale. */
  keptForRollups: number;
  /** Stretches of a bench kept because a batch was on it (open, or closed within the retention). */
  keptForBatches: number;
  /** True when every series has been walked up to the cutoff. */
  done: boolean;
}

interface Protection {
  fromMs: number;
  toMs: number;
}

const RETENTION_SQL = {
  benches: `SELECT id FROM bench ORDER BY id`,
  first: `SELECT MIN(time_ms) AS t FROM reading WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @fromMs AND time_ms < @cutoffMs`,
  protections: `SELECT p.bench_id AS "benchId", p.from_ms AS "fromMs", p.to_ms AS "toMs"
                  FROM batch_placement p JOIN batch b ON b.id = p.batch_id
                 WHERE b.closed_at_ms IS NULL OR b.closed_at_ms >= @keepBatchesClosedSinceMs`,
  stale: `SELECT 1 AS stale FROM reading_rollup_stale WHERE bench_id = @benchId AND quantity = @quantity AND hour_ms = @hourMs`,
  // Per minute of the hour: the raw readings, and whether the 1-minute rollup counts at least as
  // many. Fewer raw than rolled up is fine (part of the hour already went in an earlier chunk);
  // more raw than rolled up means readings were written without their rollups: keep the hour.
  coverage: `SELECT COALESCE(SUM(r.n), 0) AS rows, COALESCE(SUM(CASE WHEN u.count IS NULL OR u.count < r.n THEN 1 ELSE 0 END), 0) AS uncovered
               FROM (SELECT time_ms / ${MINUTE_MS} AS m, COUNT(*) AS n FROM reading
                      WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @hourMs AND time_ms < @hourEndMs
                      GROUP BY time_ms / ${MINUTE_MS}) r
               LEFT JOIN reading_rollup u
                 ON u.bench_id = @benchId AND u.quantity = @quantity AND u.resolution_ms = ${MINUTE_MS} AND u.start_ms = r.m * ${MINUTE_MS}`,
  // The hour's readings counted by each rollup tier; the three must agree, or a coarse chart
  // would no longer match a fine one once the raw readings are gone.
  tiers: `SELECT resolution_ms AS "resolutionMs", SUM(count) AS n FROM reading_rollup
           WHERE bench_id = @benchId AND quantity = @quantity AND resolution_ms IN (${MINUTE_MS}, 900000, ${HOUR_MS})
             AND start_ms >= @hourMs AND start_ms < @hourEndMs
           GROUP BY resolution_ms`,
  sliceEnd: `SELECT time_ms AS t FROM reading WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @fromMs AND time_ms < @toMs
              ORDER BY time_ms LIMIT 1 OFFSET @offset`,
  deleteRange: `DELETE FROM reading WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @fromMs AND time_ms < @toMs`,
};

type RetentionStatement = keyof typeof RETENTION_SQL;

/** One statement the walk asks for; the answer comes back through the generator's next(). */
interface Step {
  key: RetentionStatement;
  mode: "get" | "all" | "run";
  params: SqlParams;
}

type Walk<T> = Generator<Step, T, unknown>;

function* get<T>(key: RetentionStatement, params: SqlParams): Walk<T | undefined> {
  return (yield { key, mode: "get", params }) as T | undefined;
}

function* all<T>(key: RetentionStatement, params: SqlParams): Walk<T[]> {
  return (yield { key, mode: "all", params }) as T[];
}

/** Resolves to the rows deleted. */
function* run(key: RetentionStatement, params: SqlParams): Walk<number> {
  return (yield { key, mode: "run", params }) as number;
}

/** The advisory lock instances sharing a PostgreSQL database take in turn, one chunk at a time (arbitrary but fixed). */
export const RETENTION_LOCK_KEY = 0x62775f72;

/**
 * The SQL of raw-reading retention, hand-written like the ingest's: a pass walks every (bench,
 * quantity) series hour by hour up to the cutoff through the readings' (bench, quantity, time)
 * index, and deletes an hour only when its rollups hold every reading in it.
 *
 * A chunk's checks and deletes form one transaction, so nothing can change between them. The walk
 * is written once, as a generator of statements, because the two databases must run it differently:
 * SQLite answers each statement synchronously inside one better-sqlite3 transaction (an await there
 * would let ingest's statements on the same connection into it); PostgreSQL answers them on one
 * pooled client inside BEGIN … COMMIT.
 *
 * Readings without a bench (a probe not on any bench) have no rollups and are never deleted.
 */
export class RetentionRepository {
  private readonly sql: Statements<RetentionStatement>;
  private readonly sqliteChunk: ((walk: Walk<ChunkResult>) => ChunkResult) | null = null;

  constructor(dataSource: DataSource) {
    this.sql = new Statements(dataSource, RETENTION_SQL);
    if (!this.sql.isPostgres) {
      this.sqliteChunk = rawDatabase(dataSource).transaction((walk: Walk<ChunkResult>) => {
        let step = walk.next();
        while (!step.done) {
          const { key, mode, params } = step.value;
          const statement = this.sql.sqlite(key);
          step = walk.next(mode === "run" ? statement.run(params).changes : statement[mode](params));
        }
        return step.value;
      });
    }
  }

  /** Every series retention walks, in a fixed order: each bench (archived ones too) × each quantity. */
  async series(): Promise<[number, Quantity][]> {
    const benches = (await this.sql.all<{ id: number }>("benches")).map((b) => b.id);
    return benches.flatMap((benchId) => QUANTITIES.map((quantity): [number, Quantity] => [benchId, quantity]));
  }

  /**
   * One chunk in one transaction: walks on from `cursor` (which it moves) and deletes at most
   * `rules.chunkRows` readings, examining at most about as many more in hours it keeps.
   */
  async chunk(series: [number, Quantity][], cursor: RetentionCursor, rules: RetentionRules): Promise<ChunkResult> {
    if (this.sqliteChunk) return this.sqliteChunk(this.walk(series, cursor, rules));
    return this.postgresChunk(series, cursor, rules);
  }

  /**
   * Repeatable read: the deletes see the snapshot the checks saw, so a reading written in between
   * (behind the ingest's back, without its rollups) is not deleted unchecked. The session advisory
   * lock, taken before the snapshot, keeps another instance's chunk from deleting under this one.
   */
  private async postgresChunk(series: [number, Quantity][], cursor: RetentionCursor, rules: RetentionRules): Promise<ChunkResult> {
    const client = await this.sql.postgresPool().connect();
    try {
      await client.query("SELECT pg_advisory_lock($1)", [RETENTION_LOCK_KEY]);
      await client.query("BEGIN ISOLATION LEVEL REPEATABLE READ");
      const walk = this.walk(series, cursor, rules);
      let step = walk.next();
      while (!step.done) {
        const { key, mode, params } = step.value;
        step = walk.next(await this.sql[mode](key, params, client));
      }
      await client.query("COMMIT");
      await client.query("SELECT pg_advisory_unlock($1)", [RETENTION_LOCK_KEY]);
      client.release();
      return step.value;
    } catch (err) {
      // Closed rather than pooled: the server rolls back and drops the session lock with the connection.
      client.release(err instanceof Error ? err : true);
      throw err;
    }
  }

  private *protections(rules: RetentionRules): Walk<Map<number, Protection[]>> {
    const byBench = new Map<number, Protection[]>();
    const rows = yield* all<{ benchId: number; fromMs: number; toMs: number | null }>("protections", { keepBatchesClosedSinceMs: rules.keepBatchesClosedSinceMs });
    for (const row of rows) {
      const list = byBench.get(row.benchId) ?? [];
      list.push({ fromMs: row.fromMs - rules.marginMs, toMs: row.toMs === null ? Infinity : row.toMs + rules.marginMs });
      byBench.set(row.benchId, list);
    }
    return byBench;
  }

  private *walk(series: [number, Quantity][], cursor: RetentionCursor, rules: RetentionRules): Walk<ChunkResult> {
    const result: ChunkResult = { deletedRows: 0, deletedHours: 0, keptForRollups: 0, keptForBatches: 0, done: false };
    // Re-read in every chunk: a batch stuck between two chunks protects its bench from the next one.
    const protections = yield* this.protections(rules);
    let examinedRows = 0;
    while (cursor.series < series.length) {
      const [benchId, quantity] = series[cursor.series]!;
      const first = (yield* get<{ t: number | null }>("first", { benchId, quantity, fromMs: cursor.fromMs, cutoffMs: rules.cutoffMs }))?.t ?? null;
      if (first === null) {
        cursor.series++;
        cursor.fromMs = 0;
        continue;
      }
      const hourMs = Math.floor(first / HOUR_MS) * HOUR_MS;
      const key = { benchId, quantity, hourMs, hourEndMs: hourMs + HOUR_MS };

      // An hour that touches a batch's time on this bench waits for the batch (see retention.service.ts).
      const protection = (protections.get(benchId) ?? []).find((p) => hourMs < p.toMs && hourMs + HOUR_MS > p.fromMs);
      if (protection) {
        result.keptForBatches++;
        cursor.fromMs = protection.toMs === Infinity ? rules.cutoffMs : Math.ceil(protection.toMs / HOUR_MS) * HOUR_MS;
        continue;
      }

      if (yield* get("stale", key)) {
        result.keptForRollups++;
        cursor.fromMs = hourMs + HOUR_MS;
        continue;
      }
      const coverage = (yield* get<{ rows: number; uncovered: number }>("coverage", key))!;
      const tiers = new Map((yield* all<{ resolutionMs: number; n: number }>("tiers", key)).map((t) => [t.resolutionMs, t.n]));
      const minuteCount = tiers.get(MINUTE_MS);
      const isCovered =
        coverage.uncovered === 0 && minuteCount !== undefined && minuteCount >= coverage.rows && tiers.get(900_000) === minuteCount && tiers.get(HOUR_MS) === minuteCount;
      if (!isCovered) {
        result.keptForRollups++;
        cursor.fromMs = hourMs + HOUR_MS;
        examinedRows += coverage.rows;
        if (examinedRows + result.deletedRows >= rules.chunkRows) return result;
        continue;
      }

      const room = rules.chunkRows - result.deletedRows;
      if (coverage.rows > room) {
        // The hour does not fit in what is left of this chunk: the next one starts with it.
        if (result.deletedRows > 0) return result;
        // An hour bigger than a whole chunk goes in slices of whole minutes (a minute's readings go
        // all at once, so a chart's end minute is either all raw or all rolled up).
        const sliceAt = (yield* get<{ t: number }>("sliceEnd", { benchId, quantity, fromMs: first, toMs: hourMs + HOUR_MS, offset: room }))!.t;
        const sliceEndMs = Math.max(Math.floor(sliceAt / MINUTE_MS) * MINUTE_MS, Math.floor(first / MINUTE_MS) * MINUTE_MS + MINUTE_MS);
        result.deletedRows += yield* run("deleteRange", { benchId, quantity, fromMs: hourMs, toMs: sliceEndMs });
        cursor.fromMs = sliceEndMs;
        return result;
      }
      result.deletedRows += yield* run("deleteRange", { benchId, quantity, fromMs: hourMs, toMs: hourMs + HOUR_MS });
      result.deletedHours++;
      cursor.fromMs = hourMs + HOUR_MS;
      if (result.deletedRows >= rules.chunkRows) return result;
    }
    result.done = true;
    return result;
  }
}
