import { createServer, type AddressInfo, type Server } from "node:net";
import { Duplex, pipeline } from "node:stream";
import { Aedes, type AuthenticateError, type Client } from "aedes";
import type { Logger } from "../lib/logger.js";
import type { Metrics } from "../lib/metrics.js";
import type { SensorsService } from "../modules/sensors/sensors.service.js";
import type { IngestReadings } from "./ingest.js";
import { ConnectionGuard } from "./connection-guard.js";
import { parseSensorTopic } from "./topics.js";

/**
 * Limits per connection. A SenML pack of a probe is a few hundred bytes; 64 KiB leaves room for a
 * batched backlog. 64 KiB/s sustained (256 KiB burst) is far above what any probe sends.
 */
export const MQTT_LIMITS = { maxPacketBytes: 64 * 1024, bytesPerSecond: 64 * 1024, burstBytes: 256 * 1024 };

export interface EmbeddedBroker {
  port: number;
  isListening(): boolean;
  /** Drop a sensor's connection (its secret was rotated or it was disabled). */
  disconnectSensor(sensorId: string): void;
  close(): Promise<void>;
}

export interface BrokerDeps {
  sensors: SensorsService;
  metrics: Metrics;
  ingest: IngestReadings;
  logger: Logger;
  onSensorOffline?: (sensorId: string) => void;
  limits?: Partial<typeof MQTT_LIMITS>;
}

function authError(message: string, returnCode: 4 | 5): AuthenticateError {
  return Object.assign(new Error(message), { returnCode }) as AuthenticateError;
}

/**
 * The embedded aedes broker. Broker hooks hold no business logic: authenticate asks the sensors
 * service, authorizePublish lets a sensor write only its own topics and hands readings to ingest.
 * aedes sends the PUBACK of a QoS 1 publish only when authorizePublish calls back (STACK.md), so
 * calling back after the commit acknowledges a reading only once it is stored.
 */
export async function startBroker(host: string, port: number, deps: BrokerDeps): Promise<EmbeddedBroker> {
  const { sensors, ingest, logger, metrics } = deps;
  const sensorOf = new WeakMap<Client, string>();
  const clientsOf = new Map<string, Set<Client>>();

  const broker = await Aedes.createBroker({
    authenticate: (client, username, password, done) => {
      if (!username || !password) {
        metrics.mqttRefused.inc({ reason: "no-credentials" });
        return done(authError("sensor id and secret required", 4), false);
      }
      sensors.authenticate(username, password.toString("utf8")).then(
        (ok) => {
          if (!ok) {
            metrics.mqttRefused.inc({ reason: "bad-credentials" });
            logger.warn({ sensorId: username, clientId: client.id }, "MQTT sign-in refused");
            return done(authError("bad sensor id or secret", 4), false);
          }
          sensorOf.set(client, username);
          clientsOf.set(username, (clientsOf.get(username) ?? new Set()).add(client));
          done(null, true);
        },
        (err) => {
          logger.error({ err }, "sensor authentication failed");
          done(authError("server unavailable", 5), false);
        },
      );
    },
    authorizePublish: (client, packet, callback) => {
      const sensorId = client ? sensorOf.get(client) : undefined;
      const topic = parseSensorTopic(packet.topic);
      if (!sensorId || !topic || topic.sensorId !== sensorId) {
        metrics.mqttRefused.inc({ reason: "foreign-topic" });
        logger.warn({ sensorId, topic: packet.topic }, "publish to a topic the sensor does not own refused");
        return callback(new Error("not allowed"));
      }
      if (topic.kind === "status") return callback(null);
      ingest(sensorId, packet.payload as Buffer).then(
        () => callback(null),
        // No PUBACK: the connection closes and the sensor re-sends what it was not told was saved.
        (err) => callback(err instanceof Error ? err : new Error(String(err))),
      );
    },
    // Sensors only publish; nothing in the fleet needs to read another sensor's data.
    authorizeSubscribe: (_client, _subscription, callback) => {
      metrics.mqttRefused.inc({ reason: "subscribe" });
      callback(null, null); // a 0x80 "failure" return code in the SUBACK
    },
  });

  broker.on("publish", (packet) => {
    const topic = parseSensorTopic(packet.topic);
    if (topic?.kind === "status" && packet.payload.toString() === "offline") {
      logger.info({ sensorId: topic.sensorId }, "sensor reported offline (last will)");
      deps.onSensorOffline?.(topic.sensorId);
    }
  });
  broker.on("clientDisconnect", (client) => {
    const sensorId = sensorOf.get(client);
    if (sensorId) clientsOf.get(sensorId)?.delete(client);
  });
  broker.on("clientError", (client, err) => logger.debug({ clientId: client.id, err: err.message }, "MQTT client error"));

  const limits = { ...MQTT_LIMITS, ...deps.limits };
  const server: Server = createServer((socket) => {
    // aedes turns Nagle off on the sockets it is given; it is given the guard, so do it here,
    // or every PUBACK waits ~40 ms for the client's delayed ACK.
    socket.setNoDelay(true);
    const guard = new ConnectionGuard({
      ...limits,
      onOversized: (bytes) => {
        metrics.mqttRefused.inc({ reason: "packet-too-large" });
        logger.warn({ bytes, remote: socket.remoteAddress }, "MQTT packet over the size limit; connection closed");
      },
      onThrottled: () => metrics.mqttRefused.inc({ reason: "rate-limited" }),
    });
    // aedes reads the guarded stream and writes straight to the socket.
    pipeline(socket, guard, () => socket.destroy());
    const duplex = Duplex.from({ readable: guard, writable: socket });
    duplex.on("error", () => socket.destroy());
    broker.handle(duplex as unknown as Parameters<typeof broker.handle>[0]);
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => resolve());
  });
  const boundPort = (server.address() as AddressInfo).port;
  let closing: Promise<void> | null = null;
  logger.info({ port: boundPort }, "MQTT broker listening");

  return {
    port: boundPort,
    isListening: () => server.listening && !broker.closed,
    disconnectSensor: (sensorId) => {
      for (const client of clientsOf.get(sensorId) ?? []) client.close();
      clientsOf.delete(sensorId);
    },
    close: () =>
      (closing ??= new Promise<void>((resolve) => {
        broker.close(() => server.close(() => resolve()));
      })),
  };
}
