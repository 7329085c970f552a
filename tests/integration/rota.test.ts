import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../shared/api-error.js";
import { dutyCandidatesResponseSchema, dutyRotaResponseSchema, siteAlertTimingResponseSchema } from "../../shared/schemas/alerts.js";
import { auditResponseSchema, type AuditEntry } from "../../shared/schemas/audit.js";
import { zonesResponseSchema } from "../../shared/schemas/zones.js";
import { signIn, startTestServer, type TestServer } from "../support/test-server.js";

/** The duty rota and each site's alert timing: every change audited (who, when, old → new), bad input refused per field. */
let server: TestServer;
const token = {} as Record<"admin" | "manager" | "grower" | "viewer", string>;
let people: { id: number; name: string }[];
let zones: { id: number; name: string }[];

beforeAll(async () => {
  // The server's defaults, shown beside each site's own setting.
  server = await startTestServer({ ALERT_TICK: "1h", ALERT_ESCALATE_AFTER: "25m", ALERT_RENOTIFY_EVERY: "40m" });
  for (const role of ["admin", "manager", "grower", "viewer"] as const) token[role] = await signIn(server, role);
  people = dutyCandidatesResponseSchema.parse((await api("get", "/api/duty-rota/candidates", "manager").expect(200)).body).users;
  const zoneList = zonesResponseSchema.parse((await api("get", "/api/zones", "viewer").expect(200)).body);
  zones = zoneList.zones.map((z) => ({ id: z.id, name: z.name }));
});

afterAll(async () => {
  await server.cleanup();
});

function api(method: "get" | "put" | "post" | "delete", path: string, role: keyof typeof token) {
  return request(server.baseUrl)[method](path).auth(token[role], { type: "bearer" });
}

const problem = (res: request.Response) => problemSchema.parse(JSON.parse(res.text));

async function audit(query: string): Promise<AuditEntry[]> {
  return auditResponseSchema.parse((await api("get", `/api/audit?${query}`, "viewer").expect(200)).body).entries;
}

/** field → [old shown, new shown], from an entry's changes (labels where the server gave them). */
function fieldsOf(entry: AuditEntry): Record<string, [unknown, unknown]> {
  return Object.fromEntries(entry.changes.map((c) => [c.field, [c.oldLabel ?? c.old, c.newLabel ?? c.new]]));
}

const person = (name: string) => people.find((p) => p.name === name)!;

