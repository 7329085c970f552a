import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../shared/api-error.js";
import { auditResponseSchema, type AuditEntry } from "../../shared/schemas/audit.js";
import {
  assignSensorResponseSchema,
  benchResponseSchema,
  layoutResponseSchema,
  sensorAssignmentsResponseSchema,
  siteResponseSchema,
  zoneResponseSchema,
  type LayoutResponse,
} from "../../shared/schemas/layout.js";
import { benchReadingsResponseSchema } from "../../shared/schemas/readings.js";
import { sensorSecretResponseSchema } from "../../shared/schemas/sensors.js";
import { benchWindowsResponseSchema, zoneWindowsResponseSchema } from "../../shared/schemas/windows.js";
import { zonesResponseSchema } from "../../shared/schemas/zones.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

/** Sites, zones and benches (create, edit, move, order, archive, restore) and sensor assignment history. */
let server: TestServer;
const token = {} as Record<"admin" | "manager" | "grower" | "viewer", string>;

beforeAll(async () => {
  server = await startTestServer({ ALERT_TICK: "1h" });
  for (const role of ["admin", "manager", "grower", "viewer"] as const) token[role] = await signIn(server, role);
});

afterAll(async () => {
  await server.cleanup();
});

function api(method: "get" | "put" | "post" | "patch" | "delete", path: string, role: keyof typeof token) {
  return request(server.baseUrl)[method](path).auth(token[role], { type: "bearer" });
}

const problem = (res: request.Response) => problemSchema.parse(JSON.parse(res.text));

async function getLayout(includeArchived = false): Promise<LayoutResponse> {
  return layoutResponseSchema.parse((await api("get", `/api/layout${includeArchived ? "?includeArchived=true" : ""}`, "viewer").expect(200)).body);
}

async function audit(query: string): Promise<AuditEntry[]> {
  return auditResponseSchema.parse((await api("get", `/api/audit?${query}`, "viewer").expect(200)).body).entries;
}

async function publishAir(credential: { id: string; secret: string }, points: { ageS: number; v: number }[]): Promise<void> {
  const nowS = Math.floor(Date.now() / 1000);
  const client = await connectSensor(server, credential);
  await client.publishAsync(
    `benchwarden/v1/sensors/${credential.id}/readings`,
    JSON.stringify(points.map((p) => ({ n: "air.temperature", u: "Cel", v: p.v, t: nowS - p.ageS }))),
    { qos: 1 },
  );
  await client.endAsync();
}

async function airReadingCount(benchId: number): Promise<number> {
  const res = await api("get", `/api/benches/${benchId}/readings?quantity=air.temperature`, "viewer").expect(200);
  return benchReadingsResponseSchema.parse(res.body).series[0]!.points.reduce((n, p) => n + p.count, 0);
}

async function dashboardBenchIds(): Promise<number[]> {
  const body = zonesResponseSchema.parse((await api("get", "/api/zones", "viewer").expect(200)).body);
  return body.zones.flatMap((z) => z.benches.map((b) => b.id));
}

