import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../shared/api-error.js";
import { alertsResponseSchema } from "../../shared/schemas/alerts.js";
import { auditResponseSchema, type AuditEntry } from "../../shared/schemas/audit.js";
import { layoutResponseSchema, type LayoutResponse } from "../../shared/schemas/layout.js";
import {
  benchWindowsResponseSchema,
  benchWindowsSaveResponseSchema,
  windowPresetResponseSchema,
  windowPresetsResponseSchema,
  zoneWindowsResponseSchema,
  zoneWindowsSaveResponseSchema,
  type QuantityWindow,
  type ZoneWindowsInput,
} from "../../shared/schemas/windows.js";
import { zonesResponseSchema } from "../../shared/schemas/zones.js";
import { fahrenheitToCelsius } from "../../shared/domain/units.js";
import { DEMO_WINDOW } from "../../server/demo/seed.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

/**
 * Zone windows, bench overrides, presets, validation and warnings, and the audit trail, over HTTP
 * against the real server (demo nursery: three zones of four benches, every zone on the demo window).
 */
let server: TestServer;
const token = {} as Record<"admin" | "manager" | "grower" | "viewer", string>;
let layout: LayoutResponse;

beforeAll(async () => {
  // The engine's timer is off; the test runs its round itself (server.alerts.pass()).
  server = await startTestServer({ ALERT_TICK: "1h" });
  for (const role of ["admin", "manager", "grower", "viewer"] as const) token[role] = await signIn(server, role);
  layout = layoutResponseSchema.parse((await api("get", "/api/layout", "viewer").expect(200)).body);
});

afterAll(async () => {
  await server.cleanup();
});

function api(method: "get" | "put" | "post" | "patch" | "delete", path: string, role: keyof typeof token) {
  return request(server.baseUrl)[method](path).auth(token[role], { type: "bearer" });
}

function problem(res: request.Response) {
  expect(res.headers["content-type"]).toMatch(/application\/problem\+json/);
  return problemSchema.parse(JSON.parse(res.text));
}

const zoneIds = () => layout.zones.map((z) => z.id);
const benchesOf = (zoneId: number) => layout.benches.filter((b) => b.zoneId === zoneId);

async function zoneWindows(zoneId: number) {
  return zoneWindowsResponseSchema.parse((await api("get", `/api/zones/${zoneId}/windows`, "viewer").expect(200)).body);
}

async function zoneAudit(zoneId: number): Promise<AuditEntry[]> {
  return auditResponseSchema.parse((await api("get", `/api/zones/${zoneId}/audit`, "viewer").expect(200)).body).entries;
}

function withWindow(set: { windows: QuantityWindow[]; dewPointMarginC: number }, change: Partial<QuantityWindow> & Pick<QuantityWindow, "quantity">): ZoneWindowsInput {
  return { windows: set.windows.map((w) => (w.quantity === change.quantity ? { ...w, ...change } : w)), dewPointMarginC: set.dewPointMarginC };
}

