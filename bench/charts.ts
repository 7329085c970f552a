/**
 * Charts at fleet scale. Fills a new database fast (raw prepared statements in key order, one
 * transaction per chunk; rollups computed on the way, as ingest keeps them) with DENSE_BENCHES
 * benches whose combined probe has reported every INTERVAL_S for 30 days, plus enough benches for
 * a 200-bench dashboard (each with a latest reading). Then times, warm, on the real server:
 *   - the service calls (server time): ReadingsService.benchSeries (all five quantities, as the
 *     bench chart asks) for 24 h / 7 d / 30 d, ZonesService.listZones for the dashboard;
 *   - the same over HTTP on loopback (GET /api/benches/:id/readings, GET /api/zones), for reference.
 *   tsx bench/charts.ts [rows]
 */
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parseEnv } from "../server/config/env.js";
import { rawDatabase } from "../server/db/data-source.js";
import { BenchEntity } from "../server/db/entities/bench.entity.js";
import { SensorEntity } from "../server/db/entities/sensor.entity.js";
import { ZoneWindowEntity } from "../server/db/entities/window.entity.js";
import { ZoneEntity } from "../server/db/entities/zone.entity.js";
import { DEMO_WINDOW } from "../server/demo/seed.js";
import { start } from "../server/index.js";
import { SqliteReadingStore } from "../server/modules/readings/reading-store.js";
import { ReadingsRepository, ROLLUP_RESOLUTIONS_MS } from "../server/modules/readings/readings.repository.js";
import { ReadingsService } from "../server/modules/readings/readings.service.js";
import { WindowsService } from "../server/modules/windows/windows.service.js";
import { ZonesService } from "../server/modules/zones/zones.service.js";
import { percentileOf } from "./lib/histogram.js";

const DAY_MS = 86_400_000;
const QUANTITIES = ["air.humidity", "air.temperature", "battery", "medium.moisture", "medium.temperature"] as const;
const BENCHES = 200;

export interface ChartsResult {
  /** The old query straight from the readings, five quantities, p50 ms (before rollups). */
  rawSeriesP50Ms: Record<string, number>;
  rows: number;
  rollupRows: number;
  fillS: number;
  denseBenches: number;
  intervalS: number;
  iterations: number;
  service: { p50Ms24h: number; p95Ms24h: number; p50Ms7d: number; p95Ms7d: number; p50Ms30d: number; p95Ms30d: number; p50MsDashboard200: number; p95MsDashboard200: number };
  http: { p50Ms24h: number; p95Ms24h: number; p50Ms7d: number; p95Ms7d: number; p50Ms30d: number; p95Ms30d: number; p50MsDashboard200: number; p95MsDashboard200: number };
}

function valueOf(quantity: string, timeMs: number, seed: number): number {
  const day = Math.sin((2 * Math.PI * (timeMs % DAY_MS)) / DAY_MS);
  const noise = ((timeMs / 5000 + seed * 7919) % 13) / 13 - 0.5;
  switch (quantity) {
    case "air.temperature":
      return 23 + 2 * day + noise * 0.4;
    case "air.humidity":
      return 80 - 6 * day + noise * 2;
    case "medium.temperature":
      return 23 + day + noise * 0.2;
    case "medium.moisture":
      return 0.45 + 0.05 * day + noise * 0.01;
    default:
      return 90 - (timeMs % (30 * DAY_MS)) / (30 * DAY_MS);
  }
}

async function timed<T>(iterations: number, fn: () => Promise<T> | T): Promise<number[]> {
  for (let i = 0; i < 3; i++) await fn(); // warm
  const times: number[] = [];
  for (let i = 0; i < iterations; i++) {
    const t = performance.now();
    await fn();
    times.push(performance.now() - t);
  }
  return times.sort((a, b) => a - b);
}

const round2 = (x: number) => Number(x.toFixed(2));

