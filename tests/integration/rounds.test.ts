import { randomUUID } from "node:crypto";
import sharp from "sharp";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../shared/api-error.js";
import { addDays, localDate, roundLookbackStartMs } from "../../shared/domain/batch-calendar.js";
import { batchResponseSchema, createObservationResponseSchema, uploadPhotosResponseSchema, type BatchView } from "../../shared/schemas/batches.js";
import { layoutResponseSchema, type BenchView, type LayoutResponse } from "../../shared/schemas/layout.js";
import { caughtMailResponseSchema, type CaughtMail } from "../../shared/schemas/mail.js";
import {
  benchCardResponseSchema,
  checkBenchResponseSchema,
  roundCardsResponseSchema,
  roundResponseSchema,
  roundsResponseSchema,
  roundSummaryResponseSchema,
  startRoundResponseSchema,
  type RoundView,
} from "../../shared/schemas/rounds.js";
import { AlertEntity } from "../../server/db/entities/alert.entity.js";
import { connectSensor, signIn, startTestServer, waitFor, type TestServer } from "../support/test-server.js";

/**
 * The morning walk-through (issue 6 §3; PRODUCT.md §5): start → cards in walking order with the
 * night's extremes and minutes out of window from real readings published over MQTT → observation
 * with a photo → every bench checked off → finish → the summary saved and mailed to the manager.
 */
let server: TestServer;
let grower: string;
let manager: string;
let admin: string;
let layout: LayoutResponse;
let house1: BenchView[];
let t0Ms: number;
let batch: BatchView;
let alertId: number;
let round: RoundView;

const TZ = "America/Chicago";
const MIN = 60_000;
const api = () => request(server.baseUrl);

async function mailbox(): Promise<CaughtMail[]> {
  return caughtMailResponseSchema.parse((await api().get("/api/mail").auth(admin, { type: "bearer" }).expect(200)).body).messages;
}

beforeAll(async () => {
  server = await startTestServer({ ALERT_TICK: "1h" });
  [grower, manager, admin] = await Promise.all([signIn(server, "grower"), signIn(server, "manager"), signIn(server, "admin")]);
  layout = layoutResponseSchema.parse((await api().get("/api/layout").auth(grower, { type: "bearer" }).expect(200)).body);
  const zone1 = layout.zones[0]!;
  const benches = layout.benches.filter((b) => b.zoneId === zone1.id);
  // The manager sets the walking order: Bench 4 first, then 1, 2, 3.
  const order = [benches[3]!, benches[0]!, benches[1]!, benches[2]!];
  await api().put(`/api/zones/${zone1.id}/bench-order`).auth(manager, { type: "bearer" }).send({ benchIds: order.map((b) => b.id) }).expect(200);
  house1 = order;

  // Bench 1's air probe, one pack a minute for 30 minutes from an hour ago (so the last value's
  // 10-minute hold ends well before now): 22 °C, then 19 °C for 8 minutes (below the 70 °F =
  // 21.1 °C minimum; shorter than the 10-minute hold-off, so no alert of the engine's own), then
  // 25 °C; 80 % RH throughout.
  t0Ms = Math.floor((Date.now() - 60 * MIN) / MIN) * MIN;
  const bench1 = benches[0]!;
  const air = server.credentials.find((c) => c.benchId === bench1.id && c.kind === "air")!;
  const client = await connectSensor(server, air);
  const records = Array.from({ length: 30 }, (_, i) => {
    const t = t0Ms / 1000 + i * 60;
    const v = i < 10 ? 22 : i < 18 ? 19 : 25;
    return [
      { n: `${air.id}:air.temperature`, u: "Cel", v, t },
      { n: `${air.id}:air.humidity`, u: "%RH", v: 80, t },
    ];
  }).flat();
  await client.publishAsync(`benchwarden/v1/sensors/${air.id}/readings`, JSON.stringify(records), { qos: 1 });
  await client.endAsync();

  // An alert the night shift dealt with (in the card's period) and an old one (before it).
  const alerts = server.dataSource.getRepository(AlertEntity);
  const base = { benchId: bench1.id, zoneId: zone1.id, kind: "window" as const, quantity: "air.temperature", direction: "below" as const, sensorId: null, acknowledgedByUserId: null, acknowledgedByName: "Marisol Ortega", acknowledgeNote: null, lastNotifiedMs: null, escalatedAtMs: null };
  const inserted = await alerts.save({ ...base, phase: "cleared", sinceMs: t0Ms + 10 * MIN, raisedAtMs: t0Ms + 12 * MIN, acknowledgedAtMs: t0Ms + 14 * MIN, clearedAtMs: t0Ms + 18 * MIN, worstValue: 19, lastValue: 22, updatedAtMs: t0Ms + 18 * MIN });
  alertId = inserted.id;
  await alerts.save({ ...base, phase: "cleared", sinceMs: Date.now() - 5 * 24 * 3600_000, raisedAtMs: null, acknowledgedAtMs: null, clearedAtMs: Date.now() - 5 * 24 * 3600_000 + 30 * MIN, worstValue: 20, lastValue: 21.5, updatedAtMs: Date.now() });

  const stuckOn = addDays(localDate(Date.now(), TZ), -20);
  batch = batchResponseSchema.parse((await api().post("/api/batches").auth(grower, { type: "bearer" }).send({ variety: "Harbour Amber", stuckOn, countStuck: 60, benchId: bench1.id }).expect(201)).body).batch;
}, 60_000);