describe("duty rota changes are audited", () => {
  it("adding a shift records who added it, when, and each field from nothing to its value", async () => {
    const grower = person("Marisol Ortega");
    const zone = zones[1]!;
    const beforeMs = Date.now();
    const res = await api("post", "/api/duty-rota/shifts", "manager")
      .send({ zoneId: zone.id, userId: grower.id, weekdays: 0b0111110, startMinute: 22 * 60, endMinute: 6 * 60, isFallback: false })
      .expect(201);
    const shiftId = res.body.shift.id as number;

    const [entry] = await audit("entityType=duty-rota");
    expect(entry).toMatchObject({
      entityType: "duty-rota",
      entityId: String(shiftId),
      action: "created",
      subject: `Marisol Ortega · ${zone.name}`,
      zoneId: zone.id,
      actor: { name: "Tobias Fenwick", role: "manager" },
    });
    expect(entry!.atMs).toBeGreaterThanOrEqual(beforeMs);
    expect(entry!.atMs).toBeLessThanOrEqual(Date.now());
    expect(fieldsOf(entry!)).toEqual({
      userId: [null, "Marisol Ortega"],
      zoneId: [null, zone.name],
      weekdays: [null, "Mon–Fri"],
      startMinute: [null, "22:00"],
      endMinute: [null, "06:00"],
      isFallback: [null, false],
    });
    // The raw values stay beside the labels.
    expect(entry!.changes.find((c) => c.field === "userId")).toMatchObject({ kind: "reference", new: grower.id });
    // …and it is in that zone's own trail.
    const zoneTrail = auditResponseSchema.parse((await api("get", `/api/zones/${zone.id}/audit`, "viewer").expect(200)).body).entries;
    expect(zoneTrail[0]!.id).toBe(entry!.id);
  });

  it("changing a shift records only what changed, old → new; every zone reads as such", async () => {
    const grower = person("Marisol Ortega");
    const manager = person("Tobias Fenwick");
    const zone = zones[0]!;
    const created = await api("post", "/api/duty-rota/shifts", "admin")
      .send({ zoneId: zone.id, userId: grower.id, weekdays: 0b1111111, startMinute: 18 * 60, endMinute: 7 * 60, isFallback: false })
      .expect(201);
    const shiftId = created.body.shift.id as number;

    await api("put", `/api/duty-rota/shifts/${shiftId}`, "manager")
      .send({ zoneId: null, userId: manager.id, weekdays: 0b1000001, startMinute: 20 * 60, endMinute: 7 * 60, isFallback: true })
      .expect(200);

    const [entry] = await audit("entityType=duty-rota");
    expect(entry).toMatchObject({ entityId: String(shiftId), action: "updated", subject: "Tobias Fenwick · Every zone", actor: { name: "Tobias Fenwick", role: "manager" } });
    expect(fieldsOf(entry!)).toEqual({
      userId: ["Marisol Ortega", "Tobias Fenwick"],
      zoneId: [zone.name, "Every zone"],
      weekdays: ["Every day", "Sat, Sun"],
      startMinute: ["18:00", "20:00"],
      isFallback: [false, true],
    });
    // It left the zone: the zone's trail still shows it.
    expect(entry!.previousZoneId).toBe(zone.id);
    expect((await audit(`zoneId=${zone.id}&entityType=duty-rota`))[0]!.id).toBe(entry!.id);

    // Saving the same shift again changes nothing and records nothing.
    await api("put", `/api/duty-rota/shifts/${shiftId}`, "manager")
      .send({ zoneId: null, userId: manager.id, weekdays: 0b1000001, startMinute: 20 * 60, endMinute: 7 * 60, isFallback: true })
      .expect(200);
    expect((await audit("entityType=duty-rota"))[0]!.id).toBe(entry!.id);
  });

  it("removing a shift records what it was, and by whom", async () => {
    const grower = person("Marisol Ortega");
    const created = await api("post", "/api/duty-rota/shifts", "manager")
      .send({ zoneId: null, userId: grower.id, weekdays: 0b0000001, startMinute: 0, endMinute: 1440, isFallback: false })
      .expect(201);
    const shiftId = created.body.shift.id as number;

    await api("delete", `/api/duty-rota/shifts/${shiftId}`, "admin").expect(204);

    const [entry] = await audit("entityType=duty-rota");
    expect(entry).toMatchObject({ entityId: String(shiftId), action: "deleted", subject: "Marisol Ortega · Every zone", actor: { name: "Imogen Vale", role: "admin" } });
    expect(fieldsOf(entry!)).toEqual({
      userId: ["Marisol Ortega", null],
      zoneId: ["Every zone", null],
      weekdays: ["Sun", null],
      startMinute: ["00:00", null],
      endMinute: ["24:00", null],
      isFallback: [false, null],
    });
    const rota = dutyRotaResponseSchema.parse((await api("get", "/api/duty-rota", "viewer").expect(200)).body);
    expect(rota.shifts.map((s) => s.id)).not.toContain(shiftId);
  });

  it("a refused change leaves no entry", async () => {
    const before = (await audit("entityType=duty-rota"))[0]!.id;
    const viewer = (await api("get", "/api/users", "admin").expect(200)).body.users.find((u: { role: string }) => u.role === "viewer") as { id: number };
    const res = await api("post", "/api/duty-rota/shifts", "manager")
      .send({ zoneId: null, userId: viewer.id, weekdays: 127, startMinute: 0, endMinute: 60, isFallback: false })
      .expect(400);
    expect(problem(res).code).toBe("viewer-cannot-be-on-duty");
    expect(problem((await api("delete", "/api/duty-rota/shifts/99999", "manager").expect(404))).code).toBe("shift-not-found");
    expect((await audit("entityType=duty-rota"))[0]!.id).toBe(before);
  });
});

