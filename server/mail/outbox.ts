import { randomUUID } from "node:crypto";
import { IsNull, LessThanOrEqual, type DataSource, type EntityManager } from "typeorm";
import { OutboxEntity } from "../db/entities/outbox.entity.js";
import type { Logger } from "../lib/logger.js";
import type { Metrics } from "../lib/metrics.js";
import type { OutgoingMail, SmtpTransport } from "./mailer.js";

/** Retry back-off: first, 2×, 4× … capped at 5 minutes, for as long as it takes. */
export function retryDelayMs(attempts: number, firstMs = 5000): number {
  return Math.min(5 * 60_000, firstMs * 2 ** Math.max(0, attempts - 1));
}

export interface Mailer {
  /** Write a message to the outbox (in `tx` when given, so it commits with the change that caused it). */
  enqueue(mail: Omit<OutgoingMail, "messageId">, tx?: EntityManager): Promise<void>;
}

/**
 * The e-mail outbox: messages are rows first, then a worker sends them with retries. A message
 * is marked sent only after the relay accepted it; if the process dies in between, it is sent
 * again after the restart with the same Message-ID (at-least-once, the best SMTP allows).
 */
export class Outbox implements Mailer {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;
  private stopped = false;

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
      subject: mail.subject,
      text: mail.text,
      html: mail.html ?? null,
      createdAtMs: this.now(),
      attempts: 0,
      nextAttemptMs: this.now(),
      sentAtMs: null,
      lastError: null,
    });
    // After the caller's transaction commits, send without waiting for the next poll.
    if (!tx) this.kick();
    else setImmediate(() => this.kick());
  }

  start(): void {
    this.timer = setInterval(() => this.kick(), this.options.pollMs);
    this.timer.unref();
    this.kick();
  }

  /** Start sending now, unless a pass is already running (it will pick the new rows up). */
  kick(): void {
    if (!this.running) void this.sendDue();
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
    const repo = this.dataSource.getRepository(OutboxEntity);
    for (;;) {
      if (this.stopped) return;
      const due = await repo.find({ where: { sentAtMs: IsNull(), nextAttemptMs: LessThanOrEqual(this.now()) }, order: { id: "ASC" }, take: 20 });
      if (due.length === 0) return;
      for (const message of due) {
        if (this.stopped) return;
        try {
          await this.transport.deliver({ to: message.toAddress, subject: message.subject, text: message.text, html: message.html, messageId: message.messageId });
          await repo.update({ id: message.id }, { sentAtMs: this.now(), attempts: message.attempts + 1, lastError: null });
          this.metrics.mailSent.inc();
        } catch (err) {
          const attempts = message.attempts + 1;
          const error = err instanceof Error ? err.message : String(err);
          await repo.update({ id: message.id }, { attempts, nextAttemptMs: this.now() + retryDelayMs(attempts, this.options.retryFirstMs), lastError: error.slice(0, 500) });
          this.metrics.mailFailed.inc();
          this.logger.warn({ to: message.toAddress, attempts, error }, "mail not sent; will retry");
          // The relay is down: stop this pass, the rest would fail the same way.
          return;
        }
      }
    }
  }

  /** Stop polling and let a send in progress finish. */
  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.stopped = true;
    await this.running;
  }
}
