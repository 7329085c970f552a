import { randomUUID } from "node:crypto";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../shared/api-error.js";
import { addDays, localDate, localTimeToMs } from "../../shared/domain/batch-calendar.js";
import { batchResponseSchema, benchObservationsResponseSchema, type BatchView } from "../../shared/schemas/batches.js";
import { benchViewSchema, layoutResponseSchema, type LayoutResponse } from "../../shared/schemas/layout.js";
import type { Quantity } from "../../shared/schemas/quantities.js";
import { MAX_SERIES_POINTS, benchReadingsResponseSchema, zoneReadingsResponseSchema, type BenchReadingsResponse } from "../../shared/schemas/readings.js";
import { createReadingStore } from "../../server/modules/readings/reading-store.js";
import type { ReadingRow } from "../../server/modules/readings/readings.repository.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

/**
 * The history charts' data (issue 7 §5) over HTTP against the real server: a zone's series in one
 * request, read from the rollups, the same as each bench's own; and the walk-through observations
 * placed on the bench each batch stood on when it was seen.
 */
let server: TestServer;
const token = {} as Record<"manager" | "grower" | "viewer", string>;
let layout: LayoutResponse;
const TZ = "America/Chicago"; // the demo site's
const MINUTE_MS = 60_000;
const DAY_MS = 86_400_000;

beforeAll(async () => {
  server = await startTestServer({ ALERT_TICK: "1h" });
  for (const role of ["manager", "grower", "viewer"] as const) token[role] = await signIn(server, role);
  layout = layoutResponseSchema.parse((await api("get", "/api/layout", "viewer").expect(200)).body);
});

afterAll(async () => {
  await server.cleanup();
});

function api(method: "get" | "post", path: string, role: keyof typeof token) {
  return request(server.baseUrl)[method](path).auth(token[role], { type: "bearer" });
}

function problem(res: request.Response) {
  expect(res.headers["content-type"]).toMatch(/application\/problem\+json/);
  return problemSchema.parse(JSON.parse(res.text));
}

const benchesOf = (zoneId: number) => layout.benches.filter((b) => b.zoneId === zoneId).sort((a, b) => a.position - b.position);

/** A bench's series as the bench page asks for it, over the same from/to. */
async function benchSeries(benchId: number, fromMs: number, toMs: number): Promise<BenchReadingsResponse> {
  return benchReadingsResponseSchema.parse((await api("get", `/api/benches/${benchId}/readings?from=${fromMs}&to=${toMs}`, "viewer").expect(200)).body);
}

/** Same buckets and counts; min, max and mean equal up to the order the sums were added in. */
function expectSameSeries(actual: BenchReadingsResponse, expected: BenchReadingsResponse) {
  expect({ ...actual, series: [] }).toEqual({ ...expected, series: [] });
  expect(actual.series.map((s) => s.quantity)).toEqual(expected.series.map((s) => s.quantity));
  actual.series.forEach((s, i) => {
    const own = expected.series[i]!.points;
    expect(s.points.map((p) => [p.timeMs, p.count])).toEqual(own.map((p) => [p.timeMs, p.count]));
    s.points.forEach((p, j) => {
      expect(p.min).toBe(own[j]!.min);
      expect(p.max).toBe(own[j]!.max);
      expect(p.mean).toBeCloseTo(own[j]!.mean, 9);
    });
  });
}

