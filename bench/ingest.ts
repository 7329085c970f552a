/**
 * Ingest throughput and publish→commit latency: the same publisher processes
 * (bench/lib/publisher.ts, closed loop, WINDOW QoS 1 publishes in flight per connection) against
 * either the aedes broker alone with a do-nothing handler (the ceiling) or the real server.
 * Used by the suite (bench/suite.ts); runs alone as `tsx bench/ingest.ts <broker|server> <sensors> [seconds]`.
 */
import { cpus } from "node:os";
import { Histogram } from "./lib/histogram.js";
import { JsonChild, sleepUntil } from "./lib/processes.js";

export interface IngestRun {
  target: "broker" | "server";
  sensors: number;
  intervalMs: number;
  publishers: number;
  window: number;
  measureS: number;
  messagesPerS: number;
  readingsPerS: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  rejected: number;
  publishFailures: number;
  rssMb: number;
  maxRssMb: number;
  heapUsedMb: number;
  /** Share of one core the target process used during the measurement (1 = a whole core). */
  targetCores: number;
  /** Share of one core all publisher processes used during the measurement. */
  publisherCores: number;
}

export interface IngestOptions {
  target: "broker" | "server";
  sensors: number;
  measureS: number;
  warmupS?: number;
  publishers?: number;
  window?: number;
  /** 0 (default): closed loop; else each sensor publishes once per intervalMs. */
  intervalMs?: number;
  /** node flags for the target process (e.g. --cpu-prof). */
  targetNodeArgs?: string[];
}

export async function runIngest(options: IngestOptions): Promise<IngestRun> {
  const publishers = options.publishers ?? 2;
  const window = options.window ?? 1;
  const warmupS = options.warmupS ?? 10;
  const target = new JsonChild("bench/lib/target.ts", { BENCH_TARGET: options.target, BENCH_SENSORS: String(options.sensors), }, options.targetNodeArgs ?? []);
  const pubs: JsonChild[] = [];
  try {
    const ready = await target.next(120_000);
    const connectS = Math.max(3, options.sensors / 1000);
    const startAtMs = Date.now() + connectS * 1000 + 4000; // + tsx start-up of the publishers
    const measureFromMs = startAtMs + warmupS * 1000;
    const measureToMs = measureFromMs + options.measureS * 1000;
    const stopAtMs = measureToMs + 500;
    const per = Math.ceil(options.sensors / publishers);
    for (let p = 0; p < publishers; p++) {
      const config = {
        url: `mqtt://127.0.0.1:${ready.port as number}`,
        credentialsPath: ready.credentialsPath,
        from: p * per,
        to: Math.min(options.sensors, (p + 1) * per),
        window,
        startAtMs,
        measureFromMs,
        measureToMs,
        stopAtMs,
        intervalMs: options.intervalMs ?? 0,
      };
      pubs.push(new JsonChild("bench/lib/publisher.ts", { BENCH_PUBLISHER: JSON.stringify(config) }));
    }
    await sleepUntil(measureFromMs);
    target.send("stats");
    const before = await target.next(10_000);
    await sleepUntil(measureToMs);
    target.send("stats");
    const after = await target.next(10_000);
    const seconds = ((after.timeMs as number) - (before.timeMs as number)) / 1000;
    const results = await Promise.all(pubs.map((p) => p.next(stopAtMs - Date.now() + 20_000)));
    const latency = new Histogram();
    let failures = 0;
    for (const r of results) {
      latency.merge(r.latency as [number, number][]);
      failures += (r.failed as number) + (r.errors as number) + (((r.sensors as number) - (r.connected as number)) || 0);
    }
    const messagesPerS = ((after.messages as number) - (before.messages as number)) / seconds;
    return {
      target: options.target,
      sensors: options.sensors,
      intervalMs: options.intervalMs ?? 0,
      publishers,
      window,
      measureS: Number(seconds.toFixed(1)),
      messagesPerS: Math.round(messagesPerS),
      readingsPerS: Math.round(((after.stored as number) - (before.stored as number)) / seconds),
      p50Ms: latency.percentile(50),
      p95Ms: latency.percentile(95),
      p99Ms: latency.percentile(99),
      rejected: (after.rejected as number) + ((after.refused as number | undefined) ?? 0),
      publishFailures: failures,
      rssMb: Math.round(after.rssMb as number),
      heapUsedMb: Math.round(after.heapUsedMb as number),
      targetCores: Number((((after.cpuMs as number) - (before.cpuMs as number)) / 1000 / seconds).toFixed(2)),
      publisherCores: Number((results.reduce((a, r) => a + (r.cpuMsInWindow as number), 0) / 1000 / options.measureS).toFixed(2)),
      maxRssMb: Math.round(after.maxRssMb as number),
    };
  } finally {
    for (const p of pubs) if (p.process.exitCode === null) p.process.kill("SIGTERM");
    await target.stop();
  }
}

if (process.argv[1]?.endsWith("ingest.ts")) {
  const [target = "server", sensors = "1000", seconds = "20", profileDir, intervalMs = "0"] = process.argv.slice(2);
  const targetNodeArgs = profileDir ? ["--cpu-prof", `--cpu-prof-dir=${profileDir}`] : [];
  const run = await runIngest({ target: target as "broker" | "server", sensors: Number(sensors), measureS: Number(seconds), warmupS: 5, targetNodeArgs, intervalMs: Number(intervalMs) });
  console.log(JSON.stringify({ ...run, cores: cpus().length }));
  process.exit(0);
}
