/**
 * Readings stored per second by one and by two server instances in the several-machines topology
 * (README "Running on more than one machine"): probes → mosquitto → N instances sharing one
 * subscription → one PostgreSQL. The probes (bench/lib/publisher.ts) offer more than the instances
 * take, at a fixed rate, so mosquitto holds a growing backlog and the figure is what the instances
 * drain: the sum of their benchwarden_readings_stored_total over the measured seconds.
 *
 *   npm run bench -- cluster        (CLUSTER_SENSORS=2000 CLUSTER_INTERVAL_MS=500 CLUSTER_SECONDS=20)
 *
 * Everything runs on this one machine: the instances share its cores with mosquitto, PostgreSQL
 * and the publishers, so the gain of a second instance here is a floor for two machines.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { cpus, tmpdir } from "node:os";
import { join } from "node:path";
import { createDataSource } from "../server/db/data-source.js";
import { BenchEntity } from "../server/db/entities/bench.entity.js";
import { SensorEntity } from "../server/db/entities/sensor.entity.js";
import { PROJECT_ROOT } from "../server/index.js";
import { generateSecret, hashSecret } from "../server/modules/sensors/sensors.service.js";
import { freePort, runExport, startMosquitto } from "../tests/support/mosquitto.js";
import { startPostgres } from "../tests/support/postgres.js";
import { JsonChild, sleepUntil } from "./lib/processes.js";

const SENSORS = Number(process.env.CLUSTER_SENSORS ?? 2000);
const INTERVAL_MS = Number(process.env.CLUSTER_INTERVAL_MS ?? 500);
const MEASURE_S = Number(process.env.CLUSTER_SECONDS ?? 20);
const WARMUP_S = 8;
const SERVER_USER = "benchwarden";
const SERVER_PASSWORD = randomBytes(18).toString("base64url");

interface Instance {
  child: ChildProcess;
  baseUrl: string;
}

function startInstance(name: string, env: Record<string, string>): Promise<Instance> {
  const child = spawn(process.execPath, ["--import", "tsx", "server/main.ts"], {
    cwd: PROJECT_ROOT,
    env: { ...process.env, TSX_TSCONFIG_PATH: "tsconfig.server.json", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let stderr = "";
  child.stderr!.on("data", (d: Buffer) => (stderr = (stderr + d.toString()).slice(-3000)));
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`instance ${name} did not start in 60 s: ${stderr}`)), 60_000);
    child.stdout!.on("data", (chunk: Buffer) => {
      if (chunk.toString().includes("Benchwarden is running")) {
        clearTimeout(timer);
        resolve({ child, baseUrl: `http://127.0.0.1:${env.PORT}` });
      }
    });
    child.once("exit", (code) => reject(new Error(`instance ${name} exited (${code}): ${stderr}`)));
  });
}

async function storedTotal(instances: Instance[]): Promise<number> {
  let total = 0;
  for (const instance of instances) {
    const text = await fetch(`${instance.baseUrl}/metrics`).then((r) => r.text());
    total += Number(/^benchwarden_readings_stored_total (\S+)/m.exec(text)?.[1] ?? 0);
  }
  return total;
}

async function run(instanceCount: number): Promise<{ instances: number; readingsPerS: number; offeredReadingsPerS: number }> {
  const database = await startPostgres();
  const broker = await startMosquitto({ serverUser: SERVER_USER, serverPassword: SERVER_PASSWORD });
  const dir = mkdtempSync(join(tmpdir(), "benchwarden-bench-cluster-"));
  const instances: Instance[] = [];
  const publishers: JsonChild[] = [];
  try {
    const databaseUrl = await database.createDatabase();
    const envOf = async (i: number) => ({
      PORT: String(await freePort()),
      HOST: "127.0.0.1",
      DATABASE_URL: databaseUrl,
      DATABASE_PATH: join(dir, "unused.sqlite"),
      DEMO: "1",
      SIM: "0",
      LOG_LEVEL: "warn",
      JWT_SECRET: "bench-cluster-".padEnd(40, "x"),
      MQTT_URL: broker.url,
      MQTT_USERNAME: SERVER_USER,
      MQTT_PASSWORD: SERVER_PASSWORD,
      MQTT_CLIENT_ID: `benchwarden-${i}`,
      INSTANCE_ID: `instance-${i}`,
    });
    const envs = await Promise.all(Array.from({ length: instanceCount }, (_, i) => envOf(i)));
    for (const [i, env] of envs.entries()) instances.push(await startInstance(`instance-${i}`, env));

    // The load probes, registered straight in the database and given to mosquitto.
    const ds = createDataSource({ kind: "postgres", url: databaseUrl });
    await ds.initialize();
    const benches = await ds.getRepository(BenchEntity).find();
    const load = Array.from({ length: SENSORS }, (_, i) => ({ id: `load-${i}`, secret: generateSecret(), benchId: benches[i % benches.length]!.id }));
    await ds
      .getRepository(SensorEntity)
      .save(load.map((s) => ({ id: s.id, kind: "combined" as const, secretHash: hashSecret(s.secret), benchId: s.benchId, disabledAtMs: null, createdAtMs: Date.now() })), { chunk: 500 });
    await ds.destroy();
    const credentialsPath = join(dir, "load-sensors.json");
    writeFileSync(credentialsPath, JSON.stringify(load));
    const exported = runExport({ ...envs[0]!, LOG_LEVEL: "silent" }, ["--out-dir", broker.dir, "--secrets", join(dir, "demo-sensors.json"), "--secrets", credentialsPath]);
    if (exported.status !== 0) throw new Error(`export failed: ${exported.stderr}`);
    await broker.reload();

    const startAtMs = Date.now() + Math.max(3, SENSORS / 1000) * 1000 + 4000;
    const measureFromMs = startAtMs + WARMUP_S * 1000;
    const measureToMs = measureFromMs + MEASURE_S * 1000;
    const stopAtMs = measureToMs + 500;
    const per = Math.ceil(SENSORS / 2);
    for (let p = 0; p < 2; p++) {
      const config = { url: broker.url, credentialsPath, from: p * per, to: Math.min(SENSORS, (p + 1) * per), window: 1, startAtMs, measureFromMs, measureToMs, stopAtMs, intervalMs: INTERVAL_MS };
      publishers.push(new JsonChild("bench/lib/publisher.ts", { BENCH_PUBLISHER: JSON.stringify(config) }));
    }
    await sleepUntil(measureFromMs);
    const before = { atMs: Date.now(), stored: await storedTotal(instances) };
    await sleepUntil(measureToMs);
    const after = { atMs: Date.now(), stored: await storedTotal(instances) };
    await Promise.all(publishers.map((p) => p.next(stopAtMs - Date.now() + 20_000)));
    const seconds = (after.atMs - before.atMs) / 1000;
    return { instances: instanceCount, readingsPerS: Math.round((after.stored - before.stored) / seconds), offeredReadingsPerS: Math.round((SENSORS * 5 * 1000) / INTERVAL_MS) };
  } finally {
    for (const p of publishers) if (p.process.exitCode === null) p.process.kill("SIGTERM");
    await Promise.all(
      instances.map(
        (i) =>
          new Promise((resolve) => {
            if (i.child.exitCode !== null) return resolve(null);
            i.child.once("exit", resolve);
            i.child.kill("SIGTERM");
            setTimeout(() => i.child.kill("SIGKILL"), 20_000).unref();
          }),
      ),
    );
    await broker.cleanup();
    await database.cleanup();
    rmSync(dir, { recursive: true, force: true });
  }
}

const results = [];
for (const count of [1, 2]) {
  const result = await run(count);
  console.log(`${count} instance${count > 1 ? "s" : ""}: ${result.readingsPerS.toLocaleString("en")} readings/s stored (offered ${result.offeredReadingsPerS.toLocaleString("en")}/s by ${SENSORS} probes every ${INTERVAL_MS} ms)`);
  results.push(result);
}
console.log(`two instances against one: ${(results[1]!.readingsPerS / results[0]!.readingsPerS).toFixed(2)}×`);
console.log(JSON.stringify({ bench: "cluster", sensors: SENSORS, intervalMs: INTERVAL_MS, measureS: MEASURE_S, cores: cpus().length, results }));
process.exit(0);