describe("zone windows", () => {
  it("reads a zone's windows in stored units with its dew-point margin (2 °C by default) and the guidance warnings", async () => {
    const body = await zoneWindows(zoneIds()[0]!);
    expect(body.windows.map((w) => w.quantity)).toEqual(["air.temperature", "air.humidity", "medium.temperature", "medium.moisture"]);
    expect(body.windows[0]).toMatchObject({ min: DEMO_WINDOW["air.temperature"].min, max: DEMO_WINDOW["air.temperature"].max });
    expect(body.dewPointMarginC).toBe(2);
    // The demo starts from the "Warm rooting" preset, which leaves every guidance alone.
    expect(body.warnings).toEqual([]);
    expect(body.benchOverrides).toEqual([]);
  });

  it("when a manager saves an air minimum below about 70 °F, then it is saved with the warning and its source, and audited old → new with who and when", async () => {
    const zoneId = zoneIds()[0]!;
    const before = await zoneWindows(zoneId);
    const startedMs = Date.now();
    const res = await api("put", `/api/zones/${zoneId}/windows`, "manager")
      .send(withWindow(before, { quantity: "air.temperature", min: fahrenheitToCelsius(68) }))
      .expect(200);
    const saved = zoneWindowsSaveResponseSchema.parse(res.body);
    expect(saved).toMatchObject({ dryRun: false, changed: true });
    expect(saved.windows[0]!.min).toBeCloseTo(20, 10);
    const warning = saved.warnings.find((w) => w.code === "air-min-below-rooting");
    expect(warning).toMatchObject({ quantity: "air.temperature", field: "min", source: { basis: "common-practice", reference: "REFERENCES.md §6" } });
    expect(warning!.message).toContain("70 °F (21 °C)");

    const [entry] = await zoneAudit(zoneId);
    expect(entry).toMatchObject({
      entityType: "zone-windows",
      action: "updated",
      zoneId,
      actor: { name: "Tobias Fenwick", role: "manager" },
      changes: [{ field: "min", quantity: "air.temperature", kind: "temperature", old: DEMO_WINDOW["air.temperature"].min, new: fahrenheitToCelsius(68), oldLabel: null, newLabel: null }],
    });
    expect(entry!.atMs).toBeGreaterThanOrEqual(startedMs);
    expect(entry!.atMs).toBeLessThanOrEqual(Date.now());

    // …and in the one list of every change.
    const all = auditResponseSchema.parse((await api("get", "/api/audit", "viewer").expect(200)).body);
    expect(all.entries.map((e) => e.id)).toContain(entry!.id);
  });

  it("when the values are unchanged, then nothing is saved or audited (changed: false)", async () => {
    const zoneId = zoneIds()[0]!;
    const before = await zoneWindows(zoneId);
    const auditBefore = await zoneAudit(zoneId);
    const res = await api("put", `/api/zones/${zoneId}/windows`, "manager").send({ windows: before.windows, dewPointMarginC: before.dewPointMarginC }).expect(200);
    expect(zoneWindowsSaveResponseSchema.parse(res.body).changed).toBe(false);
    expect(await zoneAudit(zoneId)).toEqual(auditBefore);
  });

  it("a dry run validates and answers the warnings, and saves and audits nothing", async () => {
    const zoneId = zoneIds()[1]!;
    const before = await zoneWindows(zoneId);
    const res = await api("put", `/api/zones/${zoneId}/windows?dryRun=true`, "manager")
      .send(withWindow(before, { quantity: "medium.moisture", max: 0.62 }))
      .expect(200);
    const body = zoneWindowsSaveResponseSchema.parse(res.body);
    expect(body).toMatchObject({ dryRun: true, changed: true });
    expect(body.warnings.find((w) => w.code === "moisture-max-saturated")?.source.reference).toBe("REFERENCES.md §7");
    expect((await zoneWindows(zoneId)).windows).toEqual(before.windows);
    expect(await zoneAudit(zoneId)).toEqual([]);
  });

  it("when min is above max (the client bypassed), then the server refuses it with the reason on the field and stores nothing", async () => {
    const zoneId = zoneIds()[1]!;
    const before = await zoneWindows(zoneId);
    const res = await api("put", `/api/zones/${zoneId}/windows`, "manager")
      .send(withWindow(before, { quantity: "air.temperature", min: 27, max: 21 }))
      .expect(400);
    const p = problem(res);
    expect(p.code).toBe("invalid-input");
    expect(p.errors).toContainEqual({ path: "windows.0.min", message: "The minimum must be below the maximum" });
    expect((await zoneWindows(zoneId)).windows).toEqual(before.windows);
  });

  it("refuses a value outside the probes' range, a negative delay and a band wider than the window, each on its field", async () => {
    const zoneId = zoneIds()[1]!;
    const before = await zoneWindows(zoneId);
    const body = {
      windows: before.windows.map((w) =>
        w.quantity === "medium.moisture" ? { ...w, max: 1.4 } : w.quantity === "air.humidity" ? { ...w, delayS: -5 } : w.quantity === "medium.temperature" ? { ...w, hysteresis: 9 } : w,
      ),
      dewPointMarginC: 12,
    };
    const p = problem(await api("put", `/api/zones/${zoneId}/windows`, "admin").send(body).expect(400));
    expect(p.errors?.map((e) => e.path).sort()).toEqual(["dewPointMarginC", "windows.1.delayS", "windows.2.hysteresis", "windows.3.max"]);
    expect(p.errors?.find((e) => e.path === "windows.3.max")?.message).toMatch(/0 to 100 % VWC/);
  });

  it("a grower and a viewer read the windows but may not save them", async () => {
    const zoneId = zoneIds()[2]!;
    const before = await zoneWindows(zoneId);
    for (const role of ["grower", "viewer"] as const) {
      await api("get", `/api/zones/${zoneId}/windows`, role).expect(200);
      const res = await api("put", `/api/zones/${zoneId}/windows`, role).send({ windows: before.windows, dewPointMarginC: 2 }).expect(403);
      expect(problem(res).code).toBe("forbidden");
    }
  });
});

