import { randomBytes } from "node:crypto";
import pg from "pg";
import type { Quantity } from "../../shared/schemas/quantities.js";
import type { Logger } from "../lib/logger.js";
import type { ReadingRow } from "../modules/readings/readings.repository.js";

/**
 * What one server instance tells all of them (itself included): the live stream and the alert
 * engine follow readings stored by any instance, and caches follow changes made through any instance.
 */
export type ClusterEvent =
  | { type: "readings"; rows: ReadingRow[] }
  | { type: "alerts"; alertIds: number[] }
  /** An alert's tracker was changed outside the engine (acknowledged through another instance). */
  | { type: "tracker"; alertId: number }
  /** A sensor's MQTT last will arrived at this instance. */
  | { type: "sensor-offline"; sensorId: string }
  /** A sensor's settings (bench, calibration, secret, disabled) changed. */
  | { type: "sensor"; sensorId: string }
  /** Windows, margins or the layout of benches changed. */
  | { type: "windows" }
  /** Mail was written to the outbox. */
  | { type: "outbox" }
  /** This instance may have missed events (its listener reconnected): re-read what is cached. */
  | { type: "resync" };

export interface EventBus {
  publish(event: ClusterEvent): void;
  subscribe(handler: (event: ClusterEvent) => void): void;
  close(): Promise<void>;
}

function dispatch(handlers: Iterable<(event: ClusterEvent) => void>, event: ClusterEvent, logger: Logger): void {
  for (const handler of handlers) {
    try {
      handler(event);
    } catch (err) {
      logger.error({ err, type: event.type }, "event handler failed");
    }
  }
}

/** One instance (SQLite, or a single instance on PostgreSQL): events go straight to the handlers, synchronously. */
export class LocalEventBus implements EventBus {
  private readonly handlers = new Set<(event: ClusterEvent) => void>();
  constructor(private readonly logger: Logger) {}
  publish(event: ClusterEvent): void {
    dispatch(this.handlers, event, this.logger);
  }
  subscribe(handler: (event: ClusterEvent) => void): void {
    this.handlers.add(handler);
  }
  async close(): Promise<void> {
    this.handlers.clear();
  }
}

const CHANNEL = "benchwarden_events";
/** PostgreSQL refuses a NOTIFY payload of 8,000 bytes or more. */
const MAX_PAYLOAD_BYTES = 7_900;

type ReadingTuple = [sensorId: string, benchId: number | null, quantity: Quantity, timeMs: number, value: number];

/** The start of every payload sent by `origin`: it comes first, so a listener knows its own echo without parsing it. */
function originHead(origin: string): string {
  return origin ? `{"o":${JSON.stringify(origin)},` : "{";
}

/**
 * Splits an event into payloads under the NOTIFY limit (only a batch of readings can be that
 * large), each marked with the sending bus's origin.
 */
export function encodeEvent(event: ClusterEvent, origin = ""): string[] {
  if (event.type !== "readings") return [originHead(origin) + JSON.stringify(event).slice(1)];
  const payloads: string[] = [];
  let tuples: string[] = [];
  let bytes = 0;
  const head = `${originHead(origin)}"type":"readings","r":[`;
  for (const r of event.rows) {
    const tuple = JSON.stringify([r.sensorId, r.benchId, r.quantity, r.timeMs, r.value] satisfies ReadingTuple);
    const size = Buffer.byteLength(tuple) + 1;
    if (tuples.length > 0 && head.length + bytes + size + 2 > MAX_PAYLOAD_BYTES) {
      payloads.push(`${head}${tuples.join(",")}]}`);
      tuples = [];
      bytes = 0;
    }
    tuples.push(tuple);
    bytes += size;
  }
  if (tuples.length > 0) payloads.push(`${head}${tuples.join(",")}]}`);
  return payloads;
}

export function decodeEvent(payload: string): ClusterEvent {
  const { o: _origin, ...parsed } = JSON.parse(payload) as (ClusterEvent | { type: "readings"; r: ReadingTuple[] }) & { o?: string };
  if (parsed.type === "readings" && "r" in parsed) {
    return { type: "readings", rows: parsed.r.map(([sensorId, benchId, quantity, timeMs, value]) => ({ sensorId, benchId, quantity, timeMs, value })) };
  }
  return parsed as ClusterEvent;
}

