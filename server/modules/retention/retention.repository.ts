import type BetterSqlite3 from "better-sqlite3";
import { QUANTITIES, type Quantity } from "../../../shared/schemas/quantities.js";

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

/**
 * The SQL of raw-reading retention, on the raw better-sqlite3 handle like the ingest's: a pass walks
 * every (bench, quantity) series hour by hour up to the cutoff through the readings' (bench,
 * quantity, time) index, and deletes an hour only when its rollups hold every reading in it.
 *
 * Readings without a bench (a probe not on any bench) have no rollups and are never deleted.
 */
export class RetentionRepository {
  private readonly selectBenches: BetterSqlite3.Statement;
  private readonly selectFirst: BetterSqlite3.Statement;
  private readonly selectProtections: BetterSqlite3.Statement;
  private readonly selectStale: BetterSqlite3.Statement;
  private readonly selectCoverage: BetterSqlite3.Statement;
  private readonly selectTiers: BetterSqlite3.Statement;
  private readonly selectSliceEnd: BetterSqlite3.Statement;
  private readonly deleteRange: BetterSqlite3.Statement;
  private readonly chunkTransaction: (series: [number, Quantity][], cursor: RetentionCursor, rules: RetentionRules) => ChunkResult;

  constructor(db: BetterSqlite3.Database) {
    this.selectBenches = db.prepare(`SELECT id FROM bench ORDER BY id`);
    this.selectFirst = db.prepare(
      `SELECT MIN(time_ms) AS t FROM reading WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @fromMs AND time_ms < @cutoffMs`,
    );
    this.selectProtections = db.prepare(
      `SELECT p.bench_id AS benchId, p.from_ms AS fromMs, p.to_ms AS toMs
         FROM batch_placement p JOIN batch b ON b.id = p.batch_id
        WHERE b.closed_at_ms IS NULL OR b.closed_at_ms >= @keepBatchesClosedSinceMs`,
    );
    this.selectStale = db.prepare(`SELECT 1 AS stale FROM reading_rollup_stale WHERE bench_id = @benchId AND quantity = @quantity AND hour_ms = @hourMs`);
    // Per minute of the hour: the raw readings, and whether the 1-minute rollup counts at least as
    // many. Fewer raw than rolled up is fine (part of the hour already went in an earlier chunk);
    // more raw than rolled up means readings were written without their rollups: keep the hour.
    this.selectCoverage = db.prepare(
      `SELECT COALESCE(SUM(r.n), 0) AS rows, COALESCE(SUM(u.count IS NULL OR u.count < r.n), 0) AS uncovered
         FROM (SELECT time_ms / ${MINUTE_MS} AS m, COUNT(*) AS n FROM reading
                WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @hourMs AND time_ms < @hourMs + ${HOUR_MS}
                GROUP BY time_ms / ${MINUTE_MS}) r
         LEFT JOIN reading_rollup u
           ON u.bench_id = @benchId AND u.quantity = @quantity AND u.resolution_ms = ${MINUTE_MS} AND u.start_ms = r.m * ${MINUTE_MS}`,
    );
    // The hour's readings counted by each rollup tier; the three must agree, or a coarse chart
    // would no longer match a fine one once the raw readings are gone.
    this.selectTiers = db.prepare(
      `SELECT resolution_ms AS resolutionMs, SUM(count) AS n FROM reading_rollup
        WHERE bench_id = @benchId AND quantity = @quantity AND resolution_ms IN (${MINUTE_MS}, 900000, ${HOUR_MS})
          AND start_ms >= @hourMs AND start_ms < @hourMs + ${HOUR_MS}
        GROUP BY resolution_ms`,
    );
    this.selectSliceEnd = db.prepare(
      `SELECT time_ms AS t FROM reading WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @fromMs AND time_ms < @toMs
        ORDER BY time_ms LIMIT 1 OFFSET @offset`,
    );
    this.deleteRange = db.prepare(`DELETE FROM reading WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @fromMs AND time_ms < @toMs`);
    this.chunkTransaction = db.transaction((series, cursor, rules) => this.walk(series, cursor, rules));
  }