describe("a zone's series in one request", () => {
  let zoneId: number;
  let endMs: number;

  beforeAll(async () => {
    zoneId = layout.zones[0]!.id;
    endMs = Math.floor(Date.now() / MINUTE_MS) * MINUTE_MS;
    // A month of one-minute readings on every bench of the zone, written through the ingest's own
    // storage call (readings and their rollups in one transaction per batch, as ingest does; the
    // broker refuses readings more than 7 days old).
    const repository = createReadingStore(server.dataSource);
    const quantities: Record<string, Quantity[]> = {
      air: ["air.temperature", "air.humidity"],
      medium: ["medium.temperature", "medium.moisture"],
      combined: ["air.temperature", "air.humidity", "medium.temperature", "medium.moisture"],
    };
    const base: Record<string, number> = { "air.temperature": 23.5, "air.humidity": 80, "medium.temperature": 22.5, "medium.moisture": 0.45 };
    const swing: Record<string, number> = { "air.temperature": 2.2, "air.humidity": -6, "medium.temperature": 0.8, "medium.moisture": 0.05 };
    const probes = server.credentials.filter((c) => benchesOf(zoneId).some((b) => b.id === c.benchId));
    let rows: ReadingRow[] = [];
    for (let t = endMs - 30 * DAY_MS; t < endMs - 10 * MINUTE_MS; t += MINUTE_MS) {
      const day = Math.sin((2 * Math.PI * (t % DAY_MS)) / DAY_MS);
      for (const [i, probe] of probes.entries()) {
        for (const quantity of quantities[probe.kind]!) rows.push({ sensorId: probe.id, benchId: probe.benchId, quantity, timeMs: t, value: base[quantity]! + swing[quantity]! * day + i * 0.1 });
      }
      if (rows.length >= 5000) {
        await repository.insertReadings(rows);
        rows = [];
      }
    }
    await repository.insertReadings(rows);
    // The last minutes through the broker, as a probe sends them (the raw end of the range).
    const probe = probes.find((p) => p.kind === "combined")!;
    const client = await connectSensor(server, probe);
    const pack = Array.from({ length: 5 }, (_, i) => ({ n: `${probe.id}:air.temperature`, u: "Cel", v: 24 + i / 10, t: (endMs - (5 - i) * MINUTE_MS + 7000) / 1000 }));
    await client.publishAsync(`benchwarden/v1/sensors/${probe.id}/readings`, JSON.stringify(pack), { qos: 1 });
    await client.endAsync();
  }, 120_000);

  it("answers every bench in use of the zone, in walking order, each exactly as its own series, at most 500 points per series", async () => {
    const benches = benchesOf(zoneId);
    const timings: Record<string, number> = {};
    for (const [label, fromMs, toMs] of [
      ["24h", endMs - DAY_MS + 17_000, endMs + 17_000],
      ["7d", endMs - 7 * DAY_MS, endMs],
      ["30d", endMs - 30 * DAY_MS + 17_000, endMs + 17_000],
    ] as const) {
      const started = performance.now();
      const zone = zoneReadingsResponseSchema.parse((await api("get", `/api/zones/${zoneId}/readings?from=${new Date(fromMs).toISOString()}&to=${new Date(toMs).toISOString()}`, "viewer").expect(200)).body);
      timings[`zone${label}Ms`] = Math.round(performance.now() - started);
      expect(zone.zone).toEqual({ id: zoneId, name: layout.zones[0]!.name, siteName: layout.sites[0]!.name });
      expect(zone.benches.map((b) => b.bench.id)).toEqual(benches.map((b) => b.id));
      expect([zone.fromMs, zone.toMs]).toEqual([fromMs, toMs]);
      const startedBenches = performance.now();
      const own = await Promise.all(benches.map((b) => benchSeries(b.id, fromMs, toMs)));
      timings[`benchByBench${label}Ms`] = Math.round(performance.now() - startedBenches);
      zone.benches.forEach((b, i) => expectSameSeries(b, own[i]!));
      for (const b of zone.benches) {
        expect(b.bucketMs).toBe(zone.bucketMs);
        for (const s of b.series.filter((x) => x.quantity !== "battery")) {
          expect(s.points.length).toBeGreaterThan(0);
          expect(s.points.length).toBeLessThanOrEqual(MAX_SERIES_POINTS);
        }
      }
      if (label === "30d") {
        // 30 days into 500 buckets → 2-hour buckets of 120 one-minute readings each.
        expect(zone.bucketMs).toBe(2 * 3_600_000);
        expect(zone.benches[0]!.series.find((s) => s.quantity === "air.temperature")!.points[5]!.count).toBe(120);
      }
    }
    // The raw end: the minutes the combined probe published are in the newest bucket.
    const day = zoneReadingsResponseSchema.parse((await api("get", `/api/zones/${zoneId}/readings?quantity=air.temperature`, "viewer").expect(200)).body);
    const combined = server.credentials.find((c) => c.kind === "combined" && benches.some((b) => b.id === c.benchId))!;
    const newest = day.benches.find((b) => b.bench.id === combined.benchId)!.series[0]!.points.at(-1)!;
    expect(newest.max).toBeCloseTo(24.4, 9);
    expect(day.toMs - day.fromMs).toBe(DAY_MS); // the last 24 h by default
    expect(day.benches.every((b) => b.series.length === 1 && b.series[0]!.quantity === "air.temperature")).toBe(true);
    console.log(JSON.stringify({ zoneSeries: { benches: benches.length, ...timings } }));
  });

  it("takes a new bench at the end of the walking order and leaves it out once archived (its history stays on its own page)", async () => {
    const zoneThree = layout.zones[2]!.id;
    const ids = async () => zoneReadingsResponseSchema.parse((await api("get", `/api/zones/${zoneThree}/readings`, "viewer").expect(200)).body).benches.map((b) => b.bench.id);
    const before = await ids();
    expect(before).toEqual(benchesOf(zoneThree).map((b) => b.id));
    const created = benchViewSchema.parse((await api("post", "/api/benches", "manager").send({ zoneId: zoneThree, name: "Bench 5" }).expect(201)).body.bench);
    expect(await ids()).toEqual([...before, created.id]);
    await api("post", `/api/benches/${created.id}/archive`, "manager").send({}).expect(200);
    expect(await ids()).toEqual(before);
  });

  it("refuses what it cannot answer with problem details: an unknown zone, a range backwards or over 400 days, no sign-in", async () => {
    expect(problem(await api("get", "/api/zones/999999/readings", "viewer").expect(404)).code).toBe("zone-not-found");
    expect(problem(await api("get", "/api/zones/abc/readings", "viewer").expect(400)).errors?.[0]?.path).toBe("id");
    const backwards = problem(await api("get", `/api/zones/${zoneId}/readings?from=${endMs}&to=${endMs - DAY_MS}`, "viewer").expect(400));
    expect(backwards.errors).toContainEqual({ path: "from", message: "'from' must be before 'to'" });
    expect(problem(await api("get", `/api/zones/${zoneId}/readings?from=${endMs - 401 * DAY_MS}&to=${endMs}`, "viewer").expect(400)).code).toBe("range-too-long");
    expect(problem(await api("get", `/api/zones/${zoneId}/readings?quantity=wind`, "viewer").expect(400)).errors?.[0]?.path).toBe("quantity");
    await request(server.baseUrl).get(`/api/zones/${zoneId}/readings`).expect(401);
  });
});

