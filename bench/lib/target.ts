/**
 * The process publishers talk to in the ingest benchmarks, started by bench/ingest.ts:
 *   BENCH_TARGET=broker  the embedded aedes broker alone: accepts every sign-in, and its
 *                        authorizePublish calls back at once (the do-nothing handler), so a QoS 1
 *                        publish is acknowledged as soon as aedes has parsed it;
 *   BENCH_TARGET=server  the real server (start() from server/index.ts) on a new demo database,
 *                        with BENCH_SENSORS combined probes registered over its benches.
 * Prints one JSON line {ready, port, credentialsPath} and then answers line commands on stdin:
 * "stats" → one JSON line (messages, stored, rejected, RSS), "stop" → closes and exits.
 */
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { createServer, type AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createInterface } from "node:readline";
import { Aedes } from "aedes";

const TARGET = process.env.BENCH_TARGET ?? "server";
const SENSORS = Number(process.env.BENCH_SENSORS ?? 1000);
const dir = mkdtempSync(join(tmpdir(), `benchwarden-bench-${TARGET}-`));
const credentialsPath = join(dir, "sensors.json");
let maxRssMb = 0;
const rssTimer = setInterval(() => (maxRssMb = Math.max(maxRssMb, process.memoryUsage().rss / 1048576)), 1000);

let stats: () => Record<string, number>;
let stop: () => Promise<void>;
let port: number;

if (TARGET === "broker") {
  let messages = 0;
  const broker = await Aedes.createBroker({
    authenticate: (_client, _username, _password, done) => done(null, true),
    authorizePublish: (_client, _packet, callback) => {
      messages++;
      callback(null);
    },
  });
  const server = createServer((socket) => {
    socket.setNoDelay(true);
    broker.handle(socket);
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  port = (server.address() as AddressInfo).port;
  writeFileSync(credentialsPath, JSON.stringify(Array.from({ length: SENSORS }, (_, i) => ({ id: `load-${i}`, secret: "any" }))));
  stats = () => ({ messages, stored: messages * 5, rejected: 0 });
  stop = () => new Promise<void>((resolve) => broker.close(() => server.close(() => resolve())));
} else {
  const { parseEnv } = await import("../../server/config/env.js");
  const { BenchEntity } = await import("../../server/db/entities/bench.entity.js");
  const { SensorEntity } = await import("../../server/db/entities/sensor.entity.js");
  const { start } = await import("../../server/index.js");
  const { generateSecret, hashSecret } = await import("../../server/modules/sensors/sensors.service.js");
  const server = await start(
    parseEnv({ PORT: "0", HOST: "127.0.0.1", MQTT_PORT: "0", MQTT_HOST: "127.0.0.1", DATABASE_PATH: join(dir, "db.sqlite"), DEMO: "1", SIM: "0", LOG_LEVEL: "silent" }),
    { staticDir: join(dir, "none") },
  );
  const benches = await server.dataSource.getRepository(BenchEntity).find();
  const load = Array.from({ length: SENSORS }, (_, i) => {
    const bench = benches[i % benches.length]!;
    return { id: `load-${i}`, secret: generateSecret(), benchId: bench.id, benchName: bench.name, kind: "combined" as const };
  });
  await server.dataSource.getRepository(SensorEntity).save(
    load.map((s) => ({ id: s.id, kind: s.kind, secretHash: hashSecret(s.secret), benchId: s.benchId, disabledAtMs: null, createdAtMs: Date.now() })),
    { chunk: 200 },
  );
  await server.alerts.engine.tick();
  writeFileSync(credentialsPath, JSON.stringify(load));
  port = server.mqttPort;
  stats = () => ({
    messages: server.metrics.mqttMessages.get(),
    stored: server.metrics.readingsStored.get(),
    rejected: server.metrics.readingsRejected.entries().reduce((a, e) => a + e.value, 0),
    refused: server.metrics.mqttRefused.entries().reduce((a, e) => a + e.value, 0),
  });
  stop = () => server.stop();
}

console.log(JSON.stringify({ ready: true, port, credentialsPath, pid: process.pid }));
const lines = createInterface({ input: process.stdin });
lines.on("line", (line) => {
  if (line === "stats") {
    const rssMb = process.memoryUsage().rss / 1048576;
    maxRssMb = Math.max(maxRssMb, rssMb);
    const cpu = process.cpuUsage();
    console.log(JSON.stringify({ ...stats(), rssMb, maxRssMb, heapUsedMb: process.memoryUsage().heapUsed / 1048576, cpuMs: (cpu.user + cpu.system) / 1000, timeMs: Date.now() }));
  } else if (line === "stop") {
    clearInterval(rssTimer);
    const force = setTimeout(() => process.exit(0), 10_000);
    void stop().finally(() => {
      clearTimeout(force);
      rmSync(dir, { recursive: true, force: true });
      process.exit(0);
    });
  }
});
lines.on("close", () => process.exit(0));