describe("layout", () => {
  it("lists the demo nursery: one site, three zones, twelve benches with their sensors", async () => {
    const layout = await getLayout();
    expect(layout.sites).toHaveLength(1);
    expect(layout.zones).toHaveLength(3);
    expect(layout.benches).toHaveLength(12);
    expect(layout.benches[0]).toMatchObject({ position: 0, archivedAtMs: null, hasWindowOverrides: false });
    expect(layout.benches[0]!.sensors.map((s) => s.kind).sort()).toEqual(["air", "medium"]);
  });

  it("an admin creates a site, a zone (starting from the warm-rooting preset) and a manager a bench, each audited", async () => {
    const badZone = problem(await api("post", "/api/sites", "admin").send({ name: "Rowan Field", timeZone: "Mars/Olympus" }).expect(400));
    expect(badZone.errors).toEqual([{ path: "timeZone", message: "Choose a time zone such as America/Chicago" }]);

    const site = siteResponseSchema.parse((await api("post", "/api/sites", "admin").send({ name: "Rowan Field", timeZone: "Europe/London" }).expect(201)).body).site;
    const zone = zoneResponseSchema.parse((await api("post", "/api/zones", "admin").send({ siteId: site.id, name: "Tunnel A" }).expect(201)).body).zone;
    expect(zone).toMatchObject({ siteId: site.id, position: 0, archivedAtMs: null });
    const windows = zoneWindowsResponseSchema.parse((await api("get", `/api/zones/${zone.id}/windows`, "viewer").expect(200)).body);
    expect(windows.windows).toHaveLength(4);
    expect(windows.warnings).toEqual([]);

    // Zones are the admin's; benches the manager's too; a grower changes neither.
    await api("post", "/api/zones", "manager").send({ siteId: site.id, name: "Tunnel B" }).expect(403);
    await api("post", "/api/benches", "grower").send({ zoneId: zone.id, name: "Bench 1" }).expect(403);
    const bench = benchResponseSchema.parse((await api("post", "/api/benches", "manager").send({ zoneId: zone.id, name: "Bench 1" }).expect(201)).body).bench;
    expect(bench).toMatchObject({ zoneId: zone.id, position: 0, sensors: [], hasWindowOverrides: false });
    const second = benchResponseSchema.parse((await api("post", "/api/benches", "manager").send({ zoneId: zone.id, name: "Bench 2" }).expect(201)).body).bench;
    expect(second.position).toBe(1);

    const taken = problem(await api("post", "/api/benches", "manager").send({ zoneId: zone.id, name: "bench 1" }).expect(409));
    expect(taken).toMatchObject({ code: "bench-name-taken", errors: [{ path: "name", message: "This name is taken" }] });

    const trail = await audit(`zoneId=${zone.id}`);
    expect(trail.map((e) => [e.entityType, e.action])).toEqual([
      ["bench", "created"],
      ["bench", "created"],
      ["zone-windows", "preset-applied"],
      ["zone", "created"],
    ]);
    expect(trail[3]).toMatchObject({ actor: { name: "Imogen Vale", role: "admin" }, changes: expect.arrayContaining([expect.objectContaining({ field: "name", old: null, new: "Tunnel A" })]) });
    expect(trail[0]).toMatchObject({ actor: { name: "Tobias Fenwick", role: "manager" }, subject: "Tunnel A › Bench 2" });
    expect((await audit(`siteId=${site.id}&entityType=site`))[0]).toMatchObject({ action: "created", changes: [{ field: "name", new: "Rowan Field" }, { field: "timeZone", new: "Europe/London" }] });
  });

  it("a bench renamed and moved to another zone follows the new zone's windows, and both zones' trails show the move", async () => {
    const layout = await getLayout();
    const [h1, h2] = layout.zones;
    const bench = layout.benches.filter((b) => b.zoneId === h1!.id)[3]!;
    // Give house 2 a different air window, then move the bench there.
    const h2Windows = zoneWindowsResponseSchema.parse((await api("get", `/api/zones/${h2!.id}/windows`, "viewer").expect(200)).body);
    await api("put", `/api/zones/${h2!.id}/windows`, "manager")
      .send({ windows: h2Windows.windows.map((w) => (w.quantity === "air.temperature" ? { ...w, min: 22 } : w)), dewPointMarginC: 2 })
      .expect(200);

    const moved = benchResponseSchema.parse((await api("patch", `/api/benches/${bench.id}`, "manager").send({ zoneId: h2!.id, name: "Bench 5" }).expect(200)).body).bench;
    expect(moved).toMatchObject({ zoneId: h2!.id, name: "Bench 5" });
    const windows = benchWindowsResponseSchema.parse((await api("get", `/api/benches/${bench.id}/windows`, "viewer").expect(200)).body);
    expect(windows.effective[0]).toMatchObject({ source: "zone", window: { min: 22 } });

    const [entry] = await audit(`zoneId=${h1!.id}&entityType=bench`);
    expect(entry).toMatchObject({
      action: "updated",
      zoneId: h2!.id,
      previousZoneId: h1!.id,
      changes: [
        { field: "zoneId", kind: "reference", old: h1!.id, new: h2!.id, oldLabel: h1!.name, newLabel: h2!.name },
        { field: "name", kind: "text", old: bench.name, new: "Bench 5" },
      ],
    });
    expect((await audit(`zoneId=${h2!.id}&entityType=bench`))[0]!.id).toBe(entry!.id);
  });

  it("benches are put in a new walking order, audited; a list that is not the zone's benches is refused", async () => {
    const layout = await getLayout();
    const zone = layout.zones[2]!;
    const ids = layout.benches.filter((b) => b.zoneId === zone.id).map((b) => b.id);
    const reversed = [...ids].reverse();
    const res = layoutResponseSchema.parse((await api("put", `/api/zones/${zone.id}/bench-order`, "manager").send({ benchIds: reversed }).expect(200)).body);
    expect(res.benches.map((b) => b.id)).toEqual(reversed);
    expect(res.benches.map((b) => b.position)).toEqual([0, 1, 2, 3]);
    const [entry] = await audit(`zoneId=${zone.id}&entityType=zone`);
    expect(entry).toMatchObject({ action: "reordered", changes: [{ field: "benchOrder", old: "Bench 1, Bench 2, Bench 3, Bench 4", new: "Bench 4, Bench 3, Bench 2, Bench 1" }] });
    expect(problem(await api("put", `/api/zones/${zone.id}/bench-order`, "manager").send({ benchIds: ids.slice(1) }).expect(400)).errors?.[0]?.path).toBe("benchIds");
  });
});

