import mqtt, { type ErrorWithReasonCode, type IClientOptions } from "mqtt";
import { ConfigError } from "../config/env.js";
import type { Logger } from "../lib/logger.js";
import type { Metrics } from "../lib/metrics.js";
import type { IngestReadings } from "./ingest.js";
import { parseSensorTopic, sharedSensorFilters } from "./topics.js";

export interface ExternalBrokerOptions {
  /** MQTT_URL; user name and password in it are used unless given below. */
  url: string;
  username?: string;
  password?: string;
  /**
   * Stable per instance (default "benchwarden"): the broker keeps this session, and the share of
   * the readings it is dealt, while the server is away.
   */
  clientId?: string;
  shareGroup: string;
  sessionExpiryMs: number;
  /** How long start-up waits for the first subscription before going on (and retrying behind). */
  firstConnectMs?: number;
  reconnectMs?: number;
}

export interface ExternalBrokerDeps {
  ingest: IngestReadings;
  metrics: Metrics;
  logger: Logger;
  /** A probe's last will arrived: it went away without saying goodbye. */
  onSensorOffline?: (sensorId: string) => Promise<void>;
  /** Commit what the batch writer holds now (on stop, so its messages can be acknowledged). */
  flushWrites?: () => void;
}

export interface ExternalBroker {
  /** The broker's address without credentials (where the sensors publish). */
  url: string;
  clientId: string;
  /** Connected and subscribed: /healthz is down otherwise. */
  isConnected(): boolean;
  /** Acknowledge what is committed, leave the rest to the broker (it re-sends to this session), disconnect. */
  close(): Promise<void>;
}

/** CONNACK codes that mean the server's own credentials or rights are wrong (MQTT 5 §3.2.2.2). */
const REFUSED_SIGN_IN = new Set([134, 135, 138, 140]);

/**
 * The server as a client of an external broker (MQTT_URL), instead of the embedded aedes. The
 * broker authenticates the sensors and enforces who may publish where; this subscribes to every
 * sensor's readings and last wills through a shared subscription, at QoS 1, in a persistent MQTT 5
 * session (clean start off, a session expiry, a stable client id), so what arrives while the
 * server is down waits at the broker.
 *
 * Acknowledge after commit: mqtt.js's customHandleAcks hands each QoS 1 message over with a
 * callback that sends its PUBACK, so it is called only once ingest has committed the readings (or
 * refused them as bad input: a poison message must not come back for ever). A message whose
 * commit failed is not acknowledged and the connection is dropped, so the broker re-sends it on
 * the next one. mqtt.js handles one incoming packet at a time and waits for that callback before
 * the next, so messages are processed in order, each held until its batch commits.
 */
/** The broker's address without credentials, and the credentials (MQTT_USERNAME / MQTT_PASSWORD win over the URL's). */
function brokerAddress(options: ExternalBrokerOptions): { url: string; username?: string; password?: string } {
  const given = new URL(options.url);
  const username = options.username ?? (given.username ? decodeURIComponent(given.username) : undefined);
  const password = options.password ?? (given.password ? decodeURIComponent(given.password) : undefined);
  given.username = "";
  given.password = "";
  return { url: given.toString().replace(/\/$/, ""), username, password };
}

/** What one message on the sensor topics does: readings to ingest, a last will to the engine. */
function messageHandler(deps: ExternalBrokerDeps): (topic: string, payload: Buffer) => Promise<void> {
  const { ingest, metrics, logger } = deps;
  return async (topic, payload) => {
    const parsed = parseSensorTopic(topic);
    if (!parsed) {
      metrics.mqttRefused.inc({ reason: "foreign-topic" });
      logger.warn({ topic }, "message on a topic outside the sensor contract ignored");
      return;
    }
    if (parsed.kind === "status") {
      if (payload.toString("utf8") === "offline") {
        logger.info({ sensorId: parsed.sensorId }, "sensor reported offline (last will)");
        await deps.onSensorOffline?.(parsed.sensorId);
      }
      return;
    }
    // The broker's ACL lets a sensor publish only under its own id, so the topic names the sender.
    await ingest(parsed.sensorId, payload);
  };
}