describe("a site's alert timing", () => {
  it("is read with the duty rota, each site's own setting beside the server's default", async () => {
    const rota = dutyRotaResponseSchema.parse((await api("get", "/api/duty-rota", "grower").expect(200)).body);
    expect(rota.alertTiming).toEqual([
      { siteId: expect.any(Number), siteName: "Hollin Lane Nursery", escalateAfterS: null, renotifyEveryS: null, defaultEscalateAfterS: 25 * 60, defaultRenotifyEveryS: 40 * 60 },
    ]);
  });

  it("a manager sets it; the change is audited old → new in words; back to the default is audited too", async () => {
    const siteId = dutyRotaResponseSchema.parse((await api("get", "/api/duty-rota", "viewer").expect(200)).body).alertTiming[0]!.siteId;
    const saved = await api("put", `/api/sites/${siteId}/alert-timing`, "manager").send({ escalateAfterS: 15 * 60, renotifyEveryS: 90 * 60 }).expect(200);
    expect(siteAlertTimingResponseSchema.parse(saved.body).alertTiming).toMatchObject({ siteId, escalateAfterS: 900, renotifyEveryS: 5400 });
    expect(dutyRotaResponseSchema.parse((await api("get", "/api/duty-rota", "viewer").expect(200)).body).alertTiming[0]).toMatchObject({ escalateAfterS: 900, renotifyEveryS: 5400 });

    const [entry] = await audit(`siteId=${siteId}&entityType=site`);
    expect(entry).toMatchObject({ action: "updated", subject: "Hollin Lane Nursery", actor: { name: "Tobias Fenwick", role: "manager" } });
    expect(fieldsOf(entry!)).toEqual({
      escalateAfterS: ["25 minutes (the default)", "15 minutes"],
      renotifyEveryS: ["40 minutes (the default)", "1 hour 30 minutes"],
    });
    expect(entry!.changes.map((c) => [c.kind, c.old, c.new])).toEqual([
      ["duration", null, 900],
      ["duration", null, 5400],
    ]);

    await api("put", `/api/sites/${siteId}/alert-timing`, "admin").send({ escalateAfterS: 15 * 60, renotifyEveryS: null }).expect(200);
    const [back] = await audit(`siteId=${siteId}&entityType=site`);
    expect(back).toMatchObject({ actor: { name: "Imogen Vale", role: "admin" } });
    expect(fieldsOf(back!)).toEqual({ renotifyEveryS: ["1 hour 30 minutes", "40 minutes (the default)"] });
  });

  it("values outside the bounds are refused with the reason on each field, and nothing changes", async () => {
    const siteId = dutyRotaResponseSchema.parse((await api("get", "/api/duty-rota", "viewer").expect(200)).body).alertTiming[0]!.siteId;
    const lastEntry = (await audit("entityType=site"))[0]!.id;
    const res = await api("put", `/api/sites/${siteId}/alert-timing`, "manager").send({ escalateAfterS: 60, renotifyEveryS: 13 * 3600 }).expect(400);
    expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect(problem(res).errors).toEqual(
      expect.arrayContaining([
        { path: "escalateAfterS", message: "Choose between 5 minutes and 12 hours" },
        { path: "renotifyEveryS", message: "Choose between 10 minutes and 12 hours" },
      ]),
    );
    const partMinute = await api("put", `/api/sites/${siteId}/alert-timing`, "manager").send({ escalateAfterS: 630, renotifyEveryS: null }).expect(400);
    expect(problem(partMinute).errors).toEqual([{ path: "escalateAfterS", message: "Use whole minutes" }]);
    expect(problem(await api("put", "/api/sites/99999/alert-timing", "manager").send({ escalateAfterS: null, renotifyEveryS: null }).expect(404)).code).toBe("site-not-found");
    expect((await audit("entityType=site"))[0]!.id).toBe(lastEntry);
    expect(dutyRotaResponseSchema.parse((await api("get", "/api/duty-rota", "viewer").expect(200)).body).alertTiming[0]).toMatchObject({ escalateAfterS: 900, renotifyEveryS: null });
  });

  it("a grower or a viewer may read it but not change it", async () => {
    const siteId = dutyRotaResponseSchema.parse((await api("get", "/api/duty-rota", "viewer").expect(200)).body).alertTiming[0]!.siteId;
    for (const role of ["grower", "viewer"] as const) {
      expect(problem(await api("put", `/api/sites/${siteId}/alert-timing`, role).send({ escalateAfterS: null, renotifyEveryS: null }).expect(403)).code).toBe("forbidden");
    }
  });
});