/**
 * Several instances on one PostgreSQL database: events go out with NOTIFY and reach every other
 * instance through LISTEN on a connection of their own. This instance's own events go straight to
 * its handlers, synchronously as on SQLite, and their echo is dropped: once a reading is
 * acknowledged, the engine here already has it (engine.idle() covers it), with no round trip through
 * the database for every batch of readings. NOTIFY delivers only to
 * sessions listening at that moment, so after the listener reconnects it tells the handlers to
 * re-read their caches ("resync"); readings missed meanwhile are only missed by the live view
 * (the dashboard re-reads the latest values) and by the engine until the sensor's next reading.
 */
export class PostgresEventBus implements EventBus {
  private readonly handlers = new Set<(event: ClusterEvent) => void>();
  private listener: pg.Client | null = null;
  private closed = false;
  private reconnectTimer: NodeJS.Timeout | null = null;
  private sending: Promise<unknown> = Promise.resolve();
  /** Marks this bus's payloads, so its listener can drop their echo. */
  private readonly origin = randomBytes(8).toString("hex");
  private readonly ownHead = originHead(this.origin);

  constructor(
    private readonly pool: pg.Pool,
    private readonly connectionString: string,
    private readonly logger: Logger,
  ) {}

  /** Connect the listener; resolves once LISTEN is in place, so nothing published after it is missed. */
  async start(): Promise<void> {
    await this.listen(false);
  }

  private async listen(reconnected: boolean): Promise<void> {
    const client = new pg.Client({ connectionString: this.connectionString, application_name: "benchwarden-listener" });
    client.on("notification", (message) => {
      if (message.channel !== CHANNEL || !message.payload) return;
      if (message.payload.startsWith(this.ownHead)) return; // handled when published
      let event: ClusterEvent;
      try {
        event = decodeEvent(message.payload);
      } catch (err) {
        this.logger.error({ err }, "unreadable event from another instance");
        return;
      }
      dispatch(this.handlers, event, this.logger);
    });
    client.on("error", (err) => {
      this.logger.warn({ err }, "event listener connection failed; reconnecting");
      this.scheduleReconnect(client);
    });
    client.on("end", () => this.scheduleReconnect(client));
    await client.connect();
    await client.query(`LISTEN ${CHANNEL}`);
    this.listener = client;
    if (reconnected) dispatch(this.handlers, { type: "resync" }, this.logger);
  }

  private scheduleReconnect(client: pg.Client): void {
    if (this.closed || this.listener !== client || this.reconnectTimer) return;
    this.listener = null;
    void client.end().catch(() => undefined);
    const retry = () => {
      this.reconnectTimer = null;
      if (this.closed) return;
      this.listen(true).catch((err: unknown) => {
        this.logger.warn({ err }, "event listener could not reconnect; retrying");
        this.reconnectTimer = setTimeout(retry, 1000);
      });
    };
    this.reconnectTimer = setTimeout(retry, 200);
  }

  /** Handled here at once; sent to the others queued in order, one statement carrying every payload of the event. */
  publish(event: ClusterEvent): void {
    dispatch(this.handlers, event, this.logger);
    const payloads = encodeEvent(event, this.origin);
    this.sending = this.sending
      .then(() => this.pool.query(`SELECT pg_notify($1, p) FROM unnest($2::text[]) AS p`, [CHANNEL, payloads]))
      .catch((err: unknown) => this.logger.warn({ err, type: event.type }, "could not tell the other instances"));
  }

  subscribe(handler: (event: ClusterEvent) => void): void {
    this.handlers.add(handler);
  }

  async close(): Promise<void> {
    this.closed = true;
    if (this.reconnectTimer) clearTimeout(this.reconnectTimer);
    await this.sending;
    const listener = this.listener;
    this.listener = null;
    if (listener) await listener.end().catch(() => undefined);
    this.handlers.clear();
  }
}
