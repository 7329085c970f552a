import type { DataSource } from "typeorm";
import type { Logger } from "../../lib/logger.js";
import type { Metrics } from "../../lib/metrics.js";
import { RetentionRepository, type RetentionCursor, type RetentionRules } from "./retention.repository.js";

const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;
/** A pass every hour: the cutoff moves by an hour, so each pass has about an hour of readings to delete. */
export const RETENTION_EVERY_MS = HOUR_MS;

export interface RetentionOptions {
  /** Raw readings older than this go once their rollups exist; 0 = keep forever (the job does nothing). */
  retentionDays: number;
  /** Whether the hourly pass runs on this instance (the one holding the alert lease); default always. */
  isOurTurn?: () => boolean;
  /** Most readings one transaction deletes. */
  chunkRows: number;
  /**
   * Readings this close before or after a batch's time on a bench are kept with it: reports read
   * one sensor-silent delay around each placement to decide the holds at its edges.
   */
  batchMarginMs: number;
  now?: () => number;
}

/** What one pass did (also the fields of its log line). */
export interface RetentionRun {
  cutoffMs: number;
  deletedRows: number;
  deletedHours: number;
  keptForRollups: number;
  keptForBatches: number;
  chunks: number;
  largestChunkRows: number;
  longestChunkMs: number;
  durationMs: number;
  /** True when stop() ended the pass before it reached the cutoff. */
  stopped: boolean;
}

/**
 * Raw-reading retention (issue 10 §5): deletes raw readings older than the retention once the
 * rollups the charts and interval exports read hold them, in chunks, at start and then hourly.
 *
 * An hour of a bench's readings (one quantity) goes only when all of these hold:
 * - it ends before the cutoff (now − retention, to the hour);
 * - its 1-minute rollups count at least every raw reading of their minute, and its 1-minute,
 *   15-minute and 1-hour rollups count the same readings (the charts read all three);
 * - it is not marked stale (a back-dated probe move re-filed readings and its rollups are due for a
 *   rebuild from the raw readings);
 * - no batch was on the bench then (within the margin) unless that batch closed more than the
 *   retention ago.
 *
 * The batch rule chosen: a batch's readings are kept while it is open and for the retention period
 * after it closes, whether or not their rollups exist. The strike-rate report of a batch reads the
 * raw readings of its whole life — time in window per reading, dew point from each probe's air
 * temperature and humidity taken together — which per-bench rollups cannot give. Keeping them only
 * "until their rollups exist" would protect nothing (rollups exist from ingest on), and keeping them
 * only until the batch closes would empty the report of a long batch the hour after it is closed,
 * just when the manager reads it. A batch reopened within the retention finds its readings intact.
 *
 * On SQLite, ingest shares the writer and runs on the same thread: each chunk is one short synchronous
 * transaction, and the pass yields to the event loop between chunks, so a waiting ingest batch
 * commits after at most one chunk. On PostgreSQL a chunk is one transaction on one pooled client and
 * ingest commits alongside it; instances sharing the database take turns chunk by chunk.
 */
export class ReadingRetention {
  private readonly repository: RetentionRepository;
  private readonly now: () => number;
  private timer: NodeJS.Timeout | null = null;
  private current: Promise<RetentionRun> | null = null;
  private stopping = false;

  constructor(
    dataSource: DataSource,
    private readonly options: RetentionOptions,
    private readonly metrics: Metrics,
    private readonly logger: Logger,
  ) {
    this.repository = new RetentionRepository(dataSource);
    this.now = options.now ?? Date.now;
  }

  get isEnabled(): boolean {
    return this.options.retentionDays > 0;
  }

  /** A pass now, then one every hour. Does nothing when retention is off. */
  start(): void {
    if (!this.isEnabled) {
      this.logger.info("raw-reading retention off (READING_RETENTION_DAYS=0): raw readings are kept forever");
      return;
    }
    const tick = () => {
      if (this.current || this.stopping || !(this.options.isOurTurn?.() ?? true)) return;
      void this.run().catch((err: unknown) => this.logger.error({ err }, "raw-reading retention pass failed"));
    };
    tick();
    this.timer = setInterval(tick, RETENTION_EVERY_MS);
    this.timer.unref();
  }

  /** One pass, after any pass already running. */
  run(): Promise<RetentionRun> {
    const before = this.current;
    const mine = (async () => {
      if (before) await before.catch(() => undefined);
      return this.pass();
    })();
    this.current = mine;
    void mine
      .catch(() => undefined)
      .finally(() => {
        if (this.current === mine) this.current = null;
      });
    return mine;
  }

  /** No new chunk after this; waits for the pass in progress to end at its next chunk boundary. */
  async stop(): Promise<void> {
    this.stopping = true;
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.current?.catch(() => undefined);
  }

  private async pass(): Promise<RetentionRun> {
    const startedMs = performance.now();
    const nowMs = this.now();
    const retentionMs = this.options.retentionDays * DAY_MS;
    const rules: RetentionRules = {
      cutoffMs: Math.floor((nowMs - retentionMs) / HOUR_MS) * HOUR_MS,
      keepBatchesClosedSinceMs: nowMs - retentionMs,
      marginMs: this.options.batchMarginMs,
      chunkRows: this.options.chunkRows,
    };
    const run: RetentionRun = {
      cutoffMs: rules.cutoffMs,
      deletedRows: 0,
      deletedHours: 0,
      keptForRollups: 0,
      keptForBatches: 0,
      chunks: 0,
      largestChunkRows: 0,
      longestChunkMs: 0,
      durationMs: 0,
      stopped: false,
    };
    if (!this.isEnabled) return run;
    const series = await this.repository.series();
    const cursor: RetentionCursor = { series: 0, fromMs: 0 };
    for (;;) {
      if (this.stopping) {
        run.stopped = true;
        break;
      }
      const chunkStartedMs = performance.now();
      const chunk = await this.repository.chunk(series, cursor, rules);
      const chunkMs = performance.now() - chunkStartedMs;
      run.chunks++;
      run.deletedRows += chunk.deletedRows;
      run.deletedHours += chunk.deletedHours;
      run.keptForRollups += chunk.keptForRollups;
      run.keptForBatches += chunk.keptForBatches;
      run.largestChunkRows = Math.max(run.largestChunkRows, chunk.deletedRows);
      run.longestChunkMs = Math.max(run.longestChunkMs, chunkMs);
      this.metrics.retentionDeleted.inc({}, chunk.deletedRows);
      this.metrics.retentionChunkSeconds.observe(chunkMs / 1000);
      if (chunk.done) break;
      // Let ingest (and everything else) in before the next chunk.
      await new Promise<void>((resolve) => setImmediate(resolve));
    }
    run.durationMs = performance.now() - startedMs;
    this.logger.info(
      {
        cutoff: new Date(run.cutoffMs).toISOString(),
        deletedRows: run.deletedRows,
        deletedHours: run.deletedHours,
        keptForRollups: run.keptForRollups,
        keptForBatches: run.keptForBatches,
        chunks: run.chunks,
        largestChunkRows: run.largestChunkRows,
        longestChunkMs: Math.round(run.longestChunkMs * 10) / 10,
        durationMs: Math.round(run.durationMs),
        stopped: run.stopped,
      },
      "raw-reading retention pass",
    );
    return run;
  }
}
