/**
 * Alert latency under load: from the publish of the reading that completes a hold-off delay to
 * the alert e-mail accepted by the local SMTP sink, while LOAD_SENSORS simulated sensors publish
 * every second from a separate simulator process. Prints a table and, last, one JSON line.
 *
 *   npm run bench -- alert-latency        (or: tsx bench/alert-latency.ts)
 */
import { spawn } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { cpus, tmpdir } from "node:os";
import { join } from "node:path";
import mqtt from "mqtt";
import { IsNull } from "typeorm";
import { parseEnv } from "../server/config/env.js";
import { BenchEntity } from "../server/db/entities/bench.entity.js";
import { CaughtMailEntity } from "../server/db/entities/caught-mail.entity.js";
import { SensorEntity } from "../server/db/entities/sensor.entity.js";
import { ZoneEntity } from "../server/db/entities/zone.entity.js";
import { ZoneWindowEntity } from "../server/db/entities/window.entity.js";
import { DEMO_WINDOW } from "../server/demo/seed.js";
import { PROJECT_ROOT, start } from "../server/index.js";
import { generateSecret, hashSecret } from "../server/modules/sensors/sensors.service.js";

const LOAD_SENSORS = Number(process.env.LOAD_SENSORS ?? 1000);
const TRIALS = Number(process.env.TRIALS ?? 20);
const WARMUP_MS = 10_000;
const TICK = process.env.ALERT_TICK ?? "1s";

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}