describe("bench overrides", () => {
  it("an override shows where it differs from the zone, is in force on the dashboard, and is audited on the bench", async () => {
    const zoneId = zoneIds()[2]!;
    const bench = benchesOf(zoneId)[1]!;
    const zone = await zoneWindows(zoneId);
    const medium = zone.windows.find((w) => w.quantity === "medium.temperature")!;
    const res = await api("put", `/api/benches/${bench.id}/windows`, "manager")
      .send({ windows: [{ ...medium, min: 23 }], dewPointMarginC: 1.5 })
      .expect(200);
    const saved = benchWindowsSaveResponseSchema.parse(res.body);
    expect(saved.changed).toBe(true);

    const body = benchWindowsResponseSchema.parse((await api("get", `/api/benches/${bench.id}/windows`, "grower").expect(200)).body);
    const byQuantity = Object.fromEntries(body.effective.map((e) => [e.quantity, e]));
    expect(byQuantity["medium.temperature"]).toMatchObject({ source: "bench", differingFields: ["min"], window: { min: 23, max: medium.max }, zoneWindow: { min: medium.min } });
    expect(byQuantity["air.temperature"]).toMatchObject({ source: "zone", differingFields: [] });
    expect(body.dewPointMargin).toEqual({ valueC: 1.5, source: "bench", differsFromZone: true });
    expect(body.overrides.windows.map((w) => w.quantity)).toEqual(["medium.temperature"]);

    expect((await zoneWindows(zoneId)).benchOverrides).toEqual([{ benchId: bench.id, benchName: bench.name, quantities: ["medium.temperature"], dewPointMarginC: 1.5 }]);
    const layoutNow = layoutResponseSchema.parse((await api("get", "/api/layout", "viewer").expect(200)).body);
    expect(layoutNow.benches.find((b) => b.id === bench.id)?.hasWindowOverrides).toBe(true);

    const dashboard = zonesResponseSchema.parse((await api("get", "/api/zones", "viewer").expect(200)).body);
    const card = dashboard.zones.flatMap((z) => z.benches).find((b) => b.id === bench.id)!;
    expect(card.windows.find((w) => w.quantity === "medium.temperature")?.min).toBe(23);

    const audit = auditResponseSchema.parse((await api("get", `/api/audit?benchId=${bench.id}`, "viewer").expect(200)).body);
    expect(audit.entries[0]).toMatchObject({
      entityType: "bench-windows",
      benchId: bench.id,
      zoneId,
      actor: { role: "manager" },
      changes: [
        { field: "min", quantity: "medium.temperature", kind: "temperature", old: null, new: 23 },
        { field: "max", quantity: "medium.temperature", old: null, new: medium.max },
        { field: "delayS", quantity: "medium.temperature", kind: "duration", old: null, new: medium.delayS },
        { field: "hysteresis", quantity: "medium.temperature", kind: "temperature-difference", old: null, new: medium.hysteresis },
        { field: "dewPointMarginC", kind: "temperature-difference", old: null, new: 1.5 },
      ],
    });
  });

  it("removing every override makes the bench follow its zone again", async () => {
    const bench = benchesOf(zoneIds()[2]!)[1]!;
    await api("put", `/api/benches/${bench.id}/windows`, "admin").send({ windows: [], dewPointMarginC: null }).expect(200);
    const body = benchWindowsResponseSchema.parse((await api("get", `/api/benches/${bench.id}/windows`, "viewer").expect(200)).body);
    expect(body.effective.every((e) => e.source === "zone" && e.differingFields.length === 0)).toBe(true);
    expect(body.dewPointMargin).toEqual({ valueC: 2, source: "zone", differsFromZone: false });
  });
});

