/**
 * A publisher process for the ingest benchmarks (bench/ingest.ts starts one or more of these).
 * Plays the sensors of a credentials file, one MQTT 3.1.1 connection each, as fast as the broker
 * acknowledges: every connection keeps WINDOW QoS 1 publishes in flight (a closed loop), so the
 * same publishers measure the broker alone and the real server. Each pack is a small SenML pack of
 * five records (a combined probe's four quantities and its battery), stamped with the wall clock.
 * Latency is publish → PUBACK, which the server sends only after the commit.
 *
 * Input (env): BENCH_PUBLISHER = JSON { url, credentialsPath, from, to, window, startAtMs,
 * measureFromMs, measureToMs, stopAtMs }. Output: one JSON line on stdout at the end.
 * Every loop is bounded: publishing stops at stopAtMs, the process exits by stopAtMs + 15 s.
 */
import { readFileSync } from "node:fs";
import mqtt, { type MqttClient } from "mqtt";
import { Histogram } from "./histogram.js";

interface Config {
  url: string;
  credentialsPath: string;
  from: number;
  to: number;
  window: number;
  startAtMs: number;
  measureFromMs: number;
  measureToMs: number;
  stopAtMs: number;
  /** 0: closed loop (publish as soon as acknowledged); else each sensor publishes once per interval. */
  intervalMs?: number;
}

const config = JSON.parse(process.env.BENCH_PUBLISHER ?? "{}") as Config;
const credentials = (JSON.parse(readFileSync(config.credentialsPath, "utf8")) as { id: string; secret: string }[]).slice(config.from, config.to);
const hardExit = setTimeout(() => {
  console.log(JSON.stringify({ error: "publisher did not finish in time", ...summary() }));
  process.exit(3);
}, Math.max(0, config.stopAtMs - Date.now()) + 15_000);

const cpuMs = () => {
  const cpu = process.cpuUsage();
  return (cpu.user + cpu.system) / 1000;
};
let cpuAtStart = 0;
let cpuAtEnd = 0;
setTimeout(() => (cpuAtStart = cpuMs()), Math.max(0, config.measureFromMs - Date.now()));
setTimeout(() => (cpuAtEnd = cpuMs()), Math.max(0, config.measureToMs - Date.now()));
const latency = new Histogram();
let acked = 0;
let ackedInWindow = 0;
let sentInWindow = 0;
let failed = 0;
let errors = 0;
let connected = 0;
let closes = 0;
const errorKinds = new Map<string, number>();

function summary() {
  return { cpuMsInWindow: cpuAtEnd - cpuAtStart, sensors: credentials.length, connected, acked, ackedInWindow, sentInWindow, failed, errors, closes, errorKinds: Object.fromEntries(errorKinds), latency: latency.toJSON() };
}

function pack(id: string, timeMs: number, i: number): string {
  const t = timeMs / 1000;
  const wobble = (i % 17) / 10;
  return JSON.stringify([
    { bn: `urn:dev:bw:${id}:`, bt: t, n: "air.temperature", u: "Cel", v: 22 + wobble },
    { n: "air.humidity", u: "%RH", v: 78 + wobble },
    { n: "medium.temperature", u: "Cel", v: 23 + wobble },
    { n: "medium.moisture", u: "/", v: 0.45 },
    { n: "battery", u: "%EL", v: 90 },
  ]);
}

async function runSensor(sensor: { id: string; secret: string }, index: number): Promise<void> {
  // Connections open spread over the time before startAtMs, so the fleet does not storm the broker.
  const spreadMs = Math.max(0, config.startAtMs - Date.now() - 1000);
  await new Promise((r) => setTimeout(r, (index / Math.max(1, credentials.length)) * spreadMs));
  let client: MqttClient;
  try {
    client = await mqtt.connectAsync(config.url, { username: sensor.id, password: sensor.secret, clientId: sensor.id, reconnectPeriod: 0, connectTimeout: 20_000, keepalive: 60 });
  } catch (err) {
    errors++;
    const kind = String((err as Error).message).slice(0, 60);
    errorKinds.set(kind, (errorKinds.get(kind) ?? 0) + 1);
    return;
  }
  connected++;
  client.on("close", () => closes++);
  client.on("error", () => errors++);
  await new Promise((r) => setTimeout(r, Math.max(0, config.startAtMs - Date.now())));
  const topic = `benchwarden/v1/sensors/${sensor.id}/readings`;
  let lastTimeMs = 0;
  let n = 0;
  const intervalMs = config.intervalMs ?? 0;
  // Paced sensors start spread evenly over the interval, as a real fleet does.
  let nextAtMs = config.startAtMs + (intervalMs * index) / Math.max(1, credentials.length);
  const lane = async (): Promise<void> => {
    while (Date.now() < config.stopAtMs && client.connected) {
      if (intervalMs > 0) {
        await new Promise((r) => setTimeout(r, Math.max(0, nextAtMs - Date.now())));
        nextAtMs += intervalMs;
        if (Date.now() >= config.stopAtMs) break;
      }
      // Strictly increasing times per sensor, so no reading is a duplicate of another.
      const timeMs = Math.max(Date.now(), lastTimeMs + 1);
      lastTimeMs = timeMs;
      const sentMs = performance.now();
      const sentWall = Date.now();
      const inWindow = sentWall >= config.measureFromMs && sentWall < config.measureToMs;
      if (inWindow) sentInWindow++;
      try {
        await client.publishAsync(topic, pack(sensor.id, timeMs, n++), { qos: 1 });
      } catch {
        failed++;
        return;
      }
      acked++;
      if (inWindow) {
        ackedInWindow++;
        latency.record(performance.now() - sentMs);
      }
    }
  };
  await Promise.all(Array.from({ length: config.window }, () => lane()));
  await client.endAsync().catch(() => undefined);
}

await Promise.all(credentials.map((c, i) => runSensor(c, i)));
clearTimeout(hardExit);
console.log(JSON.stringify(summary()));
process.exit(0);