afterAll(async () => {
  await server.cleanup();
});

describe("a walk-through of one zone", () => {
  it("when a grower starts a round of House 1, then its benches come in the manager's walking order; starting again resumes it", async () => {
    const started = startRoundResponseSchema.parse((await api().post("/api/rounds").auth(grower, { type: "bearer" }).send({ zoneId: layout.zones[0]!.id }).expect(201)).body);
    expect(started.resumed).toBe(false);
    round = started.round;
    expect(round).toMatchObject({ status: "in-progress", zoneName: "House 1 · Fig cuttings", scopeLabel: "House 1 · Fig cuttings", benchCount: 4, checkedCount: 0, startedBy: { name: "Marisol Ortega" } });
    expect(round.benches.map((b) => b.benchName)).toEqual(["Bench 4", "Bench 1", "Bench 2", "Bench 3"]);
    const again = startRoundResponseSchema.parse((await api().post("/api/rounds").auth(grower, { type: "bearer" }).send({ zoneId: layout.zones[0]!.id }).expect(200)).body);
    expect(again).toMatchObject({ resumed: true, round: { id: round.id } });
  });

  it("two people can walk different zones at once; a whole-site round overlapping them is refused", async () => {
    const other = startRoundResponseSchema.parse((await api().post("/api/rounds").auth(manager, { type: "bearer" }).send({ zoneId: layout.zones[1]!.id }).expect(201)).body);
    expect(other.round.id).not.toBe(round.id);
    const overlap = problemSchema.parse((await api().post("/api/rounds").auth(manager, { type: "bearer" }).send({ siteId: layout.sites[0]!.id }).expect(409)).body);
    expect(overlap.code).toBe("round-overlaps");
    expect(overlap.detail).toContain("Marisol Ortega");
    await api().post(`/api/rounds/${other.round.id}/abandon`).auth(manager, { type: "bearer" }).expect(200);
    const inProgress = roundsResponseSchema.parse((await api().get("/api/rounds?status=in-progress").auth(manager, { type: "bearer" }).expect(200)).body);
    expect(inProgress.rounds.map((r) => r.id)).toEqual([round.id]);
  });

  it("each card shows the night's min and max, minutes out of window, dew point and VPD, alerts and batches from the real readings", async () => {
    const { cards } = roundCardsResponseSchema.parse((await api().get(`/api/rounds/${round.id}/cards`).auth(grower, { type: "bearer" }).expect(200)).body);
    expect(cards.map((c) => c.benchName)).toEqual(["Bench 4", "Bench 1", "Bench 2", "Bench 3"]);
    const card = cards[1]!;
    // No earlier round: since 18:00 the evening before the round started, site time.
    expect(card.period).toMatchObject({ since: "evening-before", fromMs: roundLookbackStartMs(round.startedAtMs, TZ), sinceRoundId: null, capped: false });
    const air = card.quantities.find((q) => q.quantity === "air.temperature")!;
    expect(air).toMatchObject({ min: { value: 19, timeMs: t0Ms + 10 * MIN }, max: { value: 25, timeMs: t0Ms + 18 * MIN }, readingCount: 30, minutesOutOfWindow: 8, sampled: false });
    // Sample-and-hold (shared/domain/time-in-window.ts): 10 min at 22 + 11 min at 25 + the last value's 10-minute hold inside, 8 below.
    expect(air.minutes.below).toBe(8);
    expect(air.minutes.inside).toBe(31);
    expect(air.minutes.above).toBe(0);
    expect(card.quantities.find((q) => q.quantity === "air.humidity")).toMatchObject({ min: { value: 80 }, max: { value: 80 }, minutesOutOfWindow: 0 });
    expect(card.quantities.find((q) => q.quantity === "medium.moisture")).toMatchObject({ min: null, readingCount: 0, insidePct: null });
    // 25 °C at 80 % RH: dew point 21.3094 °C (PsychroLib documentation, ASHRAE Handbook—Fundamentals 2017 method; ±0.1 °C between methods).
    expect(Math.abs(card.air.dewPointC!.max.value - 21.3094)).toBeLessThan(0.1);
    // VPD = e°(T)(1 − RH/100); e°(25 °C) = 3.168 kPa (FAO-56 eq. 11, Annex 2) → 0.6336 kPa.
    expect(card.air.vpdKPa!.max.value).toBeCloseTo(3.168 * 0.2, 3);
    expect(card.air.pairCount).toBe(30);
    expect(card.alerts.map((a) => a.id)).toEqual([alertId]);
    expect(card.alerts[0]).toMatchObject({ summary: "Air too cold", phase: "cleared" });
    expect(card.batches.map((b) => [b.id, b.stage, b.observationsThisRound.length])).toEqual([[batch.id, "stuck", 0]]);
    // Benches without probes in the period: no data at all.
    expect(cards[0]!.quantities.every((q) => q.readingCount === 0 && q.minutesOutOfWindow === 0)).toBe(true);
  });

  it("an observation with a photo goes on a batch; checking a bench off is idempotent", async () => {
    const obs = createObservationResponseSchema.parse(
      (await api().post(`/api/batches/${batch.id}/observations`).auth(grower, { type: "bearer" }).send({ clientId: randomUUID(), roundId: round.id, stage: "callused", flags: ["mould", "medium-too-wet"], note: "White fuzz on two bases" }).expect(201)).body,
    ).observation;
    const jpeg = await sharp({ create: { width: 64, height: 64, channels: 3, background: "#556b2f" } }).jpeg().toBuffer();
    uploadPhotosResponseSchema.parse((await api().post(`/api/observations/${obs.id}/photos`).auth(grower, { type: "bearer" }).attach("photos", jpeg, { filename: "IMG_2041.jpg", contentType: "image/jpeg" }).expect(201)).body);

    const bench1 = house1[1]!;
    const first = checkBenchResponseSchema.parse((await api().put(`/api/rounds/${round.id}/benches/${bench1.id}/check`).auth(grower, { type: "bearer" }).send({}).expect(200)).body);
    expect(first.bench.check).toMatchObject({ by: { name: "Marisol Ortega" }, note: null });
    const again = checkBenchResponseSchema.parse((await api().put(`/api/rounds/${round.id}/benches/${bench1.id}/check`).auth(grower, { type: "bearer" }).send({ note: "Mould on the Harbour Amber" }).expect(200)).body);
    expect(again.bench.check).toEqual({ ...first.bench.check, note: "Mould on the Harbour Amber" });
    expect(again.round.checkedCount).toBe(1);
    const card = benchCardResponseSchema.parse((await api().get(`/api/rounds/${round.id}/benches/${bench1.id}/card`).auth(grower, { type: "bearer" }).expect(200)).body).card;
    expect(card.check?.atMs).toBe(first.bench.check!.atMs);
    expect(card.period.toMs).toBe(first.bench.check!.atMs); // a checked card stays as it was checked
    expect(card.batches[0]!.observationsThisRound.map((o) => [o.id, o.photos.length])).toEqual([[obs.id, 1]]);

    // Undo and redo a check-off; then the others.
    await api().delete(`/api/rounds/${round.id}/benches/${house1[2]!.id}/check`).auth(grower, { type: "bearer" }).expect(200);
    for (const b of [house1[0]!, house1[2]!]) await api().put(`/api/rounds/${round.id}/benches/${b.id}/check`).auth(grower, { type: "bearer" }).send({}).expect(200);
    // Three copies of one check-off at once (a tablet's retries racing): one check-off, answered to each.
    const raced = await Promise.all([0, 1, 2].map(() => api().put(`/api/rounds/${round.id}/benches/${house1[3]!.id}/check`).auth(grower, { type: "bearer" }).send({})));
    expect(raced.map((r) => r.status)).toEqual([200, 200, 200]);
    expect(new Set(raced.map((r) => checkBenchResponseSchema.parse(r.body).bench.check!.atMs)).size).toBe(1);
    const view = roundResponseSchema.parse((await api().get(`/api/rounds/${round.id}`).auth(grower, { type: "bearer" }).expect(200)).body).round;
    expect(view.checkedCount).toBe(4);
    const outside = layout.benches.find((b) => b.zoneId === layout.zones[2]!.id)!;
    expect(problemSchema.parse((await api().put(`/api/rounds/${round.id}/benches/${outside.id}/check`).auth(grower, { type: "bearer" }).send({}).expect(404)).body).code).toBe("bench-not-in-round");
  });

  it("when the round is finished, then the summary is saved, returned and mailed to the manager in °F through the outbox, once", async () => {
    const before = (await mailbox()).length;
    const done = roundSummaryResponseSchema.parse((await api().post(`/api/rounds/${round.id}/finish`).auth(grower, { type: "bearer" }).expect(200)).body);
    const { summary } = done;
    expect(done.round.status).toBe("finished");
    expect(summary).toMatchObject({
      roundId: round.id,
      scopeLabel: "House 1 · Fig cuttings",
      siteName: "Hollin Lane Nursery",
      startedBy: { name: "Marisol Ortega" },
      finishedBy: { name: "Marisol Ortega" },
      walkedBy: ["Marisol Ortega"],
      benchCount: 4,
      checkedCount: 4,
      notChecked: [],
      observationCount: 1,
      photoCount: 1,
      mailedTo: ["manager@nursery.test"],
    });
    expect(summary.problems.count).toBe(2);
    expect(summary.problems.alerts.map((a) => a.alertId)).toEqual([alertId]);
    expect(summary.problems.observations[0]).toMatchObject({ batchId: batch.id, flags: ["mould", "medium-too-wet"], photoCount: 1, benchName: "Bench 1" });
    const bench1 = summary.benches.find((b) => b.benchId === house1[1]!.id)!;
    expect(bench1.outOfWindow).toEqual([expect.objectContaining({ quantity: "air.temperature", readingCount: 30, belowMinutes: 8, aboveMinutes: 0, min: 19, max: 25 })]);
    expect(bench1.quantities).toHaveLength(4);

    const mail = await waitFor(async () => (await mailbox()).find((m) => m.subject.startsWith("Walk-through House 1")), 5000);
    expect(mail.to).toEqual(["manager@nursery.test"]);
    expect(mail.subject).toBe("Walk-through House 1 · Fig cuttings: 4 of 4 benches checked, 2 problems");
    expect(mail.text).toContain("Hello Tobias Fenwick,");
    expect(mail.text).toContain("Benches checked: 4 of 4.");
    expect(mail.text).toContain("Air too cold");
    expect(mail.text).toContain("mould, medium too wet — “White fuzz on two bases” (1 photo)");
    // 19 °C = 66.2 °F (NIST SP 811: t/°F = 1.8 t/°C + 32), the manager's unit.
    expect(mail.text).toContain("Air temperature: below the window 8 min (lowest 66.2 °F); window 70.0 °F to 80.0 °F");
    // Benches whose probes sent nothing are not "inside": the mail says so.
    expect(mail.text).toMatch(/Bench 4 \(House 1 · Fig cuttings\) — checked \d\d:\d\d by Marisol Ortega\n {2}No readings in the period: are its probes reporting\?/);
    expect(mail.text).toContain("Observations recorded: 1; photos: 1.");
    expect(mail.text).toContain(`/rounds/${round.id}`);

    // Finishing again (a retry) answers the saved summary and mails nobody again.
    const again = roundSummaryResponseSchema.parse((await api().post(`/api/rounds/${round.id}/finish`).auth(grower, { type: "bearer" }).expect(200)).body);
    expect(again.summary).toEqual(summary);
    await new Promise((r) => setTimeout(r, 300));
    expect((await mailbox()).length).toBe(before + 1);
    expect(problemSchema.parse((await api().put(`/api/rounds/${round.id}/benches/${house1[0]!.id}/check`).auth(grower, { type: "bearer" }).send({}).expect(409)).body).code).toBe("round-not-in-progress");
    const saved = roundSummaryResponseSchema.parse((await api().get(`/api/rounds/${round.id}/summary`).auth(admin, { type: "bearer" }).expect(200)).body);
    expect(saved.summary).toEqual(summary);
  });

  it("the next round's cards start from the last round's check-off", async () => {
    const next = startRoundResponseSchema.parse((await api().post("/api/rounds").auth(grower, { type: "bearer" }).send({ zoneId: layout.zones[0]!.id }).expect(201)).body).round;
    const bench1 = house1[1]!;
    const card = benchCardResponseSchema.parse((await api().get(`/api/rounds/${next.id}/benches/${bench1.id}/card`).auth(grower, { type: "bearer" }).expect(200)).body).card;
    const previous = roundSummaryResponseSchema.parse((await api().get(`/api/rounds/${round.id}/summary`).auth(grower, { type: "bearer" }).expect(200)).body);
    const checkedAtMs = previous.summary.benches.find((b) => b.benchId === bench1.id)!.check!.atMs;
    expect(card.period).toMatchObject({ since: "last-round", sinceRoundId: round.id, fromMs: checkedAtMs });
    expect(card.quantities.find((q) => q.quantity === "air.temperature")!.readingCount).toBe(0);
    expect(card.alerts).toEqual([]);
    const abandoned = roundResponseSchema.parse((await api().post(`/api/rounds/${next.id}/abandon`).auth(grower, { type: "bearer" }).expect(200)).body).round;
    expect(abandoned.status).toBe("abandoned");
    expect(problemSchema.parse((await api().post(`/api/rounds/${next.id}/finish`).auth(grower, { type: "bearer" }).expect(409)).body).code).toBe("round-abandoned");
  });

  it("a round of every zone of the site walks the zones in order, each in its walking order", async () => {
    const all = startRoundResponseSchema.parse((await api().post("/api/rounds").auth(grower, { type: "bearer" }).send({}).expect(201)).body).round;
    expect(all).toMatchObject({ zoneId: null, scopeLabel: "All zones of Hollin Lane Nursery", benchCount: 12 });
    expect(all.benches.slice(0, 5).map((b) => `${b.zoneName.slice(0, 7)} ${b.benchName}`)).toEqual(["House 1 Bench 4", "House 1 Bench 1", "House 1 Bench 2", "House 1 Bench 3", "House 2 Bench 1"]);
    // While it is in progress, a round of one of its zones would overlap it.
    expect(problemSchema.parse((await api().post("/api/rounds").auth(manager, { type: "bearer" }).send({ zoneId: layout.zones[2]!.id }).expect(409)).body).code).toBe("round-overlaps");
    await api().post(`/api/rounds/${all.id}/abandon`).auth(grower, { type: "bearer" }).expect(200);
  });

  it("a check-off carries the time it was tapped on the tablet (sent later after being offline), held between the round's start and now", async () => {
    const walk = startRoundResponseSchema.parse((await api().post("/api/rounds").auth(grower, { type: "bearer" }).send({ zoneId: layout.zones[1]!.id }).expect(201)).body).round;
    const [b1, b2, b3] = layout.benches.filter((b) => b.zoneId === layout.zones[1]!.id);
    const check = async (benchId: number, checkedAtMs: number) =>
      checkBenchResponseSchema.parse((await api().put(`/api/rounds/${walk.id}/benches/${benchId}/check`).auth(grower, { type: "bearer" }).send({ checkedAtMs }).expect(200)).body).bench.check!.atMs;
    await new Promise((r) => setTimeout(r, 400));
    const tappedMs = walk.startedAtMs + 200; // tapped while offline, sent 200 ms or more later
    expect(await check(b1!.id, tappedMs)).toBe(tappedMs);
    // A tablet clock far off is held inside the round: not before it started, not after now.
    expect(await check(b2!.id, walk.startedAtMs - 86_400_000)).toBe(walk.startedAtMs);
    const beforeMs = Date.now();
    const future = await check(b3!.id, beforeMs + 86_400_000);
    expect(future).toBeGreaterThanOrEqual(beforeMs);
    expect(future).toBeLessThanOrEqual(Date.now());
    await api().post(`/api/rounds/${walk.id}/abandon`).auth(grower, { type: "bearer" }).expect(200);
  });

  it("a viewer reads rounds but cannot walk one", async () => {
    const viewer = await signIn(server, "viewer");
    await api().get(`/api/rounds/${round.id}/cards`).auth(viewer, { type: "bearer" }).expect(200);
    await api().post("/api/rounds").auth(viewer, { type: "bearer" }).send({ zoneId: layout.zones[0]!.id }).expect(403);
  });
});
