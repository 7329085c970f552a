import type { Logger } from "../../lib/logger.js";
import type { Metrics } from "../../lib/metrics.js";
import type { ReadingRow, ReadingsRepository } from "./readings.repository.js";

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
 */
export class ReadingWriter {
  private queue: Pending[] = [];
  private queuedRows = 0;
  private timer: NodeJS.Timeout | NodeJS.Immediate | null = null;
  private closed = false;
  private readonly maxBatchRows: number;
  private readonly maxWaitMs: number;

  constructor(
    private readonly repository: ReadingsRepository,
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
      if (this.queuedRows >= this.maxBatchRows) this.flush();
      else this.timer ??= this.maxWaitMs > 0 ? setTimeout(() => this.flush(), this.maxWaitMs) : setImmediate(() => this.flush());
    });
  }

  /** Write everything waiting now, in one transaction. */
  flush(): void {
    if (this.timer) {
      clearTimeout(this.timer as NodeJS.Timeout);
      clearImmediate(this.timer as NodeJS.Immediate);
    }
    this.timer = null;
    const batch = this.queue;
    if (batch.length === 0) return;
    this.queue = [];
    this.queuedRows = 0;
    const rows = batch.flatMap((p) => p.rows);
    let stored: ReadingRow[];
    const startedNs = process.hrtime.bigint();
    try {
      stored = this.repository.insertReadings(rows);
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

  /** Flush what is waiting and refuse anything new. */
  close(): void {
    this.flush();
    this.closed = true;
  }
}