describe("observations on the history charts", () => {
  let batch: BatchView;
  let other: BatchView;
  let today: string;
  let moveAtMs: number;
  const zone = () => layout.zones[1]!;
  const bench = (n: number) => benchesOf(zone().id)[n]!;

  async function observe(batchId: number, body: Record<string, unknown>) {
    await api("post", `/api/batches/${batchId}/observations`, "grower").send({ clientId: randomUUID(), ...body }).expect(201);
  }

  async function markers(query: string) {
    return benchObservationsResponseSchema.parse((await api("get", `/api/observations?${query}`, "viewer").expect(200)).body);
  }

  beforeAll(async () => {
    today = localDate(Date.now(), TZ);
    const create = async (variety: string, benchId: number, stuckOn: string) =>
      batchResponseSchema.parse((await api("post", "/api/batches", "grower").send({ variety, stuckOn, countStuck: 60, benchId }).expect(201)).body).batch;
    batch = await create("Copper Lantern", bench(0).id, addDays(today, -6)!);
    other = await create("Saltmarsh Black", bench(2).id, addDays(today, -6)!);
    // Seen four days ago (entered today: only the date is known), moved to bench 2 two days ago, seen again now.
    await observe(batch.id, { observedOn: addDays(today, -4), stage: "callused", flags: ["medium-too-wet"], note: "Tops of the pots damp" });
    moveAtMs = Date.now() - 2 * DAY_MS;
    await api("post", `/api/batches/${batch.id}/move`, "grower").send({ benchId: bench(1).id, effectiveAtMs: moveAtMs }).expect(200);
    await observe(batch.id, { stage: "root-initials", rootedCount: 4, lostCount: 1, flags: ["mould", "rot"] });
    await observe(other.id, { stage: "callused" });
  });

  it("places each observation on the bench its batch stood on when it was seen: a date-only one at local noon of its date", async () => {
    const fromMs = Date.now() - 7 * DAY_MS;
    const toMs = Date.now() + MINUTE_MS;
    const first = await markers(`benchId=${bench(0).id}&fromMs=${fromMs}&toMs=${toMs}`);
    expect(first.isTruncated).toBe(false);
    expect(first.observations).toHaveLength(1);
    expect(first.observations[0]).toMatchObject({
      batchId: batch.id,
      variety: "Copper Lantern",
      countStuck: 60,
      benchId: bench(0).id,
      benchName: bench(0).name,
      observedOn: addDays(today, -4),
      isDateOnly: true,
      timeMs: localTimeToMs(addDays(today, -4)!, 12 * 60, TZ),
      stage: "callused",
      flags: ["medium-too-wet"],
      note: "Tops of the pots damp",
      recordedByName: "Marisol Ortega",
    });

    const second = await markers(`benchId=${bench(1).id}&fromMs=${fromMs}&toMs=${toMs}`);
    expect(second.observations).toHaveLength(1);
    expect(second.observations[0]).toMatchObject({ benchId: bench(1).id, stage: "root-initials", rootedCount: 4, lostCount: 1, flags: ["mould", "rot"], isDateOnly: false });
    expect(second.observations[0]!.timeMs).toBeGreaterThan(moveAtMs);
    expect(second.observations[0]!.timeMs).toBeLessThanOrEqual(Date.now());

    // The zone: all three, oldest first, each with its bench.
    const all = await markers(`zoneId=${zone().id}&fromMs=${fromMs}&toMs=${toMs}`);
    expect(all.observations.map((o) => [o.variety, o.benchId, o.stage])).toEqual([
      ["Copper Lantern", bench(0).id, "callused"],
      ["Copper Lantern", bench(1).id, "root-initials"],
      ["Saltmarsh Black", bench(2).id, "callused"],
    ]);
    // Another zone's benches saw none of it.
    expect((await markers(`zoneId=${layout.zones[0]!.id}&fromMs=${fromMs}&toMs=${toMs}`)).observations).toEqual([]);
  });

  it("keeps to the range and the limit: the newest are kept and the answer says some were left out", async () => {
    const lastDay = await markers(`zoneId=${zone().id}&fromMs=${Date.now() - DAY_MS}&toMs=${Date.now() + MINUTE_MS}`);
    expect(lastDay.observations.map((o) => o.variety)).toEqual(["Copper Lantern", "Saltmarsh Black"]);
    const limited = await markers(`zoneId=${zone().id}&fromMs=${Date.now() - 7 * DAY_MS}&toMs=${Date.now() + MINUTE_MS}&limit=2`);
    expect(limited.isTruncated).toBe(true);
    expect(limited.observations.map((o) => o.stage)).toEqual(["root-initials", "callused"]);
  });

  it("refuses a query it cannot answer with problem details naming the field", async () => {
    const now = Date.now();
    expect(problem(await api("get", `/api/observations?fromMs=${now - DAY_MS}&toMs=${now}`, "viewer").expect(400)).errors).toContainEqual({ path: "benchId", message: "Give either benchId or zoneId" });
    expect(problem(await api("get", `/api/observations?benchId=1&zoneId=1&fromMs=${now - DAY_MS}&toMs=${now}`, "viewer").expect(400)).errors?.[0]?.path).toBe("benchId");
    expect(problem(await api("get", `/api/observations?benchId=1&fromMs=${now}&toMs=${now - DAY_MS}`, "viewer").expect(400)).errors).toContainEqual({ path: "fromMs", message: "'fromMs' must be before 'toMs'" });
    expect(problem(await api("get", `/api/observations?benchId=1&fromMs=${now - 401 * DAY_MS}&toMs=${now}`, "viewer").expect(400)).errors?.[0]?.message).toBe("Ask for at most 400 days at a time");
    expect(problem(await api("get", `/api/observations?benchId=1&toMs=${now}`, "viewer").expect(400)).errors?.[0]?.path).toBe("fromMs");
    expect(problem(await api("get", `/api/observations?benchId=999999&fromMs=${now - DAY_MS}&toMs=${now}`, "viewer").expect(404)).code).toBe("bench-not-found");
    expect(problem(await api("get", `/api/observations?zoneId=999999&fromMs=${now - DAY_MS}&toMs=${now}`, "viewer").expect(404)).code).toBe("zone-not-found");
  });
});