describe("presets", () => {
  it("lists the three built-in presets with the source of every value", async () => {
    const { presets } = windowPresetsResponseSchema.parse((await api("get", "/api/window-presets", "viewer").expect(200)).body);
    expect(presets.filter((p) => p.builtIn).map((p) => p.id)).toEqual(["warm-rooting", "graft-callusing", "hardening-off"]);
    const warm = presets[0]!;
    expect(warm.notes.find((n) => n.quantity === "air.temperature")?.source).toMatchObject({ basis: "common-practice", reference: "REFERENCES.md §6" });
  });

  it("a manager saves a preset of their own, applies it to a zone, and the audit names the preset", async () => {
    const zoneId = zoneIds()[1]!;
    const created = windowPresetResponseSchema.parse(
      (
        await api("post", "/api/window-presets", "manager")
          .send({
            name: "Late-season figs",
            description: "A touch cooler for the last stick of the season",
            windows: [
              { quantity: "air.temperature", min: 20.5, max: 26, delayS: 900, hysteresis: 0.5 },
              { quantity: "medium.temperature", min: 21, max: 24, delayS: 900, hysteresis: 0.5 },
            ],
            dewPointMarginC: 2,
          })
          .expect(201)
      ).body,
    );
    expect(created.preset).toMatchObject({ builtIn: false, name: "Late-season figs" });
    expect(created.warnings.map((w) => w.code)).toEqual(["air-min-below-rooting"]);

    const applied = zoneWindowsSaveResponseSchema.parse(
      (await api("post", `/api/zones/${zoneId}/windows/preset`, "manager").send({ presetId: created.preset.id }).expect(200)).body,
    );
    expect(applied.windows).toEqual(created.preset.windows);
    expect((await zoneWindows(zoneId)).windows).toEqual(created.preset.windows);

    const [entry] = await zoneAudit(zoneId);
    expect(entry).toMatchObject({ entityType: "zone-windows", action: "preset-applied", note: "Preset “Late-season figs” applied" });
    // Humidity and moisture windows the preset does not hold are removed: new null.
    expect(entry!.changes).toContainEqual(expect.objectContaining({ field: "min", quantity: "air.humidity", new: null }));

    // Back to a built-in.
    await api("post", `/api/zones/${zoneId}/windows/preset`, "manager").send({ presetId: "warm-rooting" }).expect(200);
    expect((await zoneWindows(zoneId)).windows.map((w) => w.quantity)).toEqual(["air.temperature", "air.humidity", "medium.temperature", "medium.moisture"]);

    // Renamed, then deleted; the zones keep what they were given.
    await api("patch", `/api/window-presets/${created.preset.id}`, "manager").send({ name: "Late figs" }).expect(200);
    await api("delete", `/api/window-presets/${created.preset.id}`, "manager").expect(204);
    const presetAudit = auditResponseSchema.parse((await api("get", "/api/audit?entityType=window-preset", "viewer").expect(200)).body);
    expect(presetAudit.entries.map((e) => e.action)).toEqual(["deleted", "updated", "created"]);
  });

  it("built-in presets cannot be changed, and preset names are unique", async () => {
    expect(problem(await api("patch", "/api/window-presets/warm-rooting", "manager").send({ name: "Mine now" }).expect(409)).code).toBe("preset-built-in");
    expect(problem(await api("delete", "/api/window-presets/warm-rooting", "manager").expect(409)).code).toBe("preset-built-in");
    const taken = problem(
      await api("post", "/api/window-presets", "manager")
        .send({ name: "warm rooting", windows: [{ quantity: "air.temperature", min: 21, max: 26, delayS: 600, hysteresis: 0.5 }], dewPointMarginC: 2 })
        .expect(409),
    );
    expect(taken).toMatchObject({ code: "preset-name-taken", errors: [{ path: "name", message: "This name is taken" }] });
    expect(problem(await api("post", `/api/zones/${zoneIds()[0]}/windows/preset`, "manager").send({ presetId: "no-such" }).expect(404)).code).toBe("preset-not-found");
  });

  it("a preset create or update with dryRun answers the guidance warnings and saves nothing, not even an audit entry", async () => {
    const body = {
      name: "Cool stick, trial",
      description: "",
      windows: [{ quantity: "air.temperature", min: fahrenheitToCelsius(64), max: 26, delayS: 600, hysteresis: 0.5 }],
      dewPointMarginC: 2,
    };
    const presetCount = async () => windowPresetsResponseSchema.parse((await api("get", "/api/window-presets", "viewer").expect(200)).body).presets.length;
    const auditCount = async () => auditResponseSchema.parse((await api("get", "/api/audit?entityType=window-preset", "viewer").expect(200)).body).entries.length;
    const [presetsBefore, auditBefore] = [await presetCount(), await auditCount()];

    const dry = windowPresetResponseSchema.parse((await api("post", "/api/window-presets?dryRun=true", "manager").send(body).expect(200)).body);
    expect(dry).toMatchObject({ dryRun: true, changed: true, preset: { id: null, name: "Cool stick, trial", builtIn: false } });
    expect(dry.warnings.map((w) => w.code)).toEqual(["air-min-below-rooting"]);
    expect(dry.warnings[0]!.source.basis).toBe("common-practice");
    expect([await presetCount(), await auditCount()]).toEqual([presetsBefore, auditBefore]);

    // The checks of a save run on a dry run too: the schema (min above max) and a free name.
    const invalid = problem(
      await api("post", "/api/window-presets?dryRun=true", "manager")
        .send({ ...body, windows: [{ ...body.windows[0], min: 30, max: 26 }] })
        .expect(400),
    );
    expect(invalid.errors).toContainEqual({ path: "windows.0.min", message: "The minimum must be below the maximum" });
    expect(problem(await api("post", "/api/window-presets?dryRun=1", "manager").send({ ...body, name: "Warm rooting" }).expect(409)).code).toBe("preset-name-taken");
    expect(problem(await api("post", "/api/window-presets?dryRun=maybe", "manager").send(body).expect(400)).errors?.[0]?.path).toBe("dryRun");
    expect(await presetCount()).toBe(presetsBefore);

    const created = windowPresetResponseSchema.parse((await api("post", "/api/window-presets", "manager").send(body).expect(201)).body);
    expect(created).toMatchObject({ dryRun: false, changed: true });
    const id = created.preset.id!;
    // An update's dry run: the would-be preset under its own id, warnings of the new values, the stored one untouched.
    const fixed = [{ ...body.windows[0]!, min: fahrenheitToCelsius(71) }];
    const dryUpdate = windowPresetResponseSchema.parse((await api("patch", `/api/window-presets/${id}?dryRun=true`, "manager").send({ windows: fixed }).expect(200)).body);
    expect(dryUpdate).toMatchObject({ dryRun: true, changed: true, preset: { id, name: "Cool stick, trial" }, warnings: [] });
    const stored = windowPresetsResponseSchema.parse((await api("get", "/api/window-presets", "viewer").expect(200)).body).presets.find((p) => p.id === id)!;
    expect(stored.windows[0]!.min).toBeCloseTo(fahrenheitToCelsius(64), 10);
    // The same values as stored: nothing would change.
    expect(windowPresetResponseSchema.parse((await api("patch", `/api/window-presets/${id}?dryRun=true`, "manager").send({ windows: body.windows }).expect(200)).body).changed).toBe(false);
    expect(problem(await api("patch", "/api/window-presets/warm-rooting?dryRun=true", "manager").send({ name: "Mine now" }).expect(409)).code).toBe("preset-built-in");
    // Viewers may not even ask.
    expect(problem(await api("post", "/api/window-presets?dryRun=true", "viewer").send(body).expect(403)).code).toBe("forbidden");
    expect(await auditCount()).toBe(auditBefore + 1); // the one real creation
    await api("delete", `/api/window-presets/${id}`, "manager").expect(204);
  });

  it("applying a preset with clearBenchOverrides removes the zone's bench overrides, each audited", async () => {
    const zoneId = zoneIds()[0]!;
    const bench = benchesOf(zoneId)[0]!;
    const zone = await zoneWindows(zoneId);
    await api("put", `/api/benches/${bench.id}/windows`, "manager").send({ windows: [zone.windows[0]!].map((w) => ({ ...w, max: 26 })), dewPointMarginC: null }).expect(200);
    expect((await zoneWindows(zoneId)).benchOverrides).toHaveLength(1);

    const dry = zoneWindowsSaveResponseSchema.parse(
      (await api("post", `/api/zones/${zoneId}/windows/preset?dryRun=1`, "manager").send({ presetId: "graft-callusing", clearBenchOverrides: true }).expect(200)).body,
    );
    expect(dry).toMatchObject({ dryRun: true, benchOverrides: [] });
    expect((await zoneWindows(zoneId)).benchOverrides).toHaveLength(1);

    await api("post", `/api/zones/${zoneId}/windows/preset`, "manager").send({ presetId: "graft-callusing", clearBenchOverrides: true }).expect(200);
    const after = await zoneWindows(zoneId);
    expect(after.benchOverrides).toEqual([]);
    expect(after.dewPointMarginC).toBe(1.5);
    const entries = await zoneAudit(zoneId);
    expect(entries.slice(0, 2).map((e) => [e.entityType, e.action])).toEqual([
      ["bench-windows", "updated"],
      ["zone-windows", "preset-applied"],
    ]);
    expect(entries[0]!.note).toMatch(/Overrides removed when preset “Graft callusing” was applied/);
  });

  it("a preset can be applied to one bench as its overrides", async () => {
    const bench = benchesOf(zoneIds()[2]!)[3]!;
    const res = await api("post", `/api/benches/${bench.id}/windows/preset`, "manager").send({ presetId: "hardening-off" }).expect(200);
    const body = benchWindowsSaveResponseSchema.parse(res.body);
    expect(body.effective.every((e) => e.source === "bench")).toBe(true);
    expect(body.effective.find((e) => e.quantity === "air.temperature")).toMatchObject({ window: { min: 18 }, differingFields: ["min", "max", "delayS"] });
    expect(body.warnings.map((w) => w.code)).toContain("air-min-below-rooting");
  });
});

