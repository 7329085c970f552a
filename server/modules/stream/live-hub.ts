import type { Response } from "express";
import type { AlertView } from "../../../shared/schemas/alerts.js";
import type { ReadingEvent } from "../../../shared/schemas/stream.js";

/**
 * Fans committed readings out to every open server-sent-events stream. Readings are coalesced per
 * sensor and quantity and sent at most every `flushMs`, so a large fleet does not flood a tablet.
 */
export class LiveHub {
  private readonly clients = new Set<Response>();
  private pending = new Map<string, ReadingEvent>();
  private timer: NodeJS.Timeout | null = null;
  private readonly heartbeat: NodeJS.Timeout;

  constructor(private readonly flushMs = 500) {
    // A comment line every 20 s keeps proxies from closing an idle stream.
    this.heartbeat = setInterval(() => this.broadcast(": keep-alive\n\n"), 20_000);
    this.heartbeat.unref();
  }

  get clientCount(): number {
    return this.clients.size;
  }

  attach(res: Response): void {
    res.writeHead(200, {
      "Content-Type": "text/event-stream",
      "Cache-Control": "no-cache, no-transform",
      Connection: "keep-alive",
      "X-Accel-Buffering": "no",
    });
    res.write("retry: 3000\n\n");
    this.clients.add(res);
    res.on("close", () => this.clients.delete(res));
  }

  publishReadings(events: ReadingEvent[]): void {
    if (this.clients.size === 0) return;
    for (const e of events) {
      const key = `${e.sensorId}\u0000${e.quantity}`;
      const seen = this.pending.get(key);
      if (!seen || e.timeMs >= seen.timeMs) this.pending.set(key, e);
    }
    this.timer ??= setTimeout(() => this.flush(), this.flushMs);
  }

  /** Alerts that changed go out at once: they are few, and the night shift waits for them. */
  publishAlerts(alerts: AlertView[]): void {
    if (alerts.length > 0) this.broadcast(`event: alerts\ndata: ${JSON.stringify({ alerts })}\n\n`);
  }

  private flush(): void {
    this.timer = null;
    const readings = [...this.pending.values()];
    this.pending = new Map();
    if (readings.length > 0) this.broadcast(`event: readings\ndata: ${JSON.stringify({ readings })}\n\n`);
  }

  private broadcast(chunk: string): void {
    for (const res of this.clients) res.write(chunk);
  }

  close(): void {
    clearInterval(this.heartbeat);
    if (this.timer) clearTimeout(this.timer);
    for (const res of this.clients) res.end();
    this.clients.clear();
  }
}
