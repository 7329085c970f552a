/**
 * The whole performance picture in one run (issue 9): ceilings of the parts, the product against
 * them, alert latency, charts at 10 M readings, client weight. Prints a table, then as its last
 * line one JSON object (the keys scripts read are documented in BENCHMARKS.md).
 *   npm run bench            full set (about 8 minutes)
 *   npm run bench -- --quick short and small (under two minutes), for a quick look
 */
import { cpus, totalmem } from "node:os";
import { measureCharts, type ChartsResult } from "./charts.js";
import { measureClient, type ClientSize } from "./client-size.js";
import { runIngest, type IngestRun } from "./ingest.js";
import { JsonChild } from "./lib/processes.js";
import { measureSqliteCeiling, type SqliteCeiling } from "./sqlite-ceiling.js";

interface Plan {
  sqliteRows: number;
  fleets: number[];
  ceilingS: number;
  productS: number;
  warmupS: number;
  alertLoadSensors: number;
  alertTrials: number;
  chartRows: number;
  chartIntervalS: number;
  chartIterations: number;
  /** A run at a real fleet's pace (each sensor once per pacedIntervalMs), on the largest fleet; 0 = none. */
  pacedIntervalMs: number;
}

const FULL: Plan = { sqliteRows: 500_000, fleets: [1000, 5000], ceilingS: 30, productS: 60, warmupS: 10, alertLoadSensors: 1000, alertTrials: 20, chartRows: 10_000_000, chartIntervalS: 5, chartIterations: 50, pacedIntervalMs: 1000 };
const QUICK: Plan = { sqliteRows: 100_000, fleets: [500], ceilingS: 6, productS: 10, warmupS: 2, alertLoadSensors: 200, alertTrials: 5, chartRows: 800_000, chartIntervalS: 15, chartIterations: 20, pacedIntervalMs: 0 };

function log(message: string): void {
  process.stderr.write(`[bench ${new Date().toISOString().slice(11, 19)}] ${message}\n`);
}

async function alertLatency(plan: Plan): Promise<Record<string, number>> {
  const child = new JsonChild("bench/alert-latency.ts", { LOAD_SENSORS: String(plan.alertLoadSensors), TRIALS: String(plan.alertTrials) });
  const timer = setTimeout(() => child.process.kill("SIGKILL"), 5 * 60_000);
  await child.exited;
  clearTimeout(timer);
  const result = child.lines.find((l) => l.bench === "alert-latency");
  if (!result) throw new Error(`alert-latency printed no result: ${child.stderr}`);
  return result as Record<string, number>;
}