export async function connectExternalBroker(options: ExternalBrokerOptions, deps: ExternalBrokerDeps): Promise<ExternalBroker> {
  const { logger } = deps;
  const { url, username, password } = brokerAddress(options);
  const clientId = options.clientId ?? "benchwarden";
  const filters = sharedSensorFilters(options.shareGroup);

  /** Bumped on every new connection: a PUBACK belongs to the connection its message came on. */
  let connection = 0;
  let subscribed = false;
  let closing = false;
  const inFlight = new Set<Promise<void>>();
  const handle = messageHandler(deps);

  const clientOptions: IClientOptions = {
    protocolVersion: 5,
    clientId,
    clean: false,
    properties: { sessionExpiryInterval: Math.min(0xffffffff, Math.round(options.sessionExpiryMs / 1000)) },
    username,
    password,
    reconnectPeriod: options.reconnectMs ?? 1000,
    connectTimeout: 10_000,
    // The subscription lives in the session; it is renewed on every connect below.
    resubscribe: false,
    customHandleAcks: (topic, payload, _packet, ack) => {
      // Stopping: leave it unacknowledged; the broker re-sends it when this session comes back.
      if (closing) return;
      const mine = connection;
      const work = handle(topic, payload).then(
        () => {
          // A PUBACK on a later connection could acknowledge another message that reuses the id.
          if (mine === connection && client.connected) ack(0);
        },
        (err: unknown) => {
          logger.error({ err, topic }, "message not stored; reconnecting so the broker sends it again");
          if (mine === connection && !closing) client.reconnect();
        },
      );
      inFlight.add(work);
      void work.finally(() => inFlight.delete(work));
    },
  };
  const client = mqtt.connect(url, clientOptions);

  // QoS 0 readings have nothing to acknowledge (QoS 1 messages are emitted here too, after their PUBACK).
  client.on("message", (topic, payload, packet) => {
    if (packet.qos !== 0 || closing) return;
    handle(topic, payload).catch((err: unknown) => logger.error({ err, topic }, "QoS 0 message not stored"));
  });

  let firstReady: (() => void) | null = null;
  let firstRefused: ((err: Error) => void) | null = null;
  client.on("connect", (connack) => {
    connection++;
    subscribed = false;
    logger.info({ url, clientId, sessionPresent: connack.sessionPresent }, "connected to the MQTT broker");
    client.subscribe([filters.readings, filters.status], { qos: 1 }, (err, granted) => {
      const refused = (granted ?? []).filter((g) => g.qos > 2);
      if (err || refused.length > 0) {
        const reason = err?.message ?? `the broker refused ${refused.map((g) => `${g.topic} (reason ${g.qos})`).join(", ")}`;
        logger.error({ reason }, "subscription to the sensor topics failed; the server user needs read access to benchwarden/v1/sensors/+/readings and +/status");
        firstRefused?.(new ConfigError([`MQTT_URL: ${reason}; give the server's user read access to benchwarden/v1/sensors/+/readings and benchwarden/v1/sensors/+/status`]));
        return;
      }
      subscribed = true;
      firstReady?.();
    });
  });
  client.on("disconnect", (packet) => {
    if (packet.reasonCode === 142) {
      logger.error({ clientId }, "another client took over this server's MQTT session: every server instance needs its own MQTT_CLIENT_ID");
    } else {
      logger.warn({ reasonCode: packet.reasonCode, reason: packet.properties?.reasonString }, "the MQTT broker disconnected the server");
    }
  });
  client.on("close", () => {
    if (subscribed && !closing) logger.warn({ url }, "connection to the MQTT broker lost; reconnecting");
    subscribed = false;
  });
  client.on("error", (err: Error | ErrorWithReasonCode) => {
    const code = "code" in err ? Number(err.code) : NaN;
    if (REFUSED_SIGN_IN.has(code)) {
      logger.error({ url, username, code }, `the MQTT broker refused the server's sign-in: ${err.message}`);
      firstRefused?.(new ConfigError([`MQTT_URL: the broker refused the server's sign-in as ${JSON.stringify(username ?? "")} (${err.message}); check MQTT_USERNAME / MQTT_PASSWORD and the broker's password file`]));
    } else {
      logger.warn({ url, err: err.message }, "MQTT broker connection error");
    }
  });

  // Start-up waits for the first subscription: a wrong password or ACL stops it with a clear
  // message; a broker that is merely not up yet is retried behind (/healthz says so meanwhile).
  try {
    await new Promise<void>((resolve, reject) => {
      const timer = setTimeout(() => {
        logger.warn({ url }, "the MQTT broker is not reachable yet; starting anyway and retrying");
        resolve();
      }, options.firstConnectMs ?? 10_000);
      firstReady = () => {
        clearTimeout(timer);
        resolve();
      };
      firstRefused = (err) => {
        clearTimeout(timer);
        reject(err);
      };
    });
  } catch (err) {
    await client.endAsync(true);
    throw err;
  } finally {
    firstReady = null;
    firstRefused = null;
  }

  let closed: Promise<void> | null = null;
  return {
    url,
    clientId,
    isConnected: () => client.connected && subscribed,
    close: () =>
      (closed ??= (async () => {
        closing = true;
        deps.flushWrites?.();
        await Promise.allSettled([...inFlight]);
        // end() sends what is queued (the PUBACKs above) and then DISCONNECT; a broker that is
        // gone cannot be said goodbye to, so do not wait for it long.
        const ended = client.endAsync();
        if (!(await Promise.race([ended.then(() => true), new Promise<false>((r) => setTimeout(() => r(false), 3000).unref())]))) {
          await client.endAsync(true);
        }
        logger.info({ url }, "disconnected from the MQTT broker");
      })()),
  };
}

