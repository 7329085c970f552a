import { connect, type IClientOptions, type MqttClient } from "mqtt";
import type { GarbageKind } from "../payload/garbage.js";
import { OFFLINE_PAYLOAD, statusTopic } from "../payload/senml.js";
import type { Rng } from "../model/random.js";
import { backoffDelayMs, DEFAULT_BACKOFF, type BackoffOptions } from "./backoff.js";

/** One message a simulated probe hands to its connection. */
export interface Publication {
  topic: string;
  payload: string | Buffer;
  /** A normal reading pack, or which kind of garbage. */
  kind: "reading" | GarbageKind;
  /** Readings (records) in the pack; 0 for garbage. */
  readings: number;
  /** Overrides the device's QoS: garbage goes at QoS 0, or a pack the broker refuses would be re-sent for ever. */
  qos?: 0 | 1;
}

export interface DeviceOptions {
  brokerUrl: string;
  sensorId: string;
  secret: string;
  clientId: string;
  qos: 0 | 1;
  /** Most packs kept while offline; the oldest is dropped beyond it. */
  bufferLimit: number;
  /** Jitter for the back-off. */
  rng: Rng;
  backoff?: BackoffOptions;
  connectTimeoutMs?: number;
  keepaliveS?: number;
  /** Told about connection errors (the fleet prints the first of each kind). */
  onError?: (sensorId: string, message: string) => void;
  /** Told when a QoS 1 publication is acknowledged (or a QoS 0 one written). */
  onDelivered?: (sensorId: string, publication: Publication) => void;
}

export interface DeviceCounters {
  /** Publications handed to a live connection. */
  sent: number;
  /** QoS 1: PUBACK received. QoS 0: written to the socket. */
  delivered: number;
  /** Publications the client gave up on (errors); QoS 1 ones are not expected here. */
  failed: number;
  /** Packs dropped because the offline buffer was full. */
  overflow: number;
  /** Reconnect attempts. */
  reconnects: number;
  /** Successful connections (CONNACK accepted). */
  connects: number;
  /** Connections the broker refused (bad credentials, not authorised). */
  refused: number;
}

/**
 * One simulated probe's MQTT connection (MQTT 3.1.1, the embedded broker's protocol):
 * username = sensor id, password = secret, last will "offline" on its status topic; reconnects
 * with exponential back-off and jitter; keeps a bounded buffer of packs while offline and sends
 * it on return. QoS 1 packs already handed to the client stay in mqtt.js's outgoing store until
 * acknowledged and are re-sent after a reconnect (so the server must de-duplicate).
 */
export class SimDevice {
  readonly counters: DeviceCounters = { sent: 0, delivered: 0, failed: 0, overflow: 0, reconnects: 0, connects: 0, refused: 0 };
  private client: MqttClient | undefined;
  private buffer: Publication[] = [];
  private inFlightCount = 0;
  private attempt = 0;
  private dead = false;
  private closing = false;
  lastError: string | undefined;

  constructor(private readonly o: DeviceOptions) {}

  get sensorId(): string {
    return this.o.sensorId;
  }

  get online(): boolean {
    return this.client?.connected === true;
  }

  get buffered(): number {
    return this.buffer.length;
  }

  /** Handed to the client, not yet acknowledged (QoS 1) or written (QoS 0). */
  get inFlight(): number {
    return this.inFlightCount;
  }

  get isDead(): boolean {
    return this.dead;
  }

  /** Nothing left to send: buffer empty, nothing in flight (or the device is dead). */
  get idle(): boolean {
    return this.dead || (this.buffer.length === 0 && this.inFlightCount === 0);
  }

  private delay(attempt: number): number {
    return backoffDelayMs(attempt, this.o.rng.next(), this.o.backoff ?? DEFAULT_BACKOFF);
  }

  start(): void {
    if (this.client || this.dead) return;
    const o = this.o;
    const options: IClientOptions = {
      clientId: o.clientId,
      username: o.sensorId,
      password: o.secret,
      // protocolVersion stays at mqtt.js's default (4, MQTT 3.1.1): aedes refuses 5.
      clean: true,
      keepalive: o.keepaliveS ?? 30,
      connectTimeout: o.connectTimeoutMs ?? 10_000,
      reconnectPeriod: this.delay(0),
      reconnectOnConnackError: true,
      queueQoSZero: false,
      resubscribe: false,
      manualConnect: true,
      will: { topic: statusTopic(o.sensorId), payload: Buffer.from(OFFLINE_PAYLOAD), qos: 1, retain: false },
    };
    const client = connect(o.brokerUrl, options);
    this.client = client;
    client.on("connect", () => {
      this.counters.connects += 1;
      this.attempt = 0;
      client.options.reconnectPeriod = this.delay(0);
      this.flush();
    });
    // mqtt.js schedules each retry with options.reconnectPeriod as it stands when the connection
    // closes; raising it at every attempt turns its fixed period into exponential back-off.
    client.on("reconnect", () => {
      this.counters.reconnects += 1;
      this.attempt += 1;
      client.options.reconnectPeriod = this.delay(this.attempt);
    });
    client.on("error", (err: Error & { code?: number | string }) => {
      if (typeof err.code === "number" && [4, 5, 134, 135].includes(err.code)) this.counters.refused += 1;
      this.lastError = err.message;
      o.onError?.(o.sensorId, err.message);
    });
    client.connect();
  }

  /** Send now if connected, else keep it (bounded) for when the connection returns. */
  publish(publication: Publication): void {
    if (this.dead || this.closing) return;
    if (!this.online || this.buffer.length > 0) {
      this.buffer.push(publication);
      if (this.buffer.length > this.o.bufferLimit) {
        this.buffer.shift();
        this.counters.overflow += 1;
      }
      if (this.online) this.flush();
      return;
    }
    this.send(publication);
  }

  private flush(): void {
    while (this.buffer.length > 0 && this.online && !this.dead) {
      const next = this.buffer.shift() as Publication;
      this.send(next);
    }
  }

  private send(publication: Publication): void {
    const client = this.client;
    if (!client) return;
    this.counters.sent += 1;
    this.inFlightCount += 1;
    client.publish(publication.topic, publication.payload, { qos: publication.qos ?? this.o.qos }, (err) => {
      this.inFlightCount -= 1;
      if (err) {
        this.counters.failed += 1;
        return;
      }
      this.counters.delivered += 1;
      this.o.onDelivered?.(this.o.sensorId, publication);
    });
  }

  /** The probe dies: the connection drops without DISCONNECT, so the broker sends the will. */
  kill(): void {
    if (this.dead) return;
    this.dead = true;
    this.buffer = [];
    this.client?.end(true);
  }

  /** Close: a clean DISCONNECT (no will) when idle and online, else drop the connection. */
  async close(timeoutMs = 1000): Promise<void> {
    this.closing = true;
    const client = this.client;
    if (!client || this.dead) return;
    const force = !this.online || this.inFlightCount > 0;
    await Promise.race([
      client.endAsync(force).catch(() => undefined),
      new Promise<void>((resolve) => setTimeout(resolve, timeoutMs).unref()),
    ]);
    if (!client.disconnected) client.end(true);
  }
}
