import { randomUUID } from "node:crypto";
import request from "supertest";
import { In } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../shared/api-error.js";
import { addDays, localDate } from "../../shared/domain/batch-calendar.js";
import { auditResponseSchema } from "../../shared/schemas/audit.js";
import {
  batchesResponseSchema,
  batchResponseSchema,
  createObservationResponseSchema,
  observationsResponseSchema,
  strikeRateReportSchema,
  type BatchView,
} from "../../shared/schemas/batches.js";
import { layoutResponseSchema, type LayoutResponse } from "../../shared/schemas/layout.js";
import { ObservationEntity } from "../../server/db/entities/observation.entity.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";
import { insertReadings } from "../support/twin-databases.js";

/** Batches, observations and the strike-rate reports (issue 6 §1, §2, §6). */
let server: TestServer;
let grower: string;
let manager: string;
let viewer: string;
let layout: LayoutResponse;
const TZ = "America/Chicago"; // the demo site's
let today: string;
let yesterday: string;

const api = () => request(server.baseUrl);
const bench = (zone: number, n: number) => layout.benches.filter((b) => b.zoneId === layout.zones[zone]!.id)[n]!;

async function createBatch(body: Record<string, unknown>, token = grower): Promise<BatchView> {
  const res = await api().post("/api/batches").auth(token, { type: "bearer" }).send(body).expect(201);
  return batchResponseSchema.parse(res.body).batch;
}

async function observe(batchId: number, body: Record<string, unknown>, status = 201) {
  const res = await api().post(`/api/batches/${batchId}/observations`).auth(grower, { type: "bearer" }).send({ clientId: randomUUID(), ...body }).expect(status);
  return res;
}

async function publish(credential: { id: string; secret: string }, pack: unknown[]): Promise<void> {
  const client = await connectSensor(server, credential);
  await client.publishAsync(`benchwarden/v1/sensors/${credential.id}/readings`, JSON.stringify(pack), { qos: 1 });
  await client.endAsync();
}

beforeAll(async () => {
  server = await startTestServer({ ALERT_TICK: "1h" });
  [grower, manager, viewer] = await Promise.all([signIn(server, "grower"), signIn(server, "manager"), signIn(server, "viewer")]);
  layout = layoutResponseSchema.parse((await api().get("/api/layout").auth(grower, { type: "bearer" }).expect(200)).body);
  today = localDate(Date.now(), TZ);
  yesterday = addDays(today, -1)!;
});

afterAll(async () => {
  await server.cleanup();
});

