import type { Logger } from "../../lib/logger.js";
import type { Metrics } from "../../lib/metrics.js";
import type { ReadingStore } from "./reading-store.js";
import type { ReadingRow } from "./readings.repository.js";

interface Pending {
  rows: ReadingRow[];
  resolve: () => void;
  reject: (err: unknown) => void;
}

export interface ReadingWriterOptions {
  /** Flush when this many rows are waiting (SQLite's sweet spot is about 1,000 per transaction). */
  maxBatchRows?: number;
  /**
   * …or when the oldest waiting row has waited this long. 0 (the default) = at the end of the
   * current event-loop turn: whatever arrived together commits together ("group commit"), and a
   * lone sensor replaying its backlog one message at a time is not held to one commit per timer.
   */
  maxWaitMs?: number;
}

/**
 * Gathers readings from many messages into one transaction. Each enqueue() resolves only after
 * the transaction holding its rows has committed, so the caller can acknowledge to the sensor then.
 * One transaction is in flight at a time; rows arriving meanwhile gather for the next one.
 */
export class ReadingWriter {
  private queue: Pending[] = [];
  private queuedRows = 0;
  private timer: NodeJS.Timeout | NodeJS.Immediate | null = null;
  private closed = false;
  /** The transaction in flight. */
  private writing: Promise<void> | null = null;
  /** The flush asked for while one was in flight: it starts when that one ends. */
  private next: Promise<void> | null = null;
  private readonly maxBatchRows: number;
  private readonly maxWaitMs: number;

  constructor(
    private readonly store: Pick<ReadingStore, "insertReadings">,
    private readonly onStored: (rows: ReadingRow[]) => void,
    private readonly metrics: Metrics,
    private readonly logger: Logger,
    options: ReadingWriterOptions = {},
  ) {
    this.maxBatchRows = options.maxBatchRows ?? 1000;
    this.maxWaitMs = options.maxWaitMs ?? 0;
  }

  enqueue(rows: ReadingRow[]): Promise<void> {
    if (this.closed) return Promise.reject(new Error("reading writer is closed"));
    if (rows.length === 0) return Promise.resolve();
    return new Promise<void>((resolve, reject) => {
      this.queue.push({ rows, resolve, reject });
      this.queuedRows += rows.length;
      if (this.queuedRows >= this.maxBatchRows) void this.flush();
      else this.timer ??= this.maxWaitMs > 0 ? setTimeout(() => void this.flush(), this.maxWaitMs) : setImmediate(() => void this.flush());
    });
  }

  /**
   * Write everything waiting now in one transaction, after the one in flight if any. Resolves
   * once that is committed or has failed; never rejects (a failure rejects the enqueue() calls).
   */
  flush(): Promise<void> {
    if (this.timer) {
      clearTimeout(this.timer as NodeJS.Timeout);
      clearImmediate(this.timer as NodeJS.Immediate);
    }
    this.timer = null;
    if (this.writing) {
      if (this.queue.length === 0) return this.writing;
      return (this.next ??= this.writing.then(() => {
        this.next = null;
        return this.flush();
      }));
    }
    const batch = this.queue;
    if (batch.length === 0) return Promise.resolve();
    this.queue = [];
    this.queuedRows = 0;
    const writing = this.write(batch).finally(() => {
      this.writing = null;
    });
    this.writing = writing;
    return writing;
  }

  private async write(batch: Pending[]): Promise<void> {
    const rows = batch.flatMap((p) => p.rows);
    let stored: ReadingRow[];
    const startedNs = process.hrtime.bigint();
    try {
      stored = await this.store.insertReadings(rows);
      this.metrics.batchCommitSeconds.observe(Number(process.hrtime.bigint() - startedNs) / 1e9);
      this.metrics.batchRows.observe(rows.length);
    } catch (err) {
      this.logger.error({ err, rows: rows.length }, "reading batch failed to commit; sensors will re-send");
      for (const p of batch) p.reject(err);
      return;
    }
    this.metrics.writeBatches.inc();
    this.metrics.readingsStored.inc({}, stored.length);
    this.metrics.readingsDuplicate.inc({}, rows.length - stored.length);
    for (const p of batch) p.resolve();
    if (stored.length > 0) {
      try {
        this.onStored(stored);
      } catch (err) {
        this.logger.error({ err }, "after-commit handler failed");
      }
    }
  }

  /** Refuse anything new, then write what is waiting; resolves once that is committed (or has failed). */
  close(): Promise<void> {
    this.closed = true;
    return this.flush();
  }
}