describe("archive keeps history", () => {
  it("a bench with sensors is not archived; once its sensor is moved off, archiving hides it but keeps its readings, windows and history", async () => {
    const layout = await getLayout();
    const credential = server.credentials.find((c) => c.kind === "combined")!;
    const benchId = credential.benchId;
    await publishAir(credential, [{ ageS: 120, v: 22 }, { ageS: 60, v: 22.4 }]);
    expect(await airReadingCount(benchId)).toBe(2);

    const refused = problem(await api("post", `/api/benches/${benchId}/archive`, "manager").expect(409));
    expect(refused.code).toBe("sensors-still-assigned");
    expect(refused.detail).toContain(credential.id);

    // Move the probe to another bench (the admin's sensor page), then archive.
    const otherBench = layout.benches.find((b) => b.id !== benchId && b.sensors.length > 0)!;
    await api("patch", `/api/sensors/${credential.id}`, "admin").send({ benchId: otherBench.id }).expect(200);
    const archived = layoutResponseSchema.parse((await api("post", `/api/benches/${benchId}/archive`, "manager").expect(200)).body);
    expect(archived.benches[0]!.archivedAtMs).toEqual(expect.any(Number));

    expect(await dashboardBenchIds()).not.toContain(benchId);
    expect((await getLayout()).benches.map((b) => b.id)).not.toContain(benchId);
    expect((await getLayout(true)).benches.find((b) => b.id === benchId)?.archivedAtMs).toEqual(expect.any(Number));
    expect(await airReadingCount(benchId)).toBe(2);
    await api("get", `/api/benches/${benchId}/windows`, "viewer").expect(200);
    const history = sensorAssignmentsResponseSchema.parse((await api("get", `/api/benches/${benchId}/assignments`, "viewer").expect(200)).body);
    expect(history.assignments).toHaveLength(1);
    expect(history.assignments[0]).toMatchObject({ sensorId: credential.id, toMs: expect.any(Number) });

    // An archived bench takes no sensor and no window change…
    expect(problem(await api("patch", `/api/sensors/${credential.id}`, "admin").send({ benchId }).expect(400)).code).toBe("bench-archived");
    const w = benchWindowsResponseSchema.parse((await api("get", `/api/benches/${benchId}/windows`, "viewer").expect(200)).body);
    expect(problem(await api("put", `/api/benches/${benchId}/windows`, "manager").send({ windows: [], dewPointMarginC: w.overrides.dewPointMarginC ?? 1 }).expect(409)).code).toBe("bench-archived");

    // …until it is restored, audited both ways.
    await api("post", `/api/benches/${benchId}/restore`, "manager").expect(200);
    expect(await dashboardBenchIds()).toContain(benchId);
    const trail = await audit(`benchId=${benchId}&entityType=bench`);
    expect(trail.slice(0, 2).map((e) => e.action)).toEqual(["restored", "archived"]);
    expect(trail[1]!.changes[0]).toMatchObject({ field: "archivedAtMs", kind: "time", old: null, new: expect.any(Number) });
  });

  it("archiving a zone archives its benches; restoring the zone brings back what was archived with it", async () => {
    const site = siteResponseSchema.parse((await api("post", "/api/sites", "admin").send({ name: "Holly Yard", timeZone: "America/Chicago" }).expect(201)).body).site;
    const zone = zoneResponseSchema.parse((await api("post", "/api/zones", "admin").send({ siteId: site.id, name: "Cold frame", presetId: null }).expect(201)).body).zone;
    expect(zoneWindowsResponseSchema.parse((await api("get", `/api/zones/${zone.id}/windows`, "viewer").expect(200)).body).windows).toEqual([]);
    const kept = benchResponseSchema.parse((await api("post", "/api/benches", "manager").send({ zoneId: zone.id, name: "Frame 1" }).expect(201)).body).bench;
    const earlier = benchResponseSchema.parse((await api("post", "/api/benches", "manager").send({ zoneId: zone.id, name: "Frame 2" }).expect(201)).body).bench;
    await api("post", `/api/benches/${earlier.id}/archive`, "manager").expect(200);

    await api("post", `/api/zones/${zone.id}/archive`, "manager").expect(403);
    const archived = layoutResponseSchema.parse((await api("post", `/api/zones/${zone.id}/archive`, "admin").expect(200)).body);
    expect(archived.benches.map((b) => b.id)).toEqual([kept.id]);
    expect(problem(await api("post", "/api/benches", "manager").send({ zoneId: zone.id, name: "Frame 3" }).expect(409)).code).toBe("zone-archived");

    const restored = layoutResponseSchema.parse((await api("post", `/api/zones/${zone.id}/restore`, "admin").expect(200)).body);
    expect(restored.zones[0]!.archivedAtMs).toBeNull();
    expect(restored.benches.map((b) => [b.id, b.archivedAtMs])).toEqual([[kept.id, null]]);
    const all = await getLayout(true);
    expect(all.benches.find((b) => b.id === earlier.id)?.archivedAtMs).toEqual(expect.any(Number));

    // The site goes the same way with everything in it.
    const siteArchived = layoutResponseSchema.parse((await api("post", `/api/sites/${site.id}/archive`, "admin").expect(200)).body);
    expect(siteArchived.zones.map((z) => z.id)).toEqual([zone.id]);
    expect((await getLayout()).sites.map((s) => s.id)).not.toContain(site.id);
    expect(problem(await api("post", `/api/zones/${zone.id}/restore`, "admin").expect(409)).code).toBe("site-archived");
    const siteRestored = layoutResponseSchema.parse((await api("post", `/api/sites/${site.id}/restore`, "admin").expect(200)).body);
    expect(siteRestored.benches.map((b) => b.id)).toEqual([kept.id]);
    expect((await audit(`zoneId=${zone.id}&entityType=zone`)).map((e) => e.action)).toEqual(["restored", "archived", "restored", "archived", "created"]);
  });
});