describe("batches", () => {
  let batch: BatchView;

  it("when a grower creates a batch with every field, then it is on its bench, stuck, with nothing counted yet, and audited", async () => {
    batch = await createBatch({
      variety: "Harbour Amber",
      woodSource: "Mother tree, row 4",
      stuckOn: addDays(today, -10),
      countStuck: 120,
      benchId: bench(0, 1).id,
      thicknessMm: 12.5,
      budsAboveMedium: 2,
      baseTreatments: ["scored", "hormone"],
      hormoneProduct: "IBA 3000 ppm talc",
      wrapping: "film",
      notes: "  Top cut sealed  ",
    });
    expect(batch).toMatchObject({
      variety: "Harbour Amber",
      status: "open",
      stage: "stuck",
      ageDays: 10,
      baseTreatments: ["scored", "hormone"],
      notes: "Top cut sealed",
      bench: { benchId: bench(0, 1).id, benchName: "Bench 2", zoneName: "House 1 · Fig cuttings", timeZone: TZ },
      tally: { stuck: 120, rooted: 0, lost: 0, pending: 120, strikeRate: 0, lossRate: 0, isFinal: false },
      daysToCallus: null,
      createdByName: expect.any(String),
    });
    expect(batch.placements).toHaveLength(1);
    expect(batch.placements[0]!.toMs).toBeNull();
    const audit = auditResponseSchema.parse((await api().get("/api/audit?entityType=batch").auth(viewer, { type: "bearer" }).expect(200)).body);
    expect(audit.entries[0]).toMatchObject({ entityType: "batch", action: "created", entityId: String(batch.id), benchId: bench(0, 1).id });
  });

  it("when the form breaks a rule, then the problem names the field", async () => {
    const base = { variety: "Harbour Amber", stuckOn: today, countStuck: 10, benchId: bench(0, 0).id };
    const hormone = problemSchema.parse((await api().post("/api/batches").auth(grower, { type: "bearer" }).send({ ...base, baseTreatments: ["hormone"] }).expect(400)).body);
    expect(hormone.errors).toContainEqual({ path: "hormoneProduct", message: expect.stringContaining("product and strength") });
    const future = problemSchema.parse((await api().post("/api/batches").auth(grower, { type: "bearer" }).send({ ...base, stuckOn: addDays(today, 2) }).expect(400)).body);
    expect(future).toMatchObject({ code: "date-in-future", errors: [{ path: "stuckOn" }] });
    const badDate = problemSchema.parse((await api().post("/api/batches").auth(grower, { type: "bearer" }).send({ ...base, stuckOn: "2025-02-30" }).expect(400)).body);
    expect(badDate.errors?.[0]?.path).toBe("stuckOn");
    await api().post("/api/batches").auth(viewer, { type: "bearer" }).send(base).expect(403);
  });

  it("edits change the batch's own fields and are audited old → new; the bench is changed only by a move", async () => {
    const res = await api().patch(`/api/batches/${batch.id}`).auth(manager, { type: "bearer" }).send({ countStuck: 100, notes: null, wrapping: "wax" }).expect(200);
    batch = batchResponseSchema.parse(res.body).batch;
    expect(batch).toMatchObject({ countStuck: 100, notes: null, wrapping: "wax" });
    const audit = auditResponseSchema.parse((await api().get(`/api/audit?entityType=batch&benchId=${bench(0, 1).id}`).auth(viewer, { type: "bearer" }).expect(200)).body);
    expect(audit.entries[0]!.changes).toContainEqual(expect.objectContaining({ field: "countStuck", old: 120, new: 100 }));
    const refused = problemSchema.parse((await api().patch(`/api/batches/${batch.id}`).auth(manager, { type: "bearer" }).send({ benchId: bench(0, 2).id }).expect(400)).body);
    expect(refused.code).toBe("invalid-input");
  });

  it("a move keeps the history with its effective time and is audited", async () => {
    const atMs = Date.now() - 3600_000;
    const res = await api().post(`/api/batches/${batch.id}/move`).auth(grower, { type: "bearer" }).send({ benchId: bench(1, 0).id, effectiveAtMs: atMs, note: "Mat on Bench 2 failed" }).expect(200);
    batch = batchResponseSchema.parse(res.body).batch;
    expect(batch.bench).toMatchObject({ benchId: bench(1, 0).id, zoneName: "House 2 · Pomegranate & mulberry" });
    expect(batch.placements.map((p) => [p.benchId, p.toMs])).toEqual([
      [bench(0, 1).id, atMs],
      [bench(1, 0).id, null],
    ]);
    expect(batch.placements[1]).toMatchObject({ fromMs: atMs, note: "Mat on Bench 2 failed" });
    const audit = auditResponseSchema.parse((await api().get(`/api/audit?zoneId=${layout.zones[0]!.id}&entityType=batch`).auth(viewer, { type: "bearer" }).expect(200)).body);
    expect(audit.entries[0]).toMatchObject({ action: "moved", previousZoneId: layout.zones[0]!.id, zoneId: layout.zones[1]!.id });
    await api().post(`/api/batches/${batch.id}/move`).auth(grower, { type: "bearer" }).send({ benchId: bench(1, 0).id }).expect(409);
    const early = problemSchema.parse((await api().post(`/api/batches/${batch.id}/move`).auth(grower, { type: "bearer" }).send({ benchId: bench(1, 1).id, effectiveAtMs: atMs - 1000 }).expect(400)).body);
    expect(early.code).toBe("time-before-placement");
    const listed = batchesResponseSchema.parse((await api().get(`/api/batches?zoneId=${layout.zones[1]!.id}`).auth(viewer, { type: "bearer" }).expect(200)).body);
    expect(listed.batches.map((b) => b.id)).toContain(batch.id);
  });
});

