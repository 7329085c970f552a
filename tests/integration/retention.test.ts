import Database from "better-sqlite3";
import { join } from "node:path";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../shared/api-error.js";
import { addDays, localDate } from "../../shared/domain/batch-calendar.js";
import { batchResponseSchema, type BatchView } from "../../shared/schemas/batches.js";
import { benchReadingsResponseSchema, zoneReadingsResponseSchema, type SeriesPoint } from "../../shared/schemas/readings.js";
import { layoutResponseSchema, type LayoutResponse } from "../../shared/schemas/layout.js";
import type { Quantity } from "../../shared/schemas/quantities.js";
import { ConfigError, parseEnv } from "../../server/config/env.js";
import { rawDatabase } from "../../server/db/data-source.js";
import { ReadingsRepository } from "../../server/modules/readings/readings.repository.js";
import type { DemoSensorCredential } from "../../server/demo/seed.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

/**
 * Raw-reading retention (issue 10 §5): old raw readings go once their rollups hold them, in
 * bounded chunks; readings whose rollups are missing or stale stay, and so do a batch's.
 */
const MINUTE_MS = 60_000;
const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;
const RETENTION_DAYS = 10;
const CHUNK_ROWS = 1000;
const TZ = "America/Chicago"; // the demo site's

let server: TestServer;
let viewer: string;
let grower: string;
/** One probe per test, each on its own bench. */
let probes: DemoSensorCredential[];
let layout: LayoutResponse;

const api = () => request(server.baseUrl);
const db = () => rawDatabase(server.dataSource);
const hourOf = (ms: number) => Math.floor(ms / HOUR_MS) * HOUR_MS;

beforeAll(async () => {
  server = await startTestServer({
    ALERT_TICK: "1h",
    READING_RETENTION_DAYS: String(RETENTION_DAYS),
    READING_RETENTION_CHUNK_ROWS: String(CHUNK_ROWS),
  });
  [viewer, grower] = await Promise.all([signIn(server, "viewer"), signIn(server, "grower")]);
  layout = layoutResponseSchema.parse((await api().get("/api/layout").auth(viewer, { type: "bearer" }).expect(200)).body);
  // A probe on each of five different benches, none shared.
  const seen = new Set<number>();
  probes = server.credentials.filter((c) => c.kind !== "medium" && !seen.has(c.benchId) && seen.add(c.benchId)).slice(0, 5);
  expect(probes).toHaveLength(5);
  // No batch is on any bench yet: each test decides.
  expect(db().prepare("SELECT COUNT(*) AS n FROM batch").get()).toEqual({ n: 0 });
});

afterAll(async () => {
  await server.cleanup();
});

type Row = { quantity: Quantity; timeMs: number; value: number };

/**
 * Stores old readings of a probe on its bench the way ingest stores them: the readings
 * repository's insert, rollups in the same transaction. (MQTT refuses readings more than 7 days
 * old, and retention never deletes younger ones.)
 */
function store(probe: DemoSensorCredential, rows: Row[]): void {
  new ReadingsRepository(db()).insertReadings(rows.map((r) => ({ ...r, sensorId: probe.id, benchId: probe.benchId })));
}

/** Air temperature every 20 s at :15, :35 and :55 of each minute, for `hours` hours from `startMs`. */
function airSeries(startMs: number, hours: number): Row[] {
  return Array.from({ length: hours * 180 }, (_, k) => ({ quantity: "air.temperature", timeMs: startMs + 15_000 + k * 20_000, value: 22 + 2 * Math.sin(k / 7) + (k % 5) * 0.1 }));
}

function rawCount(benchId: number, fromMs: number, toMs: number, quantity = "air.temperature"): number {
  return (db().prepare("SELECT COUNT(*) AS n FROM reading WHERE bench_id = ? AND quantity = ? AND time_ms >= ? AND time_ms < ?").get(benchId, quantity, fromMs, toMs) as { n: number }).n;
}

