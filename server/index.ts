import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { hostname } from "node:os";
import { existsSync } from "node:fs";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import type { Express } from "express";
import type { DataSource } from "typeorm";
import { classifyValue } from "../shared/domain/window-status.js";
import { createApp } from "./app.js";
import { ConfigError, type Env } from "./config/env.js";
import { LocalEventBus, PostgresEventBus, type EventBus } from "./coordination/event-bus.js";
import { Lease } from "./coordination/lease.js";
import { SessionReaper, sessionLeaseName } from "./coordination/session-reaper.js";
import { createDataSource, databaseTarget, isPostgres, postgresPool } from "./db/data-source.js";
import { AppMetaEntity } from "./db/entities/app-meta.entity.js";
import { UserEntity } from "./db/entities/user.entity.js";
import {
  DEMO_USERS,
  isDemoDatabase,
  isEmptyDatabase,
  rotateDemoSecrets,
  seedDemoNursery,
  writeDemoCredentials,
} from "./demo/seed.js";
import { createLogger, type Logger } from "./lib/logger.js";
import { Metrics } from "./lib/metrics.js";
import { AlertEngine } from "./alerts/engine.js";
import { LayoutCache } from "./alerts/layout-cache.js";
import { Notifier } from "./alerts/notifier.js";
import { DutyShiftEntity } from "./db/entities/alert.entity.js";
import { createSmtpTransport } from "./mail/mailer.js";
import { Outbox } from "./mail/outbox.js";
import { startSmtpSink, type SmtpSink } from "./mail/smtp-sink.js";
import { AlertsService } from "./modules/alerts/alerts.service.js";
import { RotaService } from "./modules/rota/rota.service.js";
import { ReadingWriter } from "./modules/readings/reading-writer.js";
import { createReadingStore } from "./modules/readings/reading-store.js";
import { ReadingsService } from "./modules/readings/readings.service.js";
import { ReadingRetention } from "./modules/retention/retention.service.js";
import { SensorsService } from "./modules/sensors/sensors.service.js";
import { UsersService } from "./modules/users/users.service.js";
import { LiveHub } from "./modules/stream/live-hub.js";
import { WindowsService } from "./modules/windows/windows.service.js";
import { WindowSettingsService } from "./modules/windows/window-settings.service.js";
import { LayoutService } from "./modules/layout/layout.service.js";
import { AuditService } from "./modules/audit/audit.service.js";
import { ExportsService } from "./modules/exports/exports.service.js";
import { ZonesService } from "./modules/zones/zones.service.js";
import { createPropagation, photoDirFor } from "./modules/batches/propagation.js";
import { startBroker, type EmbeddedBroker } from "./mqtt/broker.js";
import { connectExternalSubscribers, drainSession, type ExternalBroker, type ExternalBrokerDeps } from "./mqtt/external-broker.js";
import { createIngest } from "./mqtt/ingest.js";

export const PROJECT_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "..");

export interface RunningServer {
  httpPort: number;
  /** Port of the broker the sensors publish to (the embedded one, or MQTT_URL's). */
  mqttPort: number;
  /** Where the sensors publish, without credentials. */
  mqttUrl: string;
  appUrl: string;
  demo: boolean;
  /** Path of demo-sensors.json in demo mode. */
  demoCredentialsPath: string | null;
  /** Port of the local SMTP sink, when mail is caught rather than relayed. */
  smtpSinkPort: number | null;
  /** The running sink (tests stop it to play a relay outage). */
  smtpSink: SmtpSink | null;
  users: UsersService;
  /** The Express app, for tests that inspect its routes. */
  app: Express;
  /** The embedded broker, or the connection to the external one (MQTT_URL). */
  mqtt: EmbeddedBroker | ExternalBroker;
  /** The alert pipeline, for tests that drive time: pass() runs one evaluation → grouping → sending round. */
  alerts: { engine: AlertEngine; notifier: Notifier; outbox: Outbox; service: AlertsService; pass(): Promise<void> };
  dataSource: DataSource;
  metrics: Metrics;
  logger: Logger;
  /** Raw-reading retention; tests run a pass with run(). */
  retention: ReadingRetention;
  /** This instance's name among several (INSTANCE_ID), and whether it holds the alert engine's lease now. */
  instance: { id: string; runsAlerts(): boolean };
  stop(): Promise<void>;
}