describe("observations", () => {
  let batch: BatchView;

  beforeAll(async () => {
    batch = await createBatch({ variety: "Lanner's Black", stuckOn: addDays(today, -30), countStuck: 50, benchId: bench(0, 3).id });
  });

  it("when an observation is re-sent with the same clientId, then it is stored once and the stored one comes back", async () => {
    const clientId = randomUUID();
    const body = { clientId, observedOn: addDays(today, -9), stage: "callused", lostCount: 2, flags: ["medium-too-wet"], note: "Heavy condensation on the lid" };
    const first = createObservationResponseSchema.parse((await api().post(`/api/batches/${batch.id}/observations`).auth(grower, { type: "bearer" }).send(body).expect(201)).body);
    expect(first.created).toBe(true);
    const again = createObservationResponseSchema.parse((await api().post(`/api/batches/${batch.id}/observations`).auth(grower, { type: "bearer" }).send(body).expect(200)).body);
    expect(again).toEqual({ ...first, created: false });
    // Two copies in flight at once (a retry racing the original) still make one row.
    const raceId = randomUUID();
    const raced = await Promise.all([0, 1, 2].map(() => api().post(`/api/batches/${batch.id}/observations`).auth(grower, { type: "bearer" }).send({ ...body, clientId: raceId })));
    expect(raced.map((r) => r.status).sort()).toEqual([200, 200, 201]);
    expect(new Set(raced.map((r) => (r.body as { observation: { id: number } }).observation.id)).size).toBe(1);
    const stored = await server.dataSource.getRepository(ObservationEntity).countBy({ clientId: In([clientId, raceId]) });
    expect(stored).toBe(2);
    // The same clientId on another batch is a client bug, not a retry.
    const other = await createBatch({ variety: "Lanner's Black", stuckOn: today, countStuck: 5, benchId: bench(0, 3).id });
    expect(problemSchema.parse((await api().post(`/api/batches/${other.id}/observations`).auth(grower, { type: "bearer" }).send(body).expect(409)).body).code).toBe("client-id-in-use");
  });

  it("counts are running totals and must add up; dates stay within the batch's life", async () => {
    const over = problemSchema.parse((await observe(batch.id, { stage: "rooted", rootedCount: 49 }, 400)).body);
    expect(over).toMatchObject({ code: "counts-exceed-stuck", detail: "49 rooted + 2 lost is more than the 50 stuck" });
    const early = problemSchema.parse((await observe(batch.id, { stage: "stuck", observedOn: addDays(today, -31) }, 400)).body);
    expect(early.errors?.[0]?.path).toBe("observedOn");
    await observe(batch.id, { stage: "stuck", observedOn: addDays(today, 3) }, 400);
  });

  it("the batch's stage, counts and days to callus and roots follow its observations", async () => {
    await observe(batch.id, { observedOn: addDays(today, -2), stage: "rooted", rootedCount: 30, lostCount: 4 });
    await observe(batch.id, { observedOn: addDays(today, -16), stage: "root-initials" });
    const view = batchResponseSchema.parse((await api().get(`/api/batches/${batch.id}`).auth(viewer, { type: "bearer" }).expect(200)).body).batch;
    expect(view).toMatchObject({
      stage: "rooted",
      daysToCallus: 14, // root initials seen on day 14 imply callus by then
      daysToRootInitials: 14,
      daysToRooted: 28,
      tally: { stuck: 50, rooted: 30, lost: 4, pending: 16, strikeRate: 0.6, isFinal: false },
      observationCount: 4,
      lastObservation: { stage: "rooted", observedOn: addDays(today, -2) },
    });
    const list = observationsResponseSchema.parse((await api().get(`/api/batches/${batch.id}/observations`).auth(viewer, { type: "bearer" }).expect(200)).body);
    expect(list.observations.map((o) => o.observedOn)).toEqual([addDays(today, -16), addDays(today, -9), addDays(today, -9), addDays(today, -2)]);
  });

  it("closing with an outcome fixes the final counts; a closed batch takes no observations until reopened", async () => {
    const closed = batchResponseSchema.parse((await api().post(`/api/batches/${batch.id}/close`).auth(grower, { type: "bearer" }).send({ outcome: "potted-on", rootedCount: 41, note: "Potted into 2 L" }).expect(200)).body).batch;
    expect(closed).toMatchObject({ status: "closed", stage: "potted-on", outcome: "potted-on", closedOn: today, tally: { rooted: 41, lost: 4, strikeRate: 0.82, isFinal: true } });
    expect(closed.placements.at(-1)!.toMs).not.toBeNull();
    expect(problemSchema.parse((await observe(batch.id, { stage: "rooted" }, 409)).body).code).toBe("batch-closed");
    await api().post(`/api/batches/${batch.id}/close`).auth(grower, { type: "bearer" }).send({ outcome: "lost" }).expect(409);
    const reopened = batchResponseSchema.parse((await api().post(`/api/batches/${batch.id}/reopen`).auth(manager, { type: "bearer" }).expect(200)).body).batch;
    expect(reopened).toMatchObject({ status: "open", outcome: null, tally: { rooted: 30, isFinal: false } });
    expect(reopened.placements.at(-1)!.toMs).toBeNull();
    const audit = auditResponseSchema.parse((await api().get(`/api/audit?entityType=batch&benchId=${bench(0, 3).id}`).auth(viewer, { type: "bearer" }).expect(200)).body);
    expect(audit.entries.slice(0, 2).map((e) => e.action)).toEqual(["reopened", "closed"]);
  });
});