describe("sensor assignment history", () => {
  it("a demo sensor's history starts when it was registered; a move closes one stretch and opens the next, and readings stay where they were taken", async () => {
    const layout = await getLayout();
    const credential = server.credentials.find((c) => c.kind === "air" && c.id.startsWith("h3-"))!;
    const from = credential.benchId;
    const to = layout.benches.find((b) => b.zoneId !== layout.benches.find((x) => x.id === from)!.zoneId)!;

    const before = sensorAssignmentsResponseSchema.parse((await api("get", `/api/sensors/${credential.id}/assignments`, "admin").expect(200)).body);
    expect(before.assignments).toEqual([expect.objectContaining({ benchId: from, toMs: null })]);

    await publishAir(credential, [{ ageS: 30, v: 23 }]);
    const fromCount = await airReadingCount(from);
    const toCount = await airReadingCount(to.id);
    const movedAt = Date.now();
    await api("patch", `/api/sensors/${credential.id}`, "admin").send({ benchId: to.id }).expect(200);
    await publishAir(credential, [{ ageS: 0, v: 24 }]);
    expect(await airReadingCount(from)).toBe(fromCount);
    expect(await airReadingCount(to.id)).toBe(toCount + 1);

    const after = sensorAssignmentsResponseSchema.parse((await api("get", `/api/sensors/${credential.id}/assignments`, "admin").expect(200)).body).assignments;
    expect(after).toHaveLength(2);
    expect(after[0]).toMatchObject({ benchId: to.id, benchName: to.name, toMs: null });
    expect(after[1]).toMatchObject({ benchId: from, toMs: after[0]!.fromMs });
    expect(after[0]!.fromMs).toBeGreaterThanOrEqual(movedAt);

    // Audited with who (the admin, through the sensors route), old → new bench by name, and both zones.
    const [entry] = await audit(`entityType=sensor-assignment&benchId=${to.id}`);
    const fromZone = layout.zones.find((z) => z.id === layout.benches.find((b) => b.id === from)!.zoneId)!;
    expect(entry).toMatchObject({
      action: "assigned",
      entityId: credential.id,
      actor: { name: "Imogen Vale", role: "admin" },
      zoneId: to.zoneId,
      previousZoneId: fromZone.id,
      changes: [{ field: "benchId", kind: "reference", old: from, new: to.id, oldLabel: expect.stringContaining(fromZone.name) }],
    });
    expect((await audit(`zoneId=${fromZone.id}&entityType=sensor-assignment`))[0]!.id).toBe(entry!.id);
  });

  it("a move dated in the past re-files the readings taken since then onto the new bench", async () => {
    const layout = await getLayout();
    const credential = server.credentials.find((c) => c.kind === "medium" && c.id.startsWith("h2-"))!;
    const target = layout.benches.find((b) => b.id !== credential.benchId)!;
    // The demo sensor has been on its bench since the server seeded it; take readings after that.
    const current = sensorAssignmentsResponseSchema.parse((await api("get", `/api/sensors/${credential.id}/assignments`, "admin").expect(200)).body).assignments[0]!;
    const sinceMs = current.fromMs;
    while (Date.now() < sinceMs + 3200) await new Promise((r) => setTimeout(r, 100));
    const client = await connectSensor(server, credential);
    const pack = [500, 1500, 2500].map((offsetMs) => ({ n: "medium.moisture", u: "/", v: 0.4, t: (sinceMs + offsetMs) / 1000 }));
    await client.publishAsync(`benchwarden/v1/sensors/${credential.id}/readings`, JSON.stringify(pack), { qos: 1 });
    await client.endAsync();

    const tooOld = problem(await api("post", `/api/sensors/${credential.id}/assignments`, "admin").send({ benchId: target.id, fromMs: Date.now() - 8 * 24 * 3600 * 1000 }).expect(400));
    expect(tooOld.errors).toEqual([{ path: "fromMs", message: "A move can be dated at most 7 days back" }]);
    const beforeCurrent = problem(await api("post", `/api/sensors/${credential.id}/assignments`, "admin").send({ benchId: target.id, fromMs: sinceMs - 1000 }).expect(400));
    expect(beforeCurrent.errors?.[0]).toEqual({ path: "fromMs", message: "The sensor was put on its current bench after that time" });
    await api("post", `/api/sensors/${credential.id}/assignments`, "manager").send({ benchId: target.id }).expect(403);

    const movedFromMs = sinceMs + 1000;
    const res = assignSensorResponseSchema.parse(
      (await api("post", `/api/sensors/${credential.id}/assignments`, "admin").send({ benchId: target.id, fromMs: movedFromMs }).expect(200)).body,
    );
    expect(res.readingsRefiled).toBe(2);
    expect(res.assignments[0]).toMatchObject({ benchId: target.id, fromMs: movedFromMs, toMs: null });
    expect(res.assignments[1]).toMatchObject({ benchId: credential.benchId, fromMs: sinceMs, toMs: movedFromMs });

    const moisture = async (benchId: number) =>
      benchReadingsResponseSchema.parse((await api("get", `/api/benches/${benchId}/readings?quantity=medium.moisture`, "viewer").expect(200)).body).series[0]!.points.reduce((n, p) => n + p.count, 0);
    expect(await moisture(target.id)).toBe(2);
    expect(await moisture(credential.benchId)).toBe(1);

    const [entry] = await audit("entityType=sensor-assignment");
    expect(entry).toMatchObject({
      actor: { role: "admin" },
      note: "Dated back; 2 readings re-filed to the new bench",
      changes: [{ field: "benchId" }, { field: "effectiveFromMs", kind: "time", new: movedFromMs }],
    });
  });

  it("registering a sensor on a bench opens its history and audits it", async () => {
    const bench = (await getLayout()).benches[5]!;
    const created = sensorSecretResponseSchema.parse((await api("post", "/api/sensors", "admin").send({ id: "spare-probe-7", kind: "combined", benchId: bench.id }).expect(201)).body);
    expect(created.sensor.benchId).toBe(bench.id);
    const history = sensorAssignmentsResponseSchema.parse((await api("get", `/api/benches/${bench.id}/assignments`, "viewer").expect(200)).body);
    expect(history.assignments[0]).toMatchObject({ sensorId: "spare-probe-7", toMs: null });
    const [entry] = await audit(`entityType=sensor-assignment&benchId=${bench.id}`);
    expect(entry).toMatchObject({ entityId: "spare-probe-7", changes: [{ field: "benchId", old: null, new: bench.id }] });
  });
});

describe("the audit list", () => {
  it("pages newest first with nextBefore", async () => {
    const first = auditResponseSchema.parse((await api("get", "/api/audit?limit=3", "viewer").expect(200)).body);
    expect(first.entries).toHaveLength(3);
    expect(first.nextBefore).toBe(first.entries[2]!.id);
    const second = auditResponseSchema.parse((await api("get", `/api/audit?limit=3&before=${first.nextBefore}`, "viewer").expect(200)).body);
    expect(second.entries[0]!.id).toBeLessThan(first.entries[2]!.id);
    expect(problem(await api("get", "/api/zones/9999/audit", "viewer").expect(404)).code).toBe("zone-not-found");
  });
});