export interface StartOptions {
  logger?: Logger;
  /** Folder of the built client; default dist/ in the project. */
  staticDir?: string;
}

/**
 * The demo signs sessions with a random secret kept in the database, so a restart does not sign
 * everyone out and no secret has to be configured to try the product.
 */
async function demoJwtSecret(dataSource: DataSource): Promise<string> {
  const meta = dataSource.getRepository(AppMetaEntity);
  const found = await meta.findOneBy({ key: "demo-jwt-secret" });
  if (found) return found.value;
  const value = randomBytes(48).toString("base64url");
  await meta.save({ key: "demo-jwt-secret", value });
  return value;
}

/**
 * Several instances may start at once on one new PostgreSQL database: migrations and the demo
 * seed run under an advisory lock, one instance after the other. SQLite has one instance.
 */
async function oneInstanceAtATime<T>(dataSource: DataSource, work: () => Promise<T>): Promise<T> {
  if (!isPostgres(dataSource)) return work();
  const client = await postgresPool(dataSource).connect();
  try {
    await client.query("SELECT pg_advisory_lock(hashtext('benchwarden-startup'))");
    return await work();
  } finally {
    await client.query("SELECT pg_advisory_unlock(hashtext('benchwarden-startup'))").catch(() => undefined);
    client.release();
  }
}

async function resolveDemoMode(env: Env, dataSource: DataSource): Promise<boolean> {
  if (env.DEMO === "1") return true;
  if (env.DEMO === "0") return false;
  return (await isEmptyDatabase(dataSource)) || (await isDemoDatabase(dataSource));
}

function startSimulator(env: Env, brokerUrl: string, credentialsPath: string, logger: Logger): ChildProcess {
  const tsxCli = fileURLToPath(import.meta.resolve("tsx/cli"));
  const args = [
    tsxCli,
    "--tsconfig",
    join(PROJECT_ROOT, "tsconfig.server.json"),
    join(PROJECT_ROOT, "sensors-sim/index.ts"),
    "--broker",
    brokerUrl,
    "--credentials",
    credentialsPath,
    "--interval",
    env.SIM_INTERVAL,
    "--qos",
    "1",
    // The server logs the simulator's stderr; periodic progress lines would only be noise there.
    "--progress",
    "0",
  ];
  const child = spawn(process.execPath, args, { cwd: PROJECT_ROOT, stdio: ["ignore", "ignore", "pipe"] });
  child.stderr?.on("data", (chunk: Buffer) => logger.warn({ sim: chunk.toString().trim() }, "simulator"));
  child.on("exit", (code, signal) => logger.info({ code, signal }, "simulator stopped"));
  logger.info({ pid: child.pid }, "simulator started");
  return child;
}