describe("strike-rate reports and CSV", () => {
  /*
   * Readings on House 3 Bench 3 and Bench 4 (combined probes), one a minute from 90 to 31 minutes
   * ago; the last one holds for the 10-minute silence limit (SENSOR_SILENT_AFTER), then no data.
   * Air window 70–80 °F = 21.1–26.7 °C (the demo window; common practice for fig cuttings).
   * Batch A on Bench 3: 18 °C for 15 min, then 23 °C → 15 min below, 44 + 10 min inside → 54/69.
   * Batch B on Bench 4 (18 °C, 30 readings) until it moves to Bench 3 at t0 + 30 min → 30 min
   * below on Bench 4, then 29 + 10 min inside on Bench 3 → 39/69. Hand-computed from the
   * sample-and-hold rule of shared/domain/time-in-window.ts.
   */
  let t0Ms: number;
  let a: BatchView;
  let b: BatchView;

  beforeAll(async () => {
    t0Ms = Math.floor((Date.now() - 90 * 60_000) / 60_000) * 60_000;
    const three = bench(2, 2);
    const four = bench(2, 3);
    const probe = (benchId: number) => server.credentials.find((c) => c.benchId === benchId && c.kind === "combined")!;
    const at = (i: number) => t0Ms / 1000 + i * 60;
    await publish(probe(three.id), Array.from({ length: 60 }, (_, i) => ({ n: `${probe(three.id).id}:air.temperature`, u: "Cel", v: i < 15 ? 18 : 23, t: at(i) })));
    await publish(probe(four.id), Array.from({ length: 30 }, (_, i) => ({ n: `${probe(four.id).id}:air.temperature`, u: "Cel", v: 18, t: at(i) })));

    a = await createBatch({ variety: "Harbour Amber", stuckOn: yesterday, countStuck: 100, benchId: three.id });
    await observe(a.id, { stage: "rooted", rootedCount: 70, observedOn: today });
    await api().post(`/api/batches/${a.id}/close`).auth(grower, { type: "bearer" }).send({ outcome: "potted-on", rootedCount: 80, lostCount: 5 }).expect(200);
    b = await createBatch({ variety: "harbour amber ", stuckOn: yesterday, countStuck: 50, benchId: four.id });
    await observe(b.id, { stage: "root-initials", rootedCount: 30, observedOn: today });
    await api().post(`/api/batches/${b.id}/move`).auth(grower, { type: "bearer" }).send({ benchId: three.id, effectiveAtMs: t0Ms + 30 * 60_000 }).expect(200);
  });

  it("per batch: strike rate and the share of its life inside the window, following the batch from bench to bench", async () => {
    const report = strikeRateReportSchema.parse((await api().get(`/api/reports/strike-rates?zoneId=${layout.zones[2]!.id}`).auth(viewer, { type: "bearer" }).expect(200)).body);
    const rowA = report.batches.find((r) => r.batchId === a.id)!;
    const rowB = report.batches.find((r) => r.batchId === b.id)!;
    expect(rowA.tally).toMatchObject({ rooted: 80, lost: 5, strikeRate: 0.8, isFinal: true });
    const airA = rowA.timeInWindow.find((t) => t.quantity === "air.temperature")!;
    expect(airA).toMatchObject({ insideMinutes: 54, belowMinutes: 15, aboveMinutes: 0 });
    expect(airA.insidePct).toBeCloseTo((100 * 54) / 69, 6);
    expect(airA.windowMin).toBeCloseTo((70 - 32) / 1.8, 9); // NIST SP 811: t/°C = (t/°F − 32)/1.8
    // 0.5 °C hysteresis plays no part here: time in window is the band itself. 3.1 °C × 15 min ≈ 0.78 °C·h below the minimum.
    expect(airA.degreeHoursBelowMin).toBeCloseTo(((70 - 32) / 1.8 - 18) * 0.25, 6);
    expect(rowB.tally).toMatchObject({ rooted: 30, strikeRate: 0.6, isFinal: false });
    const airB = rowB.timeInWindow.find((t) => t.quantity === "air.temperature")!;
    expect(airB).toMatchObject({ insideMinutes: 39, belowMinutes: 30 });
    expect(airB.insidePct).toBeCloseTo((100 * 39) / 69, 6);
    expect(rowB.placements).toHaveLength(2);
    expect(rowB.mainBench.benchId).toBe(bench(2, 3).id); // most of its life was on Bench 4
    // Medium probes sent nothing: no data, no share.
    expect(rowA.timeInWindow.find((t) => t.quantity === "medium.moisture")!.insidePct).toBeNull();
  });

  it("per variety and per bench: pooled strike rate Σ rooted / Σ stuck and pooled time in window, side by side", async () => {
    const report = strikeRateReportSchema.parse((await api().get(`/api/reports/strike-rates?zoneId=${layout.zones[2]!.id}`).auth(manager, { type: "bearer" }).expect(200)).body);
    expect(report.byVariety).toHaveLength(1); // "Harbour Amber" and "harbour amber " are one variety
    const variety = report.byVariety[0]!;
    expect(variety).toMatchObject({ label: "Harbour Amber", batchCount: 2, stuck: 150, rooted: 110 });
    expect(variety.strikeRate).toBeCloseTo(110 / 150, 9);
    expect(variety.timeInWindow.find((t) => t.quantity === "air.temperature")!.insidePct).toBeCloseTo((100 * (54 + 39)) / (69 + 69), 6);
    expect(variety.daysToRootInitials).toEqual({ reached: 2, of: 2, meanDays: 1, medianDays: 1 });
    expect(report.byBench.map((g) => [g.label, g.batchCount])).toEqual([
      ["House 3 · Grafted stock › Bench 3", 1],
      ["House 3 · Grafted stock › Bench 4", 1],
    ]);
  });

  it("a life with more readings than the report walks one by one is read as bucket means, and says so", async () => {
    // 6,000 readings 5 s apart on House 2 Bench 3 (inserted directly): 250 min at 23 °C, then 250 min at 18 °C.
    const three = bench(1, 2);
    const probe = server.credentials.find((c) => c.benchId === three.id && c.kind === "combined")!;
    const startMs = Math.floor((Date.now() - 9 * 3600_000) / 60_000) * 60_000;
    await insertReadings(
      server.dataSource,
      Array.from({ length: 6000 }, (_, i) => ({ sensorId: probe.id, quantity: "air.temperature", timeMs: startMs + i * 5000, value: i < 3000 ? 23 : 18, benchId: three.id })),
    );
    const c = await createBatch({ variety: "Wonderful", stuckOn: yesterday, countStuck: 10, benchId: three.id });
    const report = strikeRateReportSchema.parse((await api().get(`/api/reports/strike-rates?benchId=${three.id}`).auth(viewer, { type: "bearer" }).expect(200)).body);
    const row = report.batches.find((r) => r.batchId === c.id)!;
    expect(row.sampled).toBe(true);
    const air = row.timeInWindow.find((t) => t.quantity === "air.temperature")!;
    // Exact (every reading): 250 min inside, 250 min + the last value's 10-minute hold below → 49.0 %.
    expect(Math.abs(air.insidePct! - (100 * 250) / 510)).toBeLessThan(1);
    expect(Math.abs(air.insideMinutes - 250)).toBeLessThanOrEqual(2);
  });

  it("CSV of batches and of observations: units in the header, one row each", async () => {
    const batches = await api().get(`/api/exports/batches.csv?zoneId=${layout.zones[2]!.id}`).auth(viewer, { type: "bearer" }).expect(200);
    expect(batches.headers["content-type"]).toBe("text/csv; charset=utf-8");
    expect(batches.headers["content-disposition"]).toMatch(/^attachment; filename="benchwarden-batches-\d{4}-\d{2}-\d{2}\.csv"$/);
    expect(batches.text.startsWith("\uFEFF")).toBe(true);
    const lines = batches.text.slice(1).split("\r\n");
    expect(lines.pop()).toBe("");
    const header = lines[0]!.split(",");
    expect(header.slice(0, 4)).toEqual(["batch id", "variety", "wood source", "stuck on (date)"]);
    for (const column of ["count stuck (cuttings)", "strike rate (%)", "thickness (mm)", "days to callus (days)", "air.temperature inside window (% of time with data)", "air.temperature below window (min)"]) {
      expect(header).toContain(column);
    }
    expect(lines).toHaveLength(3);
    const rowA = lines.find((l) => l.startsWith(`${a.id},`))!.split(",");
    expect(rowA[header.indexOf("strike rate (%)")]).toBe("80");
    expect(rowA[header.indexOf("air.temperature inside window (% of time with data)")]).toBe(String(Math.round((1000 * 54) / 69) / 10));

    const observations = await api().get(`/api/exports/observations.csv?batchId=${b.id}`).auth(viewer, { type: "bearer" }).expect(200);
    const obsLines = observations.text.slice(1).split("\r\n");
    expect(obsLines[0]!.split(",").slice(0, 11)).toEqual([
      "observation id",
      "batch id",
      "variety",
      "zone",
      "bench",
      "observed on (date)",
      "stage",
      "rooted so far (cuttings)",
      "lost so far (cuttings)",
      "count stuck (cuttings)",
      "strike rate so far (%)",
    ]);
    expect(obsLines[0]).toContain("mould (flag)");
    expect(obsLines[0]).toContain("recorded at (UTC)");
    expect(obsLines).toHaveLength(3); // header, one observation, final CRLF
    // Recorded after the (backdated) move: the row names the bench it was on then.
    expect(obsLines[1]!.split(",").slice(1, 11)).toEqual([String(b.id), "harbour amber", "House 3 · Grafted stock", "Bench 3", today, "Root initials", "30", "", "50", "60"]);
  });
});