export interface DrainedSession {
  /** The broker still held the session (false: it had expired or was ended before). */
  sessionPresent: boolean;
  /** Messages taken from it and acknowledged after their commit. */
  messages: number;
  /** Its instance came back and took its session over before the drain finished. */
  takenBack: boolean;
  /** Every message stored and the session ended (false: left for another attempt). */
  ended: boolean;
}

/**
 * Takes over the broker session of another server instance that has died, stores and acknowledges
 * (after commit) what the broker queued for it, and ends the session. A broker deals a shared
 * subscription's messages to every session in the group, connected or not (mosquitto 2.0), so
 * until then a dead instance's share of the fleet's readings would wait for it.
 *
 * The session first leaves the group (UNSUBSCRIBE), so nothing new is dealt to it; once nothing has
 * arrived for `quietMs` and every message is committed, DISCONNECT with a session expiry of 0 ends
 * it. If the instance comes back meanwhile, the broker gives it its session and closes this
 * connection (session taken over); what was not yet acknowledged here goes to it.
 */
export async function drainSession(
  options: ExternalBrokerOptions & { clientId: string; quietMs?: number; maxMs?: number },
  deps: ExternalBrokerDeps,
): Promise<DrainedSession> {
  const { url, username, password } = brokerAddress(options);
  const filters = sharedSensorFilters(options.shareGroup);
  const handle = messageHandler(deps);
  const inFlight = new Set<Promise<void>>();
  let messages = 0;
  let lastMessageAtMs = Date.now();
  let failed = false;
  const client = mqtt.connect(url, {
    protocolVersion: 5,
    clientId: options.clientId,
    clean: false,
    properties: { sessionExpiryInterval: Math.min(0xffffffff, Math.round(options.sessionExpiryMs / 1000)) },
    username,
    password,
    reconnectPeriod: 0,
    connectTimeout: 10_000,
    resubscribe: false,
    customHandleAcks: (topic, payload, _packet, ack) => {
      lastMessageAtMs = Date.now();
      const work = handle(topic, payload).then(
        () => {
          messages++;
          if (client.connected) ack(0);
        },
        (err: unknown) => {
          // Not acknowledged: it stays in the session, which is then not ended.
          failed = true;
          deps.logger.error({ err, topic }, "message of a drained session not stored");
        },
      );
      inFlight.add(work);
      void work.finally(() => inFlight.delete(work));
    },
  });
  client.on("error", (err) => deps.logger.warn({ clientId: options.clientId, err: err.message }, "draining another instance's MQTT session"));
  const connack = await new Promise<{ sessionPresent: boolean } | null>((resolve) => {
    client.once("connect", (packet) => resolve({ sessionPresent: packet.sessionPresent }));
    client.once("close", () => resolve(null));
  });
  if (!connack) {
    client.end(true);
    return { sessionPresent: false, messages: 0, takenBack: false, ended: false };
  }
  let closed = false;
  client.once("close", () => (closed = true));
  await client.unsubscribeAsync([filters.readings, filters.status]).catch(() => undefined);
  const deadline = Date.now() + (options.maxMs ?? 120_000);
  const quietMs = options.quietMs ?? 1500;
  while (!closed && Date.now() < deadline && (inFlight.size > 0 || Date.now() - lastMessageAtMs < quietMs)) {
    await new Promise((r) => setTimeout(r, 100));
  }
  await Promise.allSettled([...inFlight]);
  if (closed) return { sessionPresent: connack.sessionPresent, messages, takenBack: true, ended: false };
  // Only a session fully stored and gone quiet is ended; otherwise it is left for the next attempt.
  const end = !failed && inFlight.size === 0 && Date.now() - lastMessageAtMs >= quietMs;
  await client.endAsync(false, end ? { reasonCode: 0, properties: { sessionExpiryInterval: 0 } } : {});
  return { sessionPresent: connack.sessionPresent, messages, takenBack: false, ended: end };
}

/**
 * `count` connections to the external broker, all members of the shared subscription: mqtt.js
 * hands a connection its next message only after the previous one is acknowledged, i.e. committed,
 * so one connection stores one message per transaction; several keep several messages in flight,
 * and the batch writer commits them together. Client ids: MQTT_CLIENT_ID, then `<id>-2` … `<id>-<count>`.
 */
export async function connectExternalSubscribers(options: ExternalBrokerOptions, deps: ExternalBrokerDeps, count: number): Promise<ExternalBroker & { clientIds: string[] }> {
  const base = options.clientId ?? "benchwarden";
  const clientIds = Array.from({ length: count }, (_, i) => (i === 0 ? base : `${base}-${i + 1}`));
  const connections: ExternalBroker[] = [];
  try {
    for (const clientId of clientIds) connections.push(await connectExternalBroker({ ...options, clientId }, deps));
  } catch (err) {
    await Promise.all(connections.map((c) => c.close()));
    throw err;
  }
  return {
    url: connections[0]!.url,
    clientId: base,
    clientIds,
    isConnected: () => connections.every((c) => c.isConnected()),
    close: async () => {
      await Promise.all(connections.map((c) => c.close()));
    },
  };
}