/** Start everything in order: database → broker → HTTP → simulator. stop() undoes it in reverse. */
export async function start(env: Env, options: StartOptions = {}): Promise<RunningServer> {
  const logger = options.logger ?? createLogger(env.LOG_LEVEL);
  const dataSource = createDataSource(databaseTarget(env));
  await dataSource.initialize();
  const instanceId = env.INSTANCE_ID ?? `${hostname()}-${process.pid}-${randomBytes(3).toString("hex")}`;
  let demo = false;
  let demoCredentialsPath: string | null = null;
  let seedUsers = false;
  await oneInstanceAtATime(dataSource, async () => {
    await dataSource.runMigrations({ transaction: "each" });
    demo = await resolveDemoMode(env, dataSource);
    if (demo) {
      demoCredentialsPath = join(dirname(resolve(env.DATABASE_PATH)), "demo-sensors.json");
      if (await isEmptyDatabase(dataSource)) {
        writeDemoCredentials(demoCredentialsPath, await seedDemoNursery(dataSource));
        seedUsers = true;
        logger.info({ demoCredentialsPath }, "seeded the demo nursery");
      } else if (!existsSync(demoCredentialsPath)) {
        writeDemoCredentials(demoCredentialsPath, await rotateDemoSecrets(dataSource));
        logger.info({ demoCredentialsPath }, "demo sensor secrets renewed");
      }
    }
  });
  if (!demo && !env.JWT_SECRET) {
    await dataSource.destroy();
    throw new ConfigError(["JWT_SECRET: required outside demo mode (at least 32 characters)"]);
  }

  const jwtSecret = env.JWT_SECRET ?? (await demoJwtSecret(dataSource));
  const metrics = new Metrics();
  let sink: SmtpSink | null = null;
  if (!env.SMTP_URL) {
    sink = await startSmtpSink(dataSource, logger);
    if (!demo) logger.warn("SMTP_URL is not set: e-mail is kept by the local sink (readable by admins in the app), not delivered");
  }
  const transport = createSmtpTransport({ smtpUrl: env.SMTP_URL, sinkPort: sink?.port, from: env.MAIL_FROM, logger });
  const mailDomain = new URL(env.APP_URL ?? "http://benchwarden.localhost").hostname;
  const outbox = new Outbox(dataSource, transport, logger, metrics, { pollMs: Math.min(env.ALERT_TICK, 5000), domain: mailDomain, retryFirstMs: env.MAIL_RETRY_FIRST });
  const mailer = outbox;
  const appUrlFor = (port: number) => env.APP_URL ?? `http://localhost:${port}`;
  // The HTTP port is known only after listen(); links are built later, so resolve lazily.
  let resolvedAppUrl = env.APP_URL ?? `http://localhost:${env.PORT}`;
  const users = new UsersService(dataSource, {
    secret: jwtSecret,
    get appUrl() {
      return resolvedAppUrl;
    },
    mailer,
    logger,
  });
  await oneInstanceAtATime(dataSource, async () => {
    if (seedUsers || (demo && (await dataSource.getRepository(UserEntity).count()) === 0)) {
      const created = [];
      for (const u of DEMO_USERS) created.push(await users.createWithPassword({ ...u, password: env.DEMO_PASSWORD }));
      // The grower covers the nights in every house; the manager takes what nobody covers.
      const grower = created.find((u) => u.role === "grower")!;
      const manager = created.find((u) => u.role === "manager")!;
      await dataSource.getRepository(DutyShiftEntity).save([
        { zoneId: null, userId: grower.id, weekdays: 0b1111111, startMinute: 18 * 60, endMinute: 7 * 60, isFallback: false },
        { zoneId: null, userId: manager.id, weekdays: 0b1111111, startMinute: 0, endMinute: 0, isFallback: true },
      ]);
      logger.info("seeded the demo users and duty rota");
    }
  });
  // Readings, alert changes and cache changes reach every instance (itself included) through the bus.
  let bus: EventBus;
  if (isPostgres(dataSource)) {
    const postgresBus = new PostgresEventBus(postgresPool(dataSource), env.DATABASE_URL!, logger);
    await postgresBus.start();
    bus = postgresBus;
  } else {
    bus = new LocalEventBus(logger);
  }
  const hub = new LiveHub();
  const windows = new WindowsService(dataSource);
  await windows.ready();
  const repository = createReadingStore(dataSource);
  const sensors = new SensorsService(dataSource, repository);
  await sensors.reload();
  const now = () => Date.now();
  const layout = new LayoutCache(dataSource);
  let alertsService: AlertsService | null = null;
  const engine = new AlertEngine(
    dataSource,
    windows,
    layout,
    metrics,
    logger,
    { silentAfterMs: env.SENSOR_SILENT_AFTER, escalateAfterMs: env.ALERT_ESCALATE_AFTER, renotifyEveryMs: env.ALERT_RENOTIFY_EVERY },
    now,
    (alertIds) => bus.publish({ type: "alerts", alertIds }),
  );
  engine.onTrackerStored = (alertId) => bus.publish({ type: "tracker", alertId });
  alertsService = new AlertsService(dataSource, engine, layout, windows, jwtSecret);
  const notifier = new Notifier(
    dataSource,
    layout,
    windows,
    outbox,
    logger,
    { groupWindowMs: env.ALERT_GROUP_WINDOW, ackLinkLifetimeMs: env.ACK_LINK_LIFETIME, secret: jwtSecret, appUrl: () => resolvedAppUrl },
    now,
  );
  const writer = new ReadingWriter(
    repository,
    (stored) => bus.publish({ type: "readings", rows: stored }),
    metrics,
    logger,
  );
  bus.subscribe((event) => {
    switch (event.type) {
      case "readings":
        hub.publishReadings(
          event.rows.flatMap((r) =>
            r.benchId === null ? [] : [{ ...r, benchId: r.benchId, status: classifyValue(r.value, windows.windowFor(r.benchId, r.quantity)) }],
          ),
        );
        void engine.onReadings(event.rows);
        break;
      case "alerts":
        void alertsService?.views(event.alertIds).then((alerts) => hub.publishAlerts(alerts), (err: unknown) => logger.error({ err }, "alert stream update failed"));
        break;
      case "tracker":
        void engine.reloadTracker(event.alertId);
        break;
      case "sensor-offline":
        void engine.onSensorOffline(event.sensorId);
        break;
      case "sensor":
        sensors.forget(event.sensorId);
        break;
      case "windows":
        void windows.reload();
        break;
      case "outbox":
        outbox.kick();
        break;
      case "resync":
        void sensors.reload();
        void windows.reload();
        break;
    }
  });
  if (bus instanceof PostgresEventBus) {
    // Local changes already updated this instance's caches; the others re-read theirs.
    sensors.onChanged = (sensorId) => bus.publish({ type: "sensor", sensorId });
    windows.onChange(() => bus.publish({ type: "windows" }));
    outbox.onEnqueued = () => {
      if (!engine.isRunning) bus.publish({ type: "outbox" });
    };
  }
  // One alert round: evaluate (delays, silence, escalation, reminders) → group notices → send mail.
  let passRunning: Promise<void> | null = null;
  const pass = (): Promise<void> =>
    !engine.isRunning
      ? Promise.resolve()
      : (passRunning ??= (async () => {
          try {
            await engine.tick();
            await notifier.flush();
            await outbox.sendDue();
          } finally {
            passRunning = null;
          }
        })());
  // Notices are due when their grouping interval ends: run the notifier then, not at the next tick.
  let noticeTimer: NodeJS.Timeout | null = null;
  engine.onNoticesWritten = () => {
    if (noticeTimer) return;
    noticeTimer = setTimeout(() => {
      noticeTimer = null;
      void notifier
        .flush()
        .then(() => outbox.sendDue())
        .catch((err: unknown) => logger.error({ err }, "sending alert mail failed"));
    }, env.ALERT_GROUP_WINDOW);
  };
  const alertTimer = setInterval(() => void pass().catch((err: unknown) => logger.error({ err }, "alert round failed")), env.ALERT_TICK);
  alertTimer.unref();
  const retention = new ReadingRetention(
    dataSource,
    { retentionDays: env.READING_RETENTION_DAYS, isOurTurn: () => engine.isRunning, chunkRows: env.READING_RETENTION_CHUNK_ROWS, batchMarginMs: env.SENSOR_SILENT_AFTER },
    metrics,
    logger,
  );
  // Exactly one instance runs the alert engine and sends the mail; another takes over when it dies.
  const leaseRenewMs = Math.max(500, Math.floor(env.LEADER_LEASE_TTL / 5));
  const sessionLeases: Lease[] = [];
  let reaper: SessionReaper | null = null;
  let reapTimer: NodeJS.Timeout | null = null;
  const lease = new Lease(
    dataSource,
    { name: "alerts", holder: instanceId, ttlMs: env.LEADER_LEASE_TTL, renewEveryMs: leaseRenewMs },
    logger,
    async () => {
      await engine.start();
      outbox.start();
    },
    async () => {
      if (noticeTimer) clearTimeout(noticeTimer);
      noticeTimer = null;
      await engine.stop();
      await outbox.pause();
    },
  );
  metrics.addGauge("benchwarden_alert_engine_running", "1 when this instance holds the lease and runs the alert engine and the mail outbox", () => (engine.isRunning ? 1 : 0));
  metrics.addGauge("benchwarden_stream_clients", "Open live-stream connections", () => hub.clientCount);
  metrics.addGauge(
    "benchwarden_alerts",
    "Alerts not yet cleared, by kind and phase",
    async () =>
      ((await dataSource.query("SELECT kind, phase, COUNT(*) AS n FROM alert WHERE phase <> 'cleared' GROUP BY kind, phase")) as { kind: string; phase: string; n: number }[]).map(
        (r) => ({ labels: { kind: r.kind, phase: r.phase }, value: r.n }),
      ),
    ["kind", "phase"],
  );
  metrics.addGauge("benchwarden_sensors_silent", "Sensors with an open sensor-silent alert", async () =>
    Number(((await dataSource.query("SELECT COUNT(*) AS n FROM alert WHERE kind = 'sensor-silent' AND phase <> 'cleared'")) as { n: number }[])[0]?.n ?? 0),
  );
  metrics.addGauge("benchwarden_outbox_waiting", "E-mails written but not yet accepted by the relay", async () =>
    Number(((await dataSource.query("SELECT COUNT(*) AS n FROM outbox WHERE sent_at_ms IS NULL")) as { n: number }[])[0]?.n ?? 0),
  );

  let broker: EmbeddedBroker | ExternalBroker | null = null;
  let http: Server | null = null;
  let simulator: ChildProcess | null = null;
  let stopping: Promise<void> | null = null;

  const stop = () =>
    (stopping ??= (async () => {
      if (simulator && simulator.exitCode === null) {
        const exited = new Promise((r) => simulator!.once("exit", r));
        simulator.kill("SIGTERM");
        await Promise.race([exited, new Promise((r) => setTimeout(r, 3000))]);
      }
      clearInterval(alertTimer);
      if (noticeTimer) clearTimeout(noticeTimer);
      hub.close();
      if (http) {
        http.closeAllConnections();
        await new Promise<void>((r) => http!.close(() => r()));
      }
      if (reapTimer) clearInterval(reapTimer);
      await reaper?.stop();
      if (broker) await broker.close();
      await Promise.all(sessionLeases.map((l) => l.stop()));
      await writer.close();
      await passRunning?.catch(() => undefined);
      await lease.stop();
      await retention.stop();
      await engine.idle();
      await outbox.stop();
      await bus.close();
      transport.close();
      if (sink) await sink.close();
      if (dataSource.isInitialized) await dataSource.destroy();
      logger.info("stopped");
    })());

  try {
    await lease.start();
    const ingest = createIngest({ sensors, writer, metrics, logger });
    let brokerUrl: string;
    let brokerPort: number;
    if (env.MQTT_URL) {
      // The broker signs the sensors in: a rotated or disabled sensor is refused there once the
      // exported password file is reloaded (docs/mosquitto.md); ingest refuses a disabled one now.
      const brokerOptions = { url: env.MQTT_URL, username: env.MQTT_USERNAME, password: env.MQTT_PASSWORD, clientId: env.MQTT_CLIENT_ID, shareGroup: env.MQTT_SHARE_GROUP, sessionExpiryMs: env.MQTT_SESSION_EXPIRY };
      const brokerDeps: ExternalBrokerDeps = { ingest, metrics, logger, onSensorOffline: async (sensorId) => bus.publish({ type: "sensor-offline", sensorId }), flushWrites: () => void writer.flush() };
      const external = await connectExternalSubscribers(brokerOptions, brokerDeps, env.MQTT_SUBSCRIBERS);
      broker = external;
      if (isPostgres(dataSource)) {
        // Several instances: each holds a lease on its own broker session while alive; the engine's
        // instance drains the session of one that stopped, so its share of the readings goes on.
        for (const clientId of external.clientIds) {
          const own = new Lease(dataSource, { name: sessionLeaseName(clientId), holder: instanceId, ttlMs: env.LEADER_LEASE_TTL, renewEveryMs: leaseRenewMs }, logger, async () => {}, async () => {});
          await own.start();
          sessionLeases.push(own);
        }
        const sessions = new SessionReaper(dataSource, instanceId, (clientId) => drainSession({ ...brokerOptions, clientId }, brokerDeps), logger);
        reaper = sessions;
        reapTimer = setInterval(() => {
          if (engine.isRunning) void sessions.sweep();
        }, leaseRenewMs);
        reapTimer.unref();
      }
      brokerUrl = external.url;
      brokerPort = Number(new URL(external.url).port || (external.url.startsWith("mqtts:") ? 8883 : 1883));
    } else {
      const embedded = await startBroker(env.MQTT_HOST, env.MQTT_PORT, {
        sensors,
        metrics,
        ingest,
        logger,
        onSensorOffline: (sensorId) => bus.publish({ type: "sensor-offline", sensorId }),
        limits: { maxPacketBytes: env.MQTT_MAX_PACKET_BYTES, bytesPerSecond: env.MQTT_BYTES_PER_SECOND, burstBytes: 4 * env.MQTT_BYTES_PER_SECOND },
      });
      broker = embedded;
      brokerUrl = `mqtt://127.0.0.1:${embedded.port}`;
      brokerPort = embedded.port;
      sensors.onRevoked = (sensorId) => embedded.disconnectSensor(sensorId);
    }

    const windowSettings = new WindowSettingsService(dataSource, windows);
    const app = createApp({
      dataSource,
      layout: new LayoutService(dataSource, windows, windowSettings),
      windowSettings,
      audit: new AuditService(dataSource),
      exports: new ExportsService(dataSource, Date.now, { refreshRollups: () => repository.refreshStaleRollups(), retentionDays: env.READING_RETENTION_DAYS }),
      ...createPropagation({ dataSource, windows, alerts: alertsService, mailer: outbox, logger, photosDir: env.PHOTOS_DIR ?? photoDirFor(env.DATABASE_PATH), silentAfterMs: env.SENSOR_SILENT_AFTER, appUrl: () => resolvedAppUrl }),
      zones: new ZonesService(dataSource, repository, windows, alertsService),
      alerts: alertsService,
      rota: new RotaService(dataSource, { escalateAfterMs: env.ALERT_ESCALATE_AFTER, renotifyEveryMs: env.ALERT_RENOTIFY_EVERY }),
      readings: new ReadingsService(dataSource, repository, windows),
      users,
      sensors,
      jwtSecret,
      sessionHours: env.SESSION_HOURS,
      demo,
      hub,
      metrics,
      logger,
      brokerStatus: () => (!broker ? "not listening" : "port" in broker ? (broker.isListening() ? "ok" : "not listening") : broker.isConnected() ? "ok" : "not connected"),
      staticDir: options.staticDir ?? join(PROJECT_ROOT, "dist"),
    });
    http = createServer(app);
    await new Promise<void>((resolveListen, reject) => {
      http!.once("error", reject);
      http!.listen(env.PORT, env.HOST, () => resolveListen());
    });
    const httpPort = (http.address() as AddressInfo).port;
    const appUrl = appUrlFor(httpPort);
    resolvedAppUrl = appUrl;
    logger.info({ port: httpPort, appUrl, demo }, "HTTP server listening");

    retention.start();
    if (demo && demoCredentialsPath && (env.SIM ?? true)) {
      simulator = startSimulator(env, brokerUrl, demoCredentialsPath, logger);
    }

    return { httpPort, mqttPort: brokerPort, mqttUrl: brokerUrl, appUrl, demo, demoCredentialsPath, smtpSinkPort: sink?.port ?? null, smtpSink: sink, users, app, mqtt: broker, alerts: { engine, notifier, outbox, service: alertsService, pass }, dataSource, metrics, logger, retention, instance: { id: instanceId, runsAlerts: () => engine.isRunning }, stop };
  } catch (err) {
    await stop();
    throw err;
  }
}