async function chart(benchId: number, fromMs: number, toMs: number): Promise<SeriesPoint[]> {
  const res = await api()
    .get(`/api/benches/${benchId}/readings?quantity=air.temperature&from=${new Date(fromMs).toISOString()}&to=${new Date(toMs).toISOString()}`)
    .auth(viewer, { type: "bearer" })
    .expect(200);
  return benchReadingsResponseSchema.parse(res.body).series[0]!.points;
}

/** A bench's air temperature as its zone's chart (all benches in one statement) shows it. */
async function zoneChart(zoneId: number, benchId: number, fromMs: number, toMs: number): Promise<SeriesPoint[]> {
  const res = await api()
    .get(`/api/zones/${zoneId}/readings?quantity=air.temperature&from=${new Date(fromMs).toISOString()}&to=${new Date(toMs).toISOString()}`)
    .auth(viewer, { type: "bearer" })
    .expect(200);
  const bench = zoneReadingsResponseSchema.parse(res.body).benches.find((b) => b.bench.id === benchId)!;
  return bench.series.find((s) => s.quantity === "air.temperature")!.points;
}

/** What a chart says about its whole range: readings, lowest, highest, mean. */
function rangeSummary(points: SeriesPoint[]) {
  const count = points.reduce((n, p) => n + p.count, 0);
  return {
    count,
    min: Math.min(...points.map((p) => p.min)),
    max: Math.max(...points.map((p) => p.max)),
    mean: points.reduce((sum, p) => sum + p.mean * p.count, 0) / count,
  };
}

function expectSameChart(after: SeriesPoint[], before: SeriesPoint[]): void {
  expect(after.map((p) => [p.timeMs, p.count, p.min, p.max])).toEqual(before.map((p) => [p.timeMs, p.count, p.min, p.max]));
  // Means are sums over counts added in another order (rollups instead of raw values).
  after.forEach((p, i) => expect(p.mean).toBeCloseTo(before[i]!.mean, 9));
}

function exportCsv(query: string) {
  return api().get(`/api/exports/readings.csv?${query}`).auth(viewer, { type: "bearer" });
}

