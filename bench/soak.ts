/**
 * Soak: SOAK_SENSORS simulated sensors (default 1,000, every 5 s, from a separate simulator
 * process) against the real server for SOAK_MINUTES (default 30). Prints RSS and heap every
 * minute, then the slope of each (least squares over the second half, after warm-up) and a JSON
 * line. A leak shows as a steady positive slope; the test suite asserts behaviour, this watches time.
 *
 *   npm run bench -- soak              SOAK_MINUTES=5 npm run bench -- soak
 */
import { spawn } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parseEnv } from "../server/config/env.js";
import { BenchEntity } from "../server/db/entities/bench.entity.js";
import { SensorEntity } from "../server/db/entities/sensor.entity.js";
import { PROJECT_ROOT, start } from "../server/index.js";
import { generateSecret, hashSecret } from "../server/modules/sensors/sensors.service.js";

const SENSORS = Number(process.env.SOAK_SENSORS ?? 1000);
const MINUTES = Number(process.env.SOAK_MINUTES ?? 30);

function slopePerMinute(points: { minute: number; value: number }[]): number {
  const n = points.length;
  if (n < 2) return 0;
  const mx = points.reduce((a, p) => a + p.minute, 0) / n;
  const my = points.reduce((a, p) => a + p.value, 0) / n;
  const num = points.reduce((a, p) => a + (p.minute - mx) * (p.value - my), 0);
  const den = points.reduce((a, p) => a + (p.minute - mx) ** 2, 0);
  return den === 0 ? 0 : num / den;
}

const dir = mkdtempSync(join(tmpdir(), "benchwarden-soak-"));
const server = await start(
  parseEnv({ PORT: "0", HOST: "127.0.0.1", MQTT_PORT: "0", MQTT_HOST: "127.0.0.1", DATABASE_PATH: join(dir, "db.sqlite"), DEMO: "1", SIM: "0", LOG_LEVEL: "warn" }),
  { staticDir: join(dir, "none") },
);
let errors = 0;
process.on("uncaughtException", () => errors++);
const benches = await server.dataSource.getRepository(BenchEntity).find();
const sensors = Array.from({ length: SENSORS }, (_, i) => ({ id: `soak-${i}`, secret: generateSecret(), benchId: benches[i % benches.length]!.id, benchName: benches[i % benches.length]!.name, kind: "combined" as const }));
await server.dataSource.getRepository(SensorEntity).save(
  sensors.map((s) => ({ id: s.id, kind: s.kind, secretHash: hashSecret(s.secret), benchId: s.benchId, disabledAtMs: null, createdAtMs: Date.now() })),
  { chunk: 200 },
);
const credentials = join(dir, "soak-sensors.json");
writeFileSync(credentials, JSON.stringify(sensors));
const sim = spawn(
  process.execPath,
  [join(PROJECT_ROOT, "node_modules/tsx/dist/cli.mjs"), "--tsconfig", join(PROJECT_ROOT, "tsconfig.server.json"), join(PROJECT_ROOT, "sensors-sim/index.ts"),
    "--broker", `mqtt://127.0.0.1:${server.mqttPort}`, "--credentials", credentials, "--interval", "5s", "--qos", "1", "--duration", `${MINUTES + 1}m`, "--progress", "0", "--quiet"],
  { stdio: "ignore" },
);

console.log(`soak: ${SENSORS} sensors every 5 s for ${MINUTES} min (simulator in its own process)`);
console.log("minute  rss MB  heap MB  readings stored  rejected");
const samples: { minute: number; rssMb: number; heapMb: number }[] = [];
for (let minute = 1; minute <= MINUTES; minute++) {
  await new Promise((r) => setTimeout(r, 60_000));
  const mem = process.memoryUsage();
  const rejected = server.metrics.readingsRejected.entries().reduce((a, e) => a + e.value, 0);
  samples.push({ minute, rssMb: mem.rss / 1048576, heapMb: mem.heapUsed / 1048576 });
  console.log(`${String(minute).padStart(6)}  ${(mem.rss / 1048576).toFixed(0).padStart(6)}  ${(mem.heapUsed / 1048576).toFixed(0).padStart(7)}  ${String(server.metrics.readingsStored.get()).padStart(15)}  ${String(rejected).padStart(8)}`);
}
const tail = samples.slice(Math.floor(samples.length / 2));
const result = {
  bench: "soak",
  sensors: SENSORS,
  minutes: MINUTES,
  readingsStored: server.metrics.readingsStored.get(),
  rejected: server.metrics.readingsRejected.entries().reduce((a, e) => a + e.value, 0),
  errors,
  rssMbStart: Math.round(samples[0]?.rssMb ?? 0),
  rssMbEnd: Math.round(samples.at(-1)?.rssMb ?? 0),
  rssSlopeMbPerMin: Number(slopePerMinute(tail.map((s) => ({ minute: s.minute, value: s.rssMb }))).toFixed(3)),
  heapSlopeMbPerMin: Number(slopePerMinute(tail.map((s) => ({ minute: s.minute, value: s.heapMb }))).toFixed(3)),
};
console.log(`slope over the second half: RSS ${result.rssSlopeMbPerMin} MB/min, heap ${result.heapSlopeMbPerMin} MB/min; errors ${errors}`);
console.log(JSON.stringify(result));
sim.kill("SIGTERM");
await server.stop();
rmSync(dir, { recursive: true, force: true });
process.exit(0);