describe("a window change reaches the next evaluation", () => {
  it("moves an in-window bench out, and back, at the next read of /api/zones and the next alert round", async () => {
    // A combined probe in the second house: air 22.5 °C is inside 70–80 °F (21.1–26.7 °C).
    const zoneId = zoneIds()[1]!;
    await api("post", `/api/zones/${zoneId}/windows/preset`, "manager").send({ presetId: "warm-rooting" });
    const credential = server.credentials.find((c) => c.kind === "combined" && benchesOf(zoneId).some((b) => b.id === c.benchId))!;
    const client = await connectSensor(server, credential);
    await client.publishAsync(`benchwarden/v1/sensors/${credential.id}/readings`, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 22.5 }]), { qos: 1 });
    await client.endAsync();

    const airStatus = async () => {
      const dashboard = zonesResponseSchema.parse((await api("get", "/api/zones", "viewer").expect(200)).body);
      return dashboard.zones.flatMap((z) => z.benches).find((b) => b.id === credential.benchId)!.latest.find((l) => l.quantity === "air.temperature")!.status;
    };
    expect(await airStatus()).toBe("inside");

    const zone = await zoneWindows(zoneId);
    await api("put", `/api/zones/${zoneId}/windows`, "manager").send(withWindow(zone, { quantity: "air.temperature", min: 23 })).expect(200);
    expect(await airStatus()).toBe("below");

    // The alert engine's next round evaluates the held value against the new window.
    await server.alerts.engine.idle();
    await server.alerts.pass();
    const open = alertsResponseSchema.parse((await api("get", "/api/alerts?status=open", "viewer").expect(200)).body).alerts;
    expect(open).toContainEqual(expect.objectContaining({ benchId: credential.benchId, kind: "window", quantity: "air.temperature", direction: "below", phase: "watching" }));

    await api("put", `/api/zones/${zoneId}/windows`, "manager").send(withWindow(zone, { quantity: "air.temperature", min: fahrenheitToCelsius(70) })).expect(200);
    expect(await airStatus()).toBe("inside");
  });
});
