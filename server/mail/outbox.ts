import { randomUUID } from "node:crypto";
import { IsNull, LessThanOrEqual, type DataSource, type EntityManager } from "typeorm";
import { isPostgres } from "../db/data-source.js";
import { OutboxEntity, type OutboxRecord } from "../db/entities/outbox.entity.js";
import type { Logger } from "../lib/logger.js";
import type { Metrics } from "../lib/metrics.js";
import type { OutgoingMail, SmtpTransport } from "./mailer.js";

/** Retry back-off: first, 2×, 4× … capped at 5 minutes, for as long as it takes. */
export function retryDelayMs(attempts: number, firstMs = 5000): number {
  return Math.min(5 * 60_000, firstMs * 2 ** Math.max(0, attempts - 1));
}

/** The outbox's subject column holds this many characters (PostgreSQL enforces it; SQLite would not). */
export const MAX_SUBJECT_CHARS = 300;

/** A subject longer than the column (long zone, bench and sensor names), cut with an ellipsis rather than refused. */
export function fitSubject(subject: string): string {
  const chars = [...subject];
  return chars.length <= MAX_SUBJECT_CHARS ? subject : `${chars.slice(0, MAX_SUBJECT_CHARS - 1).join("")}…`;
}

export interface Mailer {
  /** Write a message to the outbox (in `tx` when given, so it commits with the change that caused it). */
  enqueue(mail: Omit<OutgoingMail, "messageId">, tx?: EntityManager): Promise<void>;
}

/**
 * The e-mail outbox: messages are rows first, then a worker sends them with retries. A message
 * is marked sent only after the relay accepted it; if the process dies in between, it is sent
 * again after the restart with the same Message-ID (at-least-once, the best SMTP allows).
 *
 * Only the instance holding the lease runs the worker (start() … pause()); on PostgreSQL each
 * message is also claimed with FOR UPDATE SKIP LOCKED for the length of its sending, so an instance
 * that has not yet noticed it lost the lease can never send the same row as its successor.
 */
export class Outbox implements Mailer {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;
  private stopped = false;
  /** Told after a message was written, for the worker on another instance. */
  onEnqueued: () => void = () => {};

  constructor(
    private readonly dataSource: DataSource,
    private readonly transport: SmtpTransport,
    private readonly logger: Logger,
    private readonly metrics: Metrics,
    private readonly options: { pollMs: number; domain: string; retryFirstMs?: number; now?: () => number },
  ) {}

  private now(): number {
    return this.options.now?.() ?? Date.now();
  }

  async enqueue(mail: Omit<OutgoingMail, "messageId">, tx?: EntityManager): Promise<void> {
    const manager = tx ?? this.dataSource.manager;
    await manager.getRepository(OutboxEntity).insert({
      messageId: `<${randomUUID()}@${this.options.domain}>`,
      toAddress: mail.to,
      subject: fitSubject(mail.subject),
      text: mail.text,
      html: mail.html ?? null,
      createdAtMs: this.now(),
      attempts: 0,
      nextAttemptMs: this.now(),
      sentAtMs: null,
      lastError: null,
    });
    // After the caller's transaction commits, send without waiting for the next poll.
    const after = () => {
      this.kick();
      this.onEnqueued();
    };
    if (!tx) after();
    else setImmediate(after);
  }

  /** Run the worker: poll for due messages (this instance holds the lease). */
  start(): void {
    if (this.stopped || this.timer) return;
    this.timer = setInterval(() => this.kick(), this.options.pollMs);
    this.timer.unref();
    this.kick();
  }

  /** Stop the worker (the lease went elsewhere) and let a send in progress finish. */
  async pause(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.running;
  }

  /** Start sending now when the worker runs here, unless a pass is already running (it will pick the new rows up). */
  kick(): void {
    if (this.timer && !this.running) void this.sendDue();
  }

  /**
   * Send every due message and resolve when none is due. Passes never overlap — two at once would
   * both pick the same row and send it twice — so a call during a pass waits for it, then runs one more.
   */
  sendDue(): Promise<void> {
    if (this.stopped) return Promise.resolve();
    if (this.running) return this.running.then(() => this.sendDue());
    const pass = this.sendPass().finally(() => {
      if (this.running === pass) this.running = null;
    });
    this.running = pass;
    return pass;
  }

  private async sendPass(): Promise<void> {
    if (isPostgres(this.dataSource)) return this.sendPassClaimingRows();
    const repo = this.dataSource.getRepository(OutboxEntity);
    for (;;) {
      if (this.stopped) return;
      const due = await repo.find({ where: { sentAtMs: IsNull(), nextAttemptMs: LessThanOrEqual(this.now()) }, order: { id: "ASC" }, take: 20 });
      if (due.length === 0) return;
      for (const message of due) {
        if (this.stopped) return;
        // The relay is down: stop this pass, the rest would fail the same way.
        if (!(await this.send(message, repo.manager))) return;
      }
    }
  }

  /**
   * PostgreSQL: one message per transaction, claimed with FOR UPDATE SKIP LOCKED and held until its
   * outcome is written; a row another instance is sending is skipped, and one it has sent no longer
   * matches (the lock re-checks sent_at_ms).
   */
  private async sendPassClaimingRows(): Promise<void> {
    for (;;) {
      if (this.stopped) return;
      const outcome = await this.dataSource.transaction(async (tx) => {
        const [message] = await tx
          .getRepository(OutboxEntity)
          .createQueryBuilder("o")
          .where("o.sentAtMs IS NULL AND o.nextAttemptMs <= :now", { now: this.now() })
          .orderBy("o.id", "ASC")
          .limit(1)
          .setLock("pessimistic_write")
          .setOnLocked("skip_locked")
          .getMany();
        if (!message) return "none" as const;
        return (await this.send(message, tx)) ? ("sent" as const) : ("failed" as const);
      });
      if (outcome !== "sent") return;
    }
  }

  /** Hand one message to the relay and record the outcome; false when the relay refused it. */
  private async send(message: OutboxRecord, manager: EntityManager): Promise<boolean> {
    const repo = manager.getRepository(OutboxEntity);
    try {
      await this.transport.deliver({ to: message.toAddress, subject: message.subject, text: message.text, html: message.html, messageId: message.messageId });
      await repo.update({ id: message.id }, { sentAtMs: this.now(), attempts: message.attempts + 1, lastError: null });
      this.metrics.mailSent.inc();
      return true;
    } catch (err) {
      const attempts = message.attempts + 1;
      const error = err instanceof Error ? err.message : String(err);
      await repo.update({ id: message.id }, { attempts, nextAttemptMs: this.now() + retryDelayMs(attempts, this.options.retryFirstMs), lastError: error.slice(0, 500) });
      this.metrics.mailFailed.inc();
      this.logger.warn({ to: message.toAddress, attempts, error }, "mail not sent; will retry");
      return false;
    }
  }

  /** Stop polling and let a send in progress finish. */
  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    this.stopped = true;
    await this.running;
  }
}
