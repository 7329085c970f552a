import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { dewPointC, vapourPressureDeficitKPa } from "../../shared/domain/psychrometrics.js";
import type { Period } from "../../shared/domain/time-in-window.js";
import { BenchEnvironment } from "../../server/modules/reports/bench-environment.js";
import { startPostgres, type Postgres } from "../support/postgres.js";
import { insertReadings, roughly, seedLayout, twinDatabases, type TestReading, type TwinDatabases } from "../support/twin-databases.js";

/**
 * BenchEnvironment (reports, walk-through cards) on PostgreSQL: the same readings on both databases
 * give the same counts, series, extremes and dew-point / VPD pairs.
 */
const MINUTE_MS = 60_000;
const HOUR_MS = 60 * MINUTE_MS;
const GAP_LIMIT_MS = 20 * MINUTE_MS;
const T0_MS = Date.UTC(2026, 0, 10);
const at = (minute: number) => T0_MS + minute * MINUTE_MS;

let server: Postgres;
let twins: TwinDatabases;
let benchId: number;
let emptyBenchId: number;
let readings: TestReading[];
let environments: { sqlite: BenchEnvironment; postgres: BenchEnvironment };

/**
 * A day on one bench: a combined probe (air temperature and humidity in one pack every minute,
 * silent for 45 minutes from 10:00) and, for the first 12 hours, an air probe reporting at the same
 * instants. The lowest and highest air temperature each occur twice.
 */
function day(bench: number): TestReading[] {
  const rows: TestReading[] = [];
  for (let k = 0; k < 24 * 60; k++) {
    if (k >= 600 && k < 645) continue;
    let tC = 20 + 4 * Math.sin(k / 50) + (k % 7) * 0.05;
    if (k === 100 || k === 200) tC = 10;
    if (k === 150 || k === 300) tC = 35;
    rows.push({ sensorId: "combo-1", quantity: "air.temperature", timeMs: at(k), value: tC, benchId: bench });
    rows.push({ sensorId: "combo-1", quantity: "air.humidity", timeMs: at(k), value: 70 + 20 * Math.sin(k / 80), benchId: bench });
    if (k < 12 * 60) rows.push({ sensorId: "air-2", quantity: "air.temperature", timeMs: at(k), value: 21 + Math.cos(k / 30), benchId: bench });
  }
  return rows;
}

beforeAll(async () => {
  server = await startPostgres();
  twins = await twinDatabases(server);
  const layouts = await Promise.all(twins.both.map((ds) => seedLayout(ds, 2)));
  expect(layouts[1]).toEqual(layouts[0]);
  [benchId, emptyBenchId] = layouts[0]!.benches.map((b) => b.id) as [number, number];
  readings = day(benchId);
  for (const ds of twins.both) await insertReadings(ds, readings);
  environments = { sqlite: new BenchEnvironment(twins.sqlite, GAP_LIMIT_MS), postgres: new BenchEnvironment(twins.postgres, GAP_LIMIT_MS) };
}, 120_000);

afterAll(async () => {
  await twins?.destroy();
  await server?.cleanup();
});

/** What each database's BenchEnvironment answers, and that the two agree. */
async function onBoth<T>(ask: (environment: BenchEnvironment) => Promise<T>): Promise<T> {
  const fromSqlite = await ask(environments.sqlite);
  const fromPostgres = await ask(environments.postgres);
  expect(roughly(fromPostgres)).toEqual(roughly(fromSqlite));
  return fromPostgres;
}

const wholeDay: Period = { fromMs: T0_MS, toMs: T0_MS + 24 * HOUR_MS };
// Starts and ends inside a minute, and covers the silence.
const midDay: Period = { fromMs: at(90) + 30_000, toMs: at(700) + 15_000 };