  /** Every series retention walks, in a fixed order: each bench (archived ones too) × each quantity. */
  series(): [number, Quantity][] {
    const benches = (this.selectBenches.all() as { id: number }[]).map((b) => b.id);
    return benches.flatMap((benchId) => QUANTITIES.map((quantity): [number, Quantity] => [benchId, quantity]));
  }

  /**
   * One chunk in one transaction: walks on from `cursor` (which it moves) and deletes at most
   * `rules.chunkRows` readings, examining at most about as many more in hours it keeps. The checks
   * and the delete share the transaction, so nothing can change between them.
   */
  chunk(series: [number, Quantity][], cursor: RetentionCursor, rules: RetentionRules): ChunkResult {
    return this.chunkTransaction(series, cursor, rules);
  }

  private protections(rules: RetentionRules): Map<number, Protection[]> {
    const byBench = new Map<number, Protection[]>();
    const rows = this.selectProtections.all({ keepBatchesClosedSinceMs: rules.keepBatchesClosedSinceMs }) as { benchId: number; fromMs: number; toMs: number | null }[];
    for (const row of rows) {
      const list = byBench.get(row.benchId) ?? [];
      list.push({ fromMs: row.fromMs - rules.marginMs, toMs: row.toMs === null ? Infinity : row.toMs + rules.marginMs });
      byBench.set(row.benchId, list);
    }
    return byBench;
  }

  private walk(series: [number, Quantity][], cursor: RetentionCursor, rules: RetentionRules): ChunkResult {
    const result: ChunkResult = { deletedRows: 0, deletedHours: 0, keptForRollups: 0, keptForBatches: 0, done: false };
    // Re-read in every chunk: a batch stuck between two chunks protects its bench from the next one.
    const protections = this.protections(rules);
    let examinedRows = 0;
    while (cursor.series < series.length) {
      const [benchId, quantity] = series[cursor.series]!;
      const first = (this.selectFirst.get({ benchId, quantity, fromMs: cursor.fromMs, cutoffMs: rules.cutoffMs }) as { t: number | null }).t;
      if (first === null) {
        cursor.series++;
        cursor.fromMs = 0;
        continue;
      }
      const hourMs = Math.floor(first / HOUR_MS) * HOUR_MS;
      const key = { benchId, quantity, hourMs };

      // An hour that touches a batch's time on this bench waits for the batch (see retention.service.ts).
      const protection = (protections.get(benchId) ?? []).find((p) => hourMs < p.toMs && hourMs + HOUR_MS > p.fromMs);
      if (protection) {
        result.keptForBatches++;
        cursor.fromMs = protection.toMs === Infinity ? rules.cutoffMs : Math.ceil(protection.toMs / HOUR_MS) * HOUR_MS;
        continue;
      }

      if (this.selectStale.get(key)) {
        result.keptForRollups++;
        cursor.fromMs = hourMs + HOUR_MS;
        continue;
      }
      const coverage = this.selectCoverage.get(key) as { rows: number; uncovered: number };
      const tiers = new Map((this.selectTiers.all(key) as { resolutionMs: number; n: number }[]).map((t) => [t.resolutionMs, t.n]));
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
        const sliceAt = (this.selectSliceEnd.get({ benchId, quantity, fromMs: first, toMs: hourMs + HOUR_MS, offset: room }) as { t: number }).t;
        const sliceEndMs = Math.max(Math.floor(sliceAt / MINUTE_MS) * MINUTE_MS, Math.floor(first / MINUTE_MS) * MINUTE_MS + MINUTE_MS);
        result.deletedRows += this.deleteRange.run({ benchId, quantity, fromMs: hourMs, toMs: sliceEndMs }).changes;
        cursor.fromMs = sliceEndMs;
        return result;
      }
      result.deletedRows += this.deleteRange.run({ benchId, quantity, fromMs: hourMs, toMs: hourMs + HOUR_MS }).changes;
      result.deletedHours++;
      cursor.fromMs = hourMs + HOUR_MS;
      if (result.deletedRows >= rules.chunkRows) return result;
    }
    result.done = true;
    return result;
  }
}