export async function runSuite(quick: boolean): Promise<void> {
  const plan = quick ? QUICK : FULL;
  const started = Date.now();
  log(`client build`);
  const client: ClientSize = measureClient();
  log(`SQLite ceiling (${plan.sqliteRows} rows, 1,000 per transaction)`);
  const sqlite: SqliteCeiling = await measureSqliteCeiling(plan.sqliteRows);
  const runs: { sensors: number; broker: IngestRun; product: IngestRun }[] = [];
  for (const sensors of plan.fleets) {
    log(`aedes ceiling, ${sensors} sensors, ${plan.ceilingS} s`);
    const broker = await runIngest({ target: "broker", sensors, measureS: plan.ceilingS, warmupS: plan.warmupS });
    log(`product, ${sensors} sensors, ${plan.productS} s`);
    const product = await runIngest({ target: "server", sensors, measureS: plan.productS, warmupS: plan.warmupS });
    runs.push({ sensors, broker, product });
  }
  let paced: IngestRun | null = null;
  if (plan.pacedIntervalMs > 0) {
    const sensors = plan.fleets.at(-1)!;
    log(`product at a fleet's pace, ${sensors} sensors every ${plan.pacedIntervalMs} ms, ${plan.productS} s`);
    paced = await runIngest({ target: "server", sensors, measureS: plan.productS, warmupS: plan.warmupS, intervalMs: plan.pacedIntervalMs });
  }
  log(`alert latency (${plan.alertLoadSensors} load sensors, ${plan.alertTrials} trials)`);
  const alerts = await alertLatency(plan);
  log(`charts (≥ ${plan.chartRows} readings)`);
  const charts: ChartsResult = await measureCharts({ minRows: plan.chartRows, iterations: plan.chartIterations, intervalS: plan.chartIntervalS });

  const last = runs.at(-1)!;
  const ratio = (a: number, b: number) => Number((a / b).toFixed(3));
  const result = {
    bench: "suite",
    mode: quick ? "quick" : "full",
    machine: { cores: cpus().length, cpu: cpus()[0]?.model ?? "", memGb: Math.round(totalmem() / 2 ** 30), node: process.version },
    ingest: {
      sensors: last.sensors,
      ceilingBrokerPerS: last.broker.readingsPerS,
      ceilingSqlitePerS: sqlite.fleetOrderRowsPerS,
      productPerS: last.product.readingsPerS,
      ratioToBroker: ratio(last.product.readingsPerS, last.broker.readingsPerS),
      ratioToSqlite: ratio(last.product.readingsPerS, sqlite.fleetOrderRowsPerS),
      p50CommitMs: last.product.p50Ms,
      p95CommitMs: last.product.p95Ms,
      p99CommitMs: last.product.p99Ms,
      rejected: last.product.rejected,
      rssMb: last.product.maxRssMb,
      publishFailures: last.product.publishFailures,
      sqliteKeyOrderPerS: sqlite.keyOrderRowsPerS,
      fleets: runs.map((r) => ({
        sensors: r.sensors,
        broker: { rssMb: r.broker.maxRssMb, readingsPerS: r.broker.readingsPerS, messagesPerS: r.broker.messagesPerS, p50Ms: r.broker.p50Ms, p99Ms: r.broker.p99Ms, cores: r.broker.targetCores, publisherCores: r.broker.publisherCores, measureS: r.broker.measureS },
        product: { readingsPerS: r.product.readingsPerS, messagesPerS: r.product.messagesPerS, p50Ms: r.product.p50Ms, p95Ms: r.product.p95Ms, p99Ms: r.product.p99Ms, rejected: r.product.rejected, publishFailures: r.product.publishFailures, rssMb: r.product.maxRssMb, heapUsedMb: r.product.heapUsedMb, cores: r.product.targetCores, publisherCores: r.product.publisherCores, measureS: r.product.measureS },
        ratioToBroker: ratio(r.product.readingsPerS, r.broker.readingsPerS),
      })),
      // If the machine is CPU-bound, a reading costs the product at least what it costs the broker
      // plus what it costs SQLite: the best ratio to the broker is then S / (B + S).
      ratioBoundFromCeilings: ratio(sqlite.fleetOrderRowsPerS, last.broker.readingsPerS + sqlite.fleetOrderRowsPerS),
      paced: paced && { sensors: paced.sensors, intervalMs: paced.intervalMs, readingsPerS: paced.readingsPerS, p50Ms: paced.p50Ms, p95Ms: paced.p95Ms, p99Ms: paced.p99Ms, rejected: paced.rejected, publishFailures: paced.publishFailures, rssMb: paced.maxRssMb, cores: paced.targetCores, publisherCores: paced.publisherCores },
    },
    alerts: { p50Ms: alerts.latencyP50Ms, p95Ms: alerts.latencyP95Ms, loadSensors: alerts.loadSensors, trials: alerts.trials, delivered: alerts.delivered, loadReadingsPerS: alerts.readingsStoredPerSecond },
    charts: {
      rows: charts.rows,
      p95Ms24h: charts.service.p95Ms24h,
      p95Ms7d: charts.service.p95Ms7d,
      p95Ms30d: charts.service.p95Ms30d,
      p95MsDashboard200: charts.service.p95MsDashboard200,
      timing: "service calls in the server process (ReadingsService.benchSeries, all five quantities; ZonesService.listZones)",
      service: charts.service,
      http: charts.http,
      rawSeriesP50Ms: charts.rawSeriesP50Ms,
      rollupRows: charts.rollupRows,
      fillS: charts.fillS,
      denseBenches: charts.denseBenches,
      intervalS: charts.intervalS,
    },
    client: { firstLoadJsGzipKb: client.firstLoadJsGzipKb, firstLoadCssGzipKb: client.firstLoadCssGzipKb, largestLazyChunkGzipKb: client.largestLazyChunkGzipKb, largestLazyChunk: client.largestLazyChunk, entryJsGzipKb: client.entryJsGzipKb },
    cores: "no pinning: the target (server or broker) process and two publisher processes share both cores under the OS scheduler; core use of each is in ingest.fleets",
    seconds: Math.round((Date.now() - started) / 1000),
  };

  const rows: [string, string, string][] = [];
  rows.push(["SQLite ceiling, fleet order / key order", `${sqlite.fleetOrderRowsPerS} / ${sqlite.keyOrderRowsPerS} rows/s`, "1,000 rows per transaction"]);
  for (const r of runs) {
    rows.push([`aedes ceiling, ${r.sensors} sensors`, `${r.broker.readingsPerS} readings/s`, `${r.broker.messagesPerS} msg/s, p50 ${r.broker.p50Ms} ms, p99 ${r.broker.p99Ms} ms; cores broker ${r.broker.targetCores}, publishers ${r.broker.publisherCores}; RSS ${r.broker.maxRssMb} MB`]);
    rows.push([`product, ${r.sensors} sensors`, `${r.product.readingsPerS} readings/s`, `${ratio(r.product.readingsPerS, r.broker.readingsPerS)} of aedes, ${ratio(r.product.readingsPerS, sqlite.fleetOrderRowsPerS)} of SQLite; cores server ${r.product.targetCores}, publishers ${r.product.publisherCores}`]);
    rows.push([`  publish→commit, ${r.sensors} sensors`, `p50 ${r.product.p50Ms} / p95 ${r.product.p95Ms} / p99 ${r.product.p99Ms} ms`, `rejected ${r.product.rejected}, publish failures ${r.product.publishFailures}, RSS max ${r.product.maxRssMb} MB (heap ${r.product.heapUsedMb} MB at the end)`]);
  }
  if (paced) rows.push([`product paced, ${paced.sensors} every ${paced.intervalMs} ms`, `${paced.readingsPerS} readings/s`, `p50 ${paced.p50Ms} / p95 ${paced.p95Ms} / p99 ${paced.p99Ms} ms, rejected ${paced.rejected}, RSS max ${paced.maxRssMb} MB, cores server ${paced.targetCores}`]);
  rows.push(["alert latency", `p50 ${alerts.latencyP50Ms} / p95 ${alerts.latencyP95Ms} ms`, `${alerts.delivered}/${alerts.trials} delivered, ${alerts.loadSensors} load sensors`]);
  rows.push([`charts, ${charts.rows} readings`, `24 h ${charts.service.p95Ms24h} / 7 d ${charts.service.p95Ms7d} / 30 d ${charts.service.p95Ms30d} ms p95`, `service; HTTP ${charts.http.p95Ms24h} / ${charts.http.p95Ms7d} / ${charts.http.p95Ms30d} ms; raw query p50 ${charts.rawSeriesP50Ms["24h"]} / ${charts.rawSeriesP50Ms["7d"]} / ${charts.rawSeriesP50Ms["30d"]} ms`]);
  rows.push(["dashboard, 200 benches", `p95 ${charts.service.p95MsDashboard200} ms`, `service; HTTP p95 ${charts.http.p95MsDashboard200} ms`]);
  rows.push(["client first load (gzip)", `JS ${client.firstLoadJsGzipKb} kB, CSS ${client.firstLoadCssGzipKb} kB`, `largest lazy chunk ${client.largestLazyChunkGzipKb} kB (${client.largestLazyChunk})`]);
  const w0 = Math.max(...rows.map((r) => r[0].length));
  const w1 = Math.max(...rows.map((r) => r[1].length));
  console.log(`\nBenchwarden performance (${result.mode}, ${result.machine.cores} cores, ${result.machine.node}, ${result.seconds} s)`);
  for (const [a, b, c] of rows) console.log(`${a.padEnd(w0)}  ${b.padEnd(w1)}  ${c}`);
  console.log(JSON.stringify(result));
}