describe("BenchEnvironment on PostgreSQL", () => {
  it("extremes: exact lowest and highest with the earliest time of a tie, and the count; null without readings", async () => {
    const extremes = await onBoth((e) => e.extremes(benchId, "air.temperature", wholeDay));
    const airTemperatures = readings.filter((r) => r.quantity === "air.temperature");
    expect(extremes).toEqual({ min: { value: 10, timeMs: at(100) }, max: { value: 35, timeMs: at(150) }, count: airTemperatures.length });

    const inside = await onBoth((e) => e.extremes(benchId, "air.humidity", midDay));
    expect(inside?.count).toBe(readings.filter((r) => r.quantity === "air.humidity" && r.timeMs >= midDay.fromMs && r.timeMs < midDay.toMs).length);

    expect(await onBoth((e) => e.extremes(emptyBenchId, "air.temperature", wholeDay))).toBeNull();
    expect(await onBoth((e) => e.extremes(benchId, "medium.moisture", wholeDay))).toBeNull();
  });

  it("series: every reading in time order (two probes at one instant in sensor order) when few enough, else bucket means", async () => {
    const raw = await onBoth((e) => e.series(benchId, "air.temperature", midDay, 5000));
    const expected = readings
      .filter((r) => r.quantity === "air.temperature" && r.timeMs >= midDay.fromMs - GAP_LIMIT_MS && r.timeMs < midDay.toMs + GAP_LIMIT_MS)
      .sort((a, b) => a.timeMs - b.timeMs || a.sensorId.localeCompare(b.sensorId))
      .map((r) => ({ timeMs: r.timeMs, value: r.value }));
    expect(raw.sampled).toBe(false);
    expect(raw.samples).toEqual(expected);

    const bucketed = await onBoth((e) => e.series(benchId, "air.temperature", wholeDay, 100));
    expect(bucketed.sampled).toBe(true);
    // 24 h 40 min in at most 100 buckets of whole minutes: 15-minute buckets; the silence leaves gaps.
    const bucketMs = 15 * MINUTE_MS;
    const firstMs = wholeDay.fromMs - GAP_LIMIT_MS;
    expect(bucketed.samples.every((s) => (s.timeMs - firstMs) % bucketMs === 0)).toBe(true);
    expect(bucketed.samples.length).toBeLessThanOrEqual(100);
    expect(bucketed.samples.length).toBeGreaterThan(90);
    const bucketOf = (ms: number) => Math.floor((ms - firstMs) / bucketMs);
    const firstBucket = readings.filter((r) => r.quantity === "air.temperature" && bucketOf(r.timeMs) === bucketOf(T0_MS));
    const mean = firstBucket.reduce((sum, r) => sum + r.value, 0) / firstBucket.length;
    expect(bucketed.samples.find((s) => s.timeMs === firstMs + bucketOf(T0_MS) * bucketMs)!.value).toBeCloseTo(mean, 9);
  });

  it("time in window: the same inside, below, above and no-data time, raw and sampled", async () => {
    const window = { min: 18, max: 23 };
    const raw = await onBoth((e) => e.timeInWindow(benchId, "air.temperature", window, midDay, 5000));
    expect(raw.sampled).toBe(false);
    expect(raw.result.noDataMs).toBeGreaterThan(0); // the 45-minute silence is longer than the gap limit
    expect(raw.result.belowMs).toBeGreaterThan(0);
    expect(raw.result.aboveMs).toBeGreaterThan(0);
    expect(raw.result.insideMs + raw.result.belowMs + raw.result.aboveMs + raw.result.noDataMs).toBeCloseTo(midDay.toMs - midDay.fromMs, 3);

    const sampled = await onBoth((e) => e.timeInWindow(benchId, "air.temperature", window, wholeDay, 50));
    expect(sampled.sampled).toBe(true);
    expect(await onBoth((e) => e.timeInWindow(emptyBenchId, "air.humidity", null, wholeDay, 50))).toMatchObject({ sampled: false, result: { noDataMs: 24 * HOUR_MS } });
  });

  it("dew point and VPD from each probe's paired air readings; bucket means per probe when too many", async () => {
    const air = await onBoth((e) => e.airMoisture(benchId, midDay, 5000));
    const humidity = new Map(readings.filter((r) => r.quantity === "air.humidity").map((r) => [`${r.sensorId}@${r.timeMs}`, r.value]));
    const pairs = readings
      .filter((r) => r.quantity === "air.temperature" && r.timeMs >= midDay.fromMs && r.timeMs < midDay.toMs && humidity.has(`${r.sensorId}@${r.timeMs}`))
      .map((r) => ({ timeMs: r.timeMs, tC: r.value, rhPct: humidity.get(`${r.sensorId}@${r.timeMs}`)! }));
    expect(air.pairCount).toBe(pairs.length);
    expect(air.sampled).toBe(false);
    const dew = pairs.map((p) => ({ timeMs: p.timeMs, value: dewPointC(p.tC, p.rhPct)! }));
    const lowestDew = dew.reduce((a, b) => (b.value < a.value ? b : a));
    expect(air.dewPoint!.min.timeMs).toBe(lowestDew.timeMs);
    expect(air.dewPoint!.min.value).toBeCloseTo(lowestDew.value, 9);
    const highestVpd = pairs.map((p) => ({ timeMs: p.timeMs, value: vapourPressureDeficitKPa(p.tC, p.rhPct)! })).reduce((a, b) => (b.value > a.value ? b : a));
    expect(air.vpd!.max.timeMs).toBe(highestVpd.timeMs);
    expect(air.vpd!.max.value).toBeCloseTo(highestVpd.value, 9);

    const sampled = await onBoth((e) => e.airMoisture(benchId, wholeDay, 50));
    expect(sampled.sampled).toBe(true);
    expect(sampled.pairCount).toBe(readings.filter((r) => r.quantity === "air.humidity").length);
    expect(await onBoth((e) => e.airMoisture(emptyBenchId, wholeDay, 50))).toEqual({ pairCount: 0, dewPoint: null, vpd: null, dewPointMargin: null, sampled: false });
  });
});