export async function measureCharts(options: { minRows: number; iterations: number; intervalS?: number }): Promise<ChartsResult> {
  const intervalS = options.intervalS ?? 5;
  const perBench = Math.floor((30 * DAY_MS) / (intervalS * 1000)) * QUANTITIES.length;
  const denseBenches = Math.max(1, Math.ceil(options.minRows / perBench));
  const dir = mkdtempSync(join(tmpdir(), "benchwarden-bench-charts-"));
  const server = await start(
    parseEnv({ PORT: "0", HOST: "127.0.0.1", MQTT_PORT: "0", MQTT_HOST: "127.0.0.1", DATABASE_PATH: join(dir, "db.sqlite"), DEMO: "1", SIM: "0", LOG_LEVEL: "silent", ALERT_TICK: "1h" }),
    { staticDir: join(dir, "none") },
  );
  try {
    const ds = server.dataSource;
    // Houses of 20 benches until there are 200 benches, one combined probe on each.
    const someZone = await ds.getRepository(ZoneEntity).findOneByOrFail({});
    let benches = await ds.getRepository(BenchEntity).find();
    for (let house = 1; benches.length < BENCHES; house++) {
      const zone = await ds.getRepository(ZoneEntity).save({ siteId: someZone.siteId, name: `Load house ${house}`, position: 10 + house, archivedAtMs: null });
      await ds.getRepository(ZoneWindowEntity).save(
        Object.entries(DEMO_WINDOW).map(([quantity, w]) => ({ zoneId: zone.id, quantity: quantity as "air.temperature", minValue: w.min, maxValue: w.max, delayS: w.delayS, hysteresis: w.hysteresis })),
      );
      const count = Math.min(20, BENCHES - benches.length);
      await ds.getRepository(BenchEntity).save(Array.from({ length: count }, (_, i) => ({ zoneId: zone.id, name: `L${house}-${i + 1}`, position: i, archivedAtMs: null })));
      benches = await ds.getRepository(BenchEntity).find();
    }
    const probes = benches.slice(0, BENCHES).map((b, i) => ({ id: `chart-${String(i).padStart(3, "0")}`, benchId: b.id }));
    await ds.getRepository(SensorEntity).save(
      probes.map((p) => ({ id: p.id, kind: "combined" as const, secretHash: "0".repeat(64), benchId: p.benchId, disabledAtMs: null, createdAtMs: Date.now() })),
      { chunk: 200 },
    );

    // The fill: key order (sensor, quantity, time), one transaction per chunk of rows.
    const db = rawDatabase(ds);
    const insert = db.prepare(`INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id) VALUES (?, ?, ?, ?, ?)`);
    const insertRollup = db.prepare(`INSERT INTO reading_rollup (bench_id, quantity, resolution_ms, start_ms, min, max, sum, count) VALUES (?, ?, ?, ?, ?, ?, ?, ?)`);
    const insertLatest = db.prepare(
      `INSERT INTO latest_reading (sensor_id, quantity, time_ms, value, bench_id) VALUES (?, ?, ?, ?, ?)
       ON CONFLICT (sensor_id, quantity) DO UPDATE SET time_ms = excluded.time_ms, value = excluded.value, bench_id = excluded.bench_id`,
    );
    const nowMs = Date.now();
    const lastMs = Math.floor(nowMs / (intervalS * 1000)) * intervalS * 1000 - intervalS * 1000;
    const firstMs = lastMs - 30 * DAY_MS;
    const fillStarted = performance.now();
    let rows = 0;
    let rollupRows = 0;
    const chunk = db.transaction((sensorId: string, benchId: number, quantity: string, fromMs: number, toMs: number, seed: number) => {
      const open = ROLLUP_RESOLUTIONS_MS.map(() => ({ startMs: -1, min: 0, max: 0, sum: 0, count: 0 }));
      const flush = (level: number) => {
        const o = open[level]!;
        if (o.count > 0) {
          insertRollup.run(benchId, quantity, ROLLUP_RESOLUTIONS_MS[level], o.startMs, o.min, o.max, o.sum, o.count);
          rollupRows++;
        }
      };
      for (let t = fromMs; t < toMs; t += intervalS * 1000) {
        const v = valueOf(quantity, t, seed);
        insert.run(sensorId, quantity, t, v, benchId);
        rows++;
        ROLLUP_RESOLUTIONS_MS.forEach((r, level) => {
          const o = open[level]!;
          const startMs = Math.floor(t / r) * r;
          if (startMs !== o.startMs) {
            flush(level);
            Object.assign(o, { startMs, min: v, max: v, sum: 0, count: 0 });
          }
          if (v < o.min) o.min = v;
          if (v > o.max) o.max = v;
          o.sum += v;
          o.count++;
        });
      }
      // Rollups that straddle the chunk's end are closed here; chunks end on whole hours.
      ROLLUP_RESOLUTIONS_MS.forEach((_, level) => flush(level));
    });
    for (let b = 0; b < denseBenches; b++) {
      const probe = probes[b]!;
      for (const quantity of QUANTITIES) {
        // Chunks end on whole multiples of 5 days (about 86,000 rows each), so no rollup straddles two.
        for (let from = firstMs; from <= lastMs; ) {
          const to = Math.min(lastMs + 1, (Math.floor(from / (5 * DAY_MS)) + 1) * 5 * DAY_MS);
          chunk(probe.id, probe.benchId, quantity, from, to, b);
          from = to;
        }
        insertLatest.run(probe.id, quantity, lastMs, valueOf(quantity, lastMs, b), probe.benchId);
      }
    }
    db.transaction(() => {
      for (const probe of probes.slice(denseBenches)) for (const quantity of QUANTITIES) {
        insert.run(probe.id, quantity, lastMs, valueOf(quantity, lastMs, 0), probe.benchId);
        insertLatest.run(probe.id, quantity, lastMs, valueOf(quantity, lastMs, 0), probe.benchId);
        rows++;
      }
    })();
    const fillS = (performance.now() - fillStarted) / 1000;
    db.pragma("wal_checkpoint(TRUNCATE)");
    db.exec("ANALYZE");

    // Server time: the services the routes call.
    const repository = new ReadingsRepository(db);
    const windows = new WindowsService(ds);
    await windows.ready();
    const store = new SqliteReadingStore(repository);
    const readings = new ReadingsService(ds, store, windows, () => nowMs);
    const zones = new ZonesService(ds, store, windows, server.alerts.service);
    const benchId = probes[0]!.benchId;
    const ranges = { "24h": DAY_MS, "7d": 7 * DAY_MS, "30d": 30 * DAY_MS } as const;
    const service: Record<string, number[]> = {};
    for (const [name, rangeMs] of Object.entries(ranges)) {
      service[name] = await timed(options.iterations, () => readings.benchSeries(benchId, { from: new Date(nowMs - rangeMs), to: new Date(nowMs) }));
    }
    const check = await readings.benchSeries(benchId, { from: new Date(nowMs - 30 * DAY_MS), to: new Date(nowMs) });
    const counted = check.series.reduce((a, s) => a + s.points.reduce((n, p) => n + p.count, 0), 0);
    if (Math.abs(counted - perBench) > perBench * 0.01) throw new Error(`30-day series counts ${counted} readings, expected ${perBench}`);
    // Before rollups: the same buckets straight from the readings (the query the server used to run).
    const rawSeries = db.prepare(
      `SELECT CAST((time_ms - @fromMs) / @bucketMs AS INTEGER) AS bucket, MIN(value) AS min, AVG(value) AS mean, MAX(value) AS max, COUNT(*) AS count
         FROM reading WHERE bench_id = @benchId AND quantity = @quantity AND time_ms >= @fromMs AND time_ms < @toMs GROUP BY bucket ORDER BY bucket`,
    );
    const raw: Record<string, number[]> = {};
    for (const [name, rangeMs] of Object.entries(ranges)) {
      const bucketMs = Math.max(60_000, Math.ceil(rangeMs / 500 / 60_000) * 60_000);
      raw[name] = await timed(Math.min(options.iterations, 10), () => {
        for (const quantity of QUANTITIES) rawSeries.all({ benchId, quantity, fromMs: nowMs - rangeMs, toMs: nowMs, bucketMs });
      });
    }
    service.dashboard = await timed(options.iterations, () => zones.listZones());
    const dashboard = await zones.listZones();
    const benchCount = dashboard.reduce((a, z) => a + z.benches.length, 0);
    if (benchCount < BENCHES) throw new Error(`dashboard lists ${benchCount} benches`);

    // The same over HTTP on loopback (JSON encoding, auth and the Express stack included).
    const base = `http://127.0.0.1:${server.httpPort}`;
    const signIn = await fetch(`${base}/api/session`, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify({ email: "admin@nursery.test", password: "bench-demo-2026" }) });
    const cookie = signIn.headers.getSetCookie().find((c) => c.startsWith("bw_session="))!.split(";")[0]!;
    const get = async (path: string) => {
      const res = await fetch(`${base}${path}`, { headers: { cookie } });
      if (res.status !== 200) throw new Error(`${path}: ${res.status}`);
      await res.arrayBuffer();
    };
    const http: Record<string, number[]> = {};
    for (const [name, rangeMs] of Object.entries(ranges)) {
      http[name] = await timed(options.iterations, () => get(`/api/benches/${benchId}/readings?from=${nowMs - rangeMs}&to=${nowMs}`));
    }
    http.dashboard = await timed(options.iterations, () => get("/api/zones"));
    const figures = (t: Record<string, number[]>) => ({
      p50Ms24h: round2(percentileOf(t["24h"]!, 50)),
      p95Ms24h: round2(percentileOf(t["24h"]!, 95)),
      p50Ms7d: round2(percentileOf(t["7d"]!, 50)),
      p95Ms7d: round2(percentileOf(t["7d"]!, 95)),
      p50Ms30d: round2(percentileOf(t["30d"]!, 50)),
      p95Ms30d: round2(percentileOf(t["30d"]!, 95)),
      p50MsDashboard200: round2(percentileOf(t.dashboard!, 50)),
      p95MsDashboard200: round2(percentileOf(t.dashboard!, 95)),
    });
    const rawSeriesP50Ms = Object.fromEntries(Object.entries(raw).map(([k, t]) => [k, round2(percentileOf(t, 50))]));
    return { rawSeriesP50Ms, rows, rollupRows, fillS: Number(fillS.toFixed(1)), denseBenches, intervalS, iterations: options.iterations, service: figures(service), http: figures(http) };
  } finally {
    await server.stop();
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1]?.endsWith("charts.ts")) {
  console.log(JSON.stringify(await measureCharts({ minRows: Number(process.argv[2] ?? 10_000_000), iterations: Number(process.argv[3] ?? 50), intervalS: Number(process.argv[4] ?? 5) })));
  process.exit(0);
}