async function main(): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), "benchwarden-bench-alerts-"));
  const server = await start(
    parseEnv({
      PORT: "0",
      HOST: "127.0.0.1",
      MQTT_PORT: "0",
      MQTT_HOST: "127.0.0.1",
      DATABASE_PATH: join(dir, "db.sqlite"),
      DEMO: "1",
      SIM: "0",
      LOG_LEVEL: "silent",
      ALERT_TICK: TICK,
      // Grouping holds mail back on purpose (60 s by default); measure the pipeline without it.
      ALERT_GROUP_WINDOW: "0s",
    }),
    { staticDir: join(dir, "none") },
  );
  const ds = server.dataSource;
  let simulator: ReturnType<typeof spawn> | null = null;
  try {
    // A zone of trial benches, one probe each, away from the load.
    const someZone = (await ds.getRepository(ZoneEntity).findOneByOrFail({ archivedAtMs: IsNull() }))!;
    const trialZone = await ds.getRepository(ZoneEntity).save({ siteId: someZone.siteId, name: "Trial house", position: 99, archivedAtMs: null });
    await ds.getRepository(ZoneWindowEntity).save(
      Object.entries(DEMO_WINDOW).map(([quantity, w]) => ({ zoneId: trialZone.id, quantity: quantity as "air.temperature", minValue: w.min, maxValue: w.max, delayS: w.delayS, hysteresis: w.hysteresis })),
    );
    const trialProbes: { id: string; secret: string; benchName: string }[] = [];
    for (let i = 0; i < TRIALS; i++) {
      const bench = await ds.getRepository(BenchEntity).save({ zoneId: trialZone.id, name: `Trial ${i + 1}`, position: i, archivedAtMs: null });
      const secret = generateSecret();
      await ds.getRepository(SensorEntity).save({ id: `trial-${i + 1}`, kind: "air", secretHash: hashSecret(secret), benchId: bench.id, disabledAtMs: null, createdAtMs: Date.now() });
      trialProbes.push({ id: `trial-${i + 1}`, secret, benchName: bench.name });
    }
    // The load: real registered sensors spread over the demo benches.
    const benches = (await ds.getRepository(BenchEntity).find()).filter((b) => b.zoneId !== trialZone.id);
    const load = [];
    for (let i = 0; i < LOAD_SENSORS; i++) {
      const secret = generateSecret();
      const bench = benches[i % benches.length]!;
      load.push({ id: `load-${i}`, secret, benchId: bench.id, benchName: bench.name, kind: "combined" as const });
    }
    await ds.getRepository(SensorEntity).save(load.map((s) => ({ id: s.id, kind: s.kind, secretHash: hashSecret(s.secret), benchId: s.benchId, disabledAtMs: null, createdAtMs: Date.now() })), { chunk: 200 });
    await server.alerts.engine.tick();
    const credentialsPath = join(dir, "load-sensors.json");
    writeFileSync(credentialsPath, JSON.stringify(load));

    simulator = spawn(
      process.execPath,
      [join(PROJECT_ROOT, "node_modules/tsx/dist/cli.mjs"), "--tsconfig", join(PROJECT_ROOT, "tsconfig.server.json"), join(PROJECT_ROOT, "sensors-sim/index.ts"),
        "--broker", `mqtt://127.0.0.1:${server.mqttPort}`, "--credentials", credentialsPath, "--interval", "1s", "--qos", "1", "--duration", "10m", "--progress", "0", "--quiet"],
      { stdio: "ignore" },
    );
    await new Promise((r) => setTimeout(r, WARMUP_MS));
    const storedBefore = server.metrics.readingsStored.get();
    const loadStartMs = Date.now();

    const latencies: number[] = [];
    for (const probe of trialProbes) {
      const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${server.mqttPort}`, { username: probe.id, password: probe.secret, reconnectPeriod: 0 });
      const nowS = Date.now() / 1000;
      const topic = `benchwarden/v1/sensors/${probe.id}/readings`;
      // Cold since 11 minutes ago (hold-off 10 min): the reading now completes the delay.
      await client.publishAsync(topic, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 14, t: Math.floor(nowS) - 660 }]), { qos: 1 });
      const sentMs = Date.now();
      await client.publishAsync(topic, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 14, t: nowS }]), { qos: 1 });
      await client.endAsync();
      const deadline = sentMs + 30_000;
      let receivedMs: number | null = null;
      while (Date.now() < deadline && receivedMs === null) {
        const mails = await ds.getRepository(CaughtMailEntity).find({ order: { id: "DESC" }, take: 5 });
        const mail = mails.find((m) => m.subject.includes(`${probe.benchName}:`));
        if (mail) receivedMs = mail.receivedAtMs;
        else await new Promise((r) => setTimeout(r, 20));
      }
      if (receivedMs !== null) latencies.push(receivedMs - sentMs);
    }
    const loadSeconds = (Date.now() - loadStartMs) / 1000;
    const storedPerSecond = (server.metrics.readingsStored.get() - storedBefore) / loadSeconds;
    latencies.sort((a, b) => a - b);
    const result = {
      bench: "alert-latency",
      loadSensors: LOAD_SENSORS,
      loadIntervalS: 1,
      readingsStoredPerSecond: Math.round(storedPerSecond),
      trials: TRIALS,
      delivered: latencies.length,
      alertTick: TICK,
      groupWindow: "0s",
      latencyP50Ms: percentile(latencies, 50),
      latencyP95Ms: percentile(latencies, 95),
      latencyMaxMs: latencies.at(-1) ?? null,
      cores: cpus().length,
      note: "simulator in its own process, server + SMTP sink in this one, both on the same machine",
    };
    console.log("alert latency (reading completing the hold-off → mail accepted by the SMTP sink)");
    console.log(`  load: ${LOAD_SENSORS} sensors every 1 s, ${result.readingsStoredPerSecond} readings/s stored`);
    console.log(`  trials: ${latencies.length}/${TRIALS} delivered; alert tick ${TICK}, grouping off`);
    console.log(`  p50 ${result.latencyP50Ms} ms   p95 ${result.latencyP95Ms} ms   max ${result.latencyMaxMs} ms`);
    console.log(JSON.stringify(result));
  } finally {
    simulator?.kill("SIGTERM");
    await server.stop();
    rmSync(dir, { recursive: true, force: true });
  }
}

void main().then(() => process.exit(0), (err: unknown) => {
  console.error(err);
  process.exit(1);
});