describe("raw-reading retention", () => {
  it("when old readings have their rollups, then a pass deletes them and the chart and interval export of that range are unchanged", async () => {
    const probe = probes[0]!;
    const oldStartMs = hourOf(Date.now() - 40 * DAY_MS);
    const recentStartMs = hourOf(Date.now() - 2 * DAY_MS);
    const old = airSeries(oldStartMs, 3);
    store(probe, [...old, ...airSeries(recentStartMs, 1)]);
    expect(rawCount(probe.benchId, oldStartMs, oldStartMs + 3 * HOUR_MS)).toBe(540);

    // A range that starts and ends inside a minute (a chart reads those minutes raw while they
    // exist), in 1-minute buckets, and whole-minute ranges in 1-minute and 10-minute buckets.
    const edgeRange: [number, number] = [oldStartMs + 10_000, oldStartMs + 2 * HOUR_MS + 30 * MINUTE_MS + 58_000];
    const shortRange: [number, number] = [oldStartMs + 7 * MINUTE_MS, oldStartMs + 2 * HOUR_MS + 31 * MINUTE_MS];
    const longRange: [number, number] = [oldStartMs - DAY_MS, oldStartMs + 2 * DAY_MS];
    const edgeBefore = await chart(probe.benchId, ...edgeRange);
    const zoneId = layout.benches.find((b) => b.id === probe.benchId)!.zoneId;
    expect(await zoneChart(zoneId, probe.benchId, ...edgeRange)).toEqual(edgeBefore);
    const shortBefore = await chart(probe.benchId, ...shortRange);
    const longBefore = await chart(probe.benchId, ...longRange);
    const inside = (range: [number, number]) => old.filter((r) => r.timeMs >= range[0] && r.timeMs < range[1]);
    expect(rangeSummary(edgeBefore).count).toBe(inside(edgeRange).length);
    expect(rangeSummary(shortBefore).count).toBe(inside(shortRange).length);
    expect(rangeSummary(longBefore).count).toBe(540);
    const exportQuery = `benchId=${probe.benchId}&from=${oldStartMs}&to=${oldStartMs + 3 * HOUR_MS}`;
    const minutesBefore = (await exportCsv(`${exportQuery}&interval=1m`).expect(200)).text;
    const rawBefore = (await exportCsv(`${exportQuery}&interval=raw`).expect(200)).text;
    expect(rawBefore.trim().split("\r\n")).toHaveLength(1 + 540);

    const run = await server.retention.run();

    expect(run.cutoffMs).toBe(hourOf(Date.now() - RETENTION_DAYS * DAY_MS));
    expect(rawCount(probe.benchId, oldStartMs, oldStartMs + 3 * HOUR_MS)).toBe(0);
    expect(rawCount(probe.benchId, recentStartMs, recentStartMs + HOUR_MS)).toBe(180);
    // The minutes the edge range starts and ends in now come whole from their rollups, which (like
    // every rolled-up minute) go to the bucket their start falls in; the range says the same.
    const edgeAfter = rangeSummary(await chart(probe.benchId, ...edgeRange));
    const edgeWas = rangeSummary(edgeBefore);
    expect([edgeAfter.count, edgeAfter.min, edgeAfter.max]).toEqual([edgeWas.count, edgeWas.min, edgeWas.max]);
    expect(edgeAfter.mean).toBeCloseTo(edgeWas.mean, 9);
    const zoneAfter = rangeSummary(await zoneChart(zoneId, probe.benchId, ...edgeRange));
    expect([zoneAfter.count, zoneAfter.min, zoneAfter.max]).toEqual([edgeWas.count, edgeWas.min, edgeWas.max]);
    expectSameChart(await chart(probe.benchId, ...shortRange), shortBefore);
    expectSameChart(await chart(probe.benchId, ...longRange), longBefore);
    expect((await exportCsv(`${exportQuery}&interval=1m`).expect(200)).text).toBe(minutesBefore);

    // A raw export of that range says why it cannot be had, instead of an empty file.
    const refused = problemSchema.parse(JSON.parse((await exportCsv(`${exportQuery}&interval=raw`).expect(400)).text));
    expect(refused.code).toBe("raw-readings-not-kept");
    expect(refused.detail).toContain(`kept for ${RETENTION_DAYS} days`);
    expect(refused.errors?.[0]?.path).toBe("interval");
    // A recent range still exports raw.
    const recent = await exportCsv(`benchId=${probe.benchId}&from=${recentStartMs}&to=${recentStartMs + HOUR_MS}&interval=raw`).expect(200);
    expect(recent.text.trim().split("\r\n")).toHaveLength(1 + 180);

    const metrics = (await api().get("/metrics").expect(200)).text;
    const deleted = Number(/^benchwarden_retention_deleted_readings_total (\d+)$/m.exec(metrics)?.[1]);
    expect(deleted).toBeGreaterThanOrEqual(540);
    expect(deleted).toBe(server.metrics.retentionDeleted.get());
  });

  it("when an hour's rollups are missing, short of its raw readings, disagree between tiers or are stale, then its readings are kept", async () => {
    const probe = probes[1]!;
    const b = probe.benchId;
    const h = Array.from({ length: 5 }, (_, i) => hourOf(Date.now() - 40 * DAY_MS) + i * HOUR_MS);
    store(probe, airSeries(h[0]!, 5));
    const key = { b, q: "air.temperature" };
    // h1: one minute's 1-minute rollup is missing.
    db().prepare("DELETE FROM reading_rollup WHERE bench_id = @b AND quantity = @q AND resolution_ms = 60000 AND start_ms = @m").run({ ...key, m: h[1]! + 7 * MINUTE_MS });
    // h2: marked stale (a back-dated move re-filed readings; the rollups wait for a rebuild).
    db().prepare("INSERT INTO reading_rollup_stale (bench_id, quantity, hour_ms) VALUES (@b, @q, @h)").run({ ...key, h: h[2]! });
    // h3: a reading written behind the ingest's back, without its rollups.
    db().prepare("INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id) VALUES (@s, @q, @t, 23.5, @b)").run({ ...key, s: probe.id, t: h[3]! + 5 * MINUTE_MS + 1_000 });
    // h4: the 1-hour rollup no longer agrees with the minutes.
    db().prepare("UPDATE reading_rollup SET count = count - 1 WHERE bench_id = @b AND quantity = @q AND resolution_ms = 3600000 AND start_ms = @h").run({ ...key, h: h[4]! });
    const before = h.map((hourMs) => rawCount(b, hourMs, hourMs + HOUR_MS));
    expect(before).toEqual([180, 180, 180, 181, 180]);

    const run = await server.retention.run();

    // h0 had whole rollups and went; every other hour stays as it was.
    expect(h.map((hourMs) => rawCount(b, hourMs, hourMs + HOUR_MS))).toEqual([0, 180, 180, 181, 180]);
    expect(run.keptForRollups).toBeGreaterThanOrEqual(4);
  });

  it("when a batch is on a bench, then its readings are kept while it is open and for the retention after it closes; readings outside its placements go", async () => {
    const [first, second] = [probes[2]!, probes[3]!];
    const nowMs = Date.now();
    // Stuck 30 days ago on the first bench, moved to the second 20 days ago.
    const stuckOn = addDays(localDate(nowMs, TZ), -30)!;
    const created = await api()
      .post("/api/batches")
      .auth(grower, { type: "bearer" })
      .send({ variety: "Fig 'Retention Test'", stuckOn, countStuck: 40, benchId: first.benchId })
      .expect(201);
    const batch: BatchView = batchResponseSchema.parse(created.body).batch;
    const movedAtMs = nowMs - 20 * DAY_MS;
    await api().post(`/api/batches/${batch.id}/move`).auth(grower, { type: "bearer" }).send({ benchId: second.benchId, effectiveAtMs: movedAtMs }).expect(200);

    // On the first bench: an hour before the batch came (gone), one during its stay (kept), one
    // after it left (gone). On the second: one during its stay there (kept).
    const beforeBatch = hourOf(nowMs - 45 * DAY_MS);
    const duringFirst = hourOf(nowMs - 25 * DAY_MS);
    const afterLeaving = hourOf(nowMs - 15 * DAY_MS);
    const duringSecond = hourOf(nowMs - 12 * DAY_MS);
    store(first, [...airSeries(beforeBatch, 1), ...airSeries(duringFirst, 1), ...airSeries(afterLeaving, 1)]);
    store(second, airSeries(duringSecond, 1));
    const counts = () => [rawCount(first.benchId, beforeBatch, beforeBatch + HOUR_MS), rawCount(first.benchId, duringFirst, duringFirst + HOUR_MS), rawCount(first.benchId, afterLeaving, afterLeaving + HOUR_MS), rawCount(second.benchId, duringSecond, duringSecond + HOUR_MS)];
    expect(counts()).toEqual([180, 180, 180, 180]);

    const openRun = await server.retention.run();
    expect(counts()).toEqual([0, 180, 0, 180]);
    expect(openRun.keptForBatches).toBeGreaterThanOrEqual(2);

    // Closed today: the report of its life still reads every reading.
    await api().post(`/api/batches/${batch.id}/close`).auth(grower, { type: "bearer" }).send({ outcome: "potted-on", rootedCount: 30, lostCount: 10 }).expect(200);
    await server.retention.run();
    expect(counts()).toEqual([0, 180, 0, 180]);

    // Closed longer ago than the retention: its readings go like any others.
    db().prepare("UPDATE batch SET closed_at_ms = ? WHERE id = ?").run(nowMs - (RETENTION_DAYS + 1) * DAY_MS, batch.id);
    await server.retention.run();
    expect(counts()).toEqual([0, 0, 0, 0]);
  });

  it("deletes in transactions of at most READING_RETENTION_CHUNK_ROWS readings, and ingest commits between them", async () => {
    const probe = probes[4]!;
    const startMs = hourOf(Date.now() - 30 * DAY_MS);
    const quantities: Quantity[] = ["air.temperature", "air.humidity", "medium.temperature", "medium.moisture", "battery"];
    const perQuantity = 30_000 / quantities.length;
    const values: Record<Quantity, number> = { "air.temperature": 23, "air.humidity": 80, "medium.temperature": 23, "medium.moisture": 0.45, battery: 90 };
    store(
      probe,
      Array.from({ length: perQuantity }, (_, k) => quantities.map((quantity) => ({ quantity, timeMs: startMs + 15_000 + k * 5_000, value: values[quantity] }))).flat(),
    );
    const total = perQuantity * quantities.length;
    const endMs = startMs + 15_000 + perQuantity * 5_000;

    // A second connection to the same file sees each committed chunk (WAL readers see commits).
    const observer = new Database(join(server.dir, "benchwarden.sqlite"), { readonly: true });
    const count = observer.prepare("SELECT COUNT(*) AS n FROM reading WHERE bench_id = ? AND time_ms >= ? AND time_ms < ?");
    const observe = () => (count.get(probe.benchId, startMs, endMs) as { n: number }).n;
    const seen = [observe()];
    expect(seen[0]).toBe(total);
    let watching = true;
    const watch = () => {
      const n = observe();
      if (n !== seen.at(-1)) seen.push(n);
      if (watching) setImmediate(watch);
    };
    const client = await connectSensor(server, probe);

    setImmediate(watch);
    let runEnded = false;
    const running = server.retention.run().finally(() => (runEnded = true));
    // A live reading published while the pass runs is stored and acknowledged before it ends.
    await client.publishAsync(`benchwarden/v1/sensors/${probe.id}/readings`, JSON.stringify([{ n: `${probe.id}:air.temperature`, u: "Cel", v: 24, t: Date.now() / 1000 }]), { qos: 1 });
    const ackedDuringRun = !runEnded;
    const run = await running;
    watching = false;
    await client.endAsync();
    seen.push(observe());
    observer.close();

    expect(seen.at(-1)).toBe(0);
    const drops = seen.slice(1).map((n, i) => seen[i]! - n);
    expect(Math.max(...drops)).toBeLessThanOrEqual(CHUNK_ROWS);
    expect(drops.filter((d) => d > 0).length).toBeGreaterThanOrEqual(Math.ceil(total / CHUNK_ROWS));
    expect(run.largestChunkRows).toBeLessThanOrEqual(CHUNK_ROWS);
    expect(run.chunks).toBeGreaterThanOrEqual(Math.ceil(total / CHUNK_ROWS));
    expect(ackedDuringRun).toBe(true);
  });
});

describe("retention configuration", () => {
  it("when READING_RETENTION_DAYS or READING_RETENTION_CHUNK_ROWS is bad, then parsing names the key and the value given", () => {
    // Shorter than 8 days could delete raw readings a back-dated probe move (up to 7 days) would re-file.
    for (const bad of ["3", "7", "-1", "7.5", "forever", "40000"]) {
      expect(() => parseEnv({ READING_RETENTION_DAYS: bad })).toThrow(ConfigError);
      expect(() => parseEnv({ READING_RETENTION_DAYS: bad })).toThrow(new RegExp(`READING_RETENTION_DAYS: .*\\(got "${bad}"\\)`));
    }
    expect(() => parseEnv({ READING_RETENTION_CHUNK_ROWS: "50" })).toThrow(/READING_RETENTION_CHUNK_ROWS: .*\(got "50"\)/);
    expect(parseEnv({}).READING_RETENTION_DAYS).toBe(400);
    expect(parseEnv({ READING_RETENTION_DAYS: "0" }).READING_RETENTION_DAYS).toBe(0);
    expect(parseEnv({ READING_RETENTION_DAYS: "8" }).READING_RETENTION_DAYS).toBe(8);
  });
});
