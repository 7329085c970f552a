import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditResponseSchema } from "../../shared/schemas/audit.js";
import { sensorsResponseSchema } from "../../shared/schemas/sensors.js";
import { query } from "../support/twin-databases.js";
import { connectSensor, signIn, startTestServer, waitFor, type TestServer } from "../support/test-server.js";

let server: TestServer;
let admin: string;

beforeAll(async () => {
  server = await startTestServer();
  admin = await signIn(server, "admin");
});

afterAll(async () => {
  await server.cleanup();
});

const api = () => request(server.baseUrl);

async function storedValue(sensorId: string, quantity: string, timeMs: number): Promise<number | undefined> {
  const [row] = await query<{ value: number }>(server.dataSource, "SELECT value FROM reading WHERE sensor_id = @sensorId AND quantity = @quantity AND time_ms = @timeMs", { sensorId, quantity, timeMs });
  return row?.value;
}

async function publish(credential: { id: string; secret: string }, records: object[]): Promise<void> {
  const client = await connectSensor(server, credential);
  await client.publishAsync(`benchwarden/v1/sensors/${credential.id}/readings`, JSON.stringify(records), { qos: 1 });
  await client.endAsync();
}

describe("sensor calibration (offset and gain per quantity)", () => {
  it("an admin's calibration applies to the readings received after it, is listed with the sensor, and is audited old → new", async () => {
    const probe = server.credentials.find((c) => c.kind === "combined")!;
    const beforeMs = Date.now() - 60_000;
    await publish(probe, [{ bn: `${probe.id}:`, bt: beforeMs / 1000, n: "air.temperature", u: "Cel", v: 22 }]);

    await api()
      .patch(`/api/sensors/${probe.id}`)
      .auth(admin, { type: "bearer" })
      .send({ calibration: { "air.temperature": { offset: -0.4, gain: 1 }, "medium.moisture": { offset: 0.02, gain: 1.1 }, "air.humidity": { offset: 0, gain: 1 } } })
      .expect(200);

    const afterMs = Date.now() - 30_000;
    await publish(probe, [
      { bn: `${probe.id}:`, bt: afterMs / 1000, n: "air.temperature", u: "Cel", v: 22 },
      { n: "medium.moisture", u: "/", v: 0.4 },
      { n: "air.humidity", u: "%RH", v: 70 },
      { n: "battery", u: "%EL", v: 80 },
    ]);
    await waitFor(async () => storedValue(probe.id, "air.temperature", afterMs));
    expect(await storedValue(probe.id, "air.temperature", beforeMs)).toBe(22); // stored before: as measured
    expect(await storedValue(probe.id, "air.temperature", afterMs)).toBeCloseTo(21.6, 10);
    expect(await storedValue(probe.id, "medium.moisture", afterMs)).toBeCloseTo(1.1 * 0.4 + 0.02, 10);
    expect(await storedValue(probe.id, "air.humidity", afterMs)).toBe(70); // {0, 1} is no calibration
    expect(await storedValue(probe.id, "battery", afterMs)).toBe(80);

    const listed = sensorsResponseSchema.parse((await api().get("/api/sensors").auth(admin, { type: "bearer" }).expect(200)).body).sensors.find((s) => s.id === probe.id);
    expect(listed?.calibration).toEqual({ "air.temperature": { offset: -0.4, gain: 1 }, "medium.moisture": { offset: 0.02, gain: 1.1 } });

    const audit = auditResponseSchema.parse((await api().get("/api/audit?entityType=sensor-calibration").auth(admin, { type: "bearer" }).expect(200)).body);
    const entry = audit.entries.find((e) => e.entityId === probe.id);
    expect(entry?.actor.role).toBe("admin");
    expect(entry?.changes).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ field: "offset", quantity: "air.temperature", kind: "temperature-difference", old: 0, new: -0.4 }),
        expect.objectContaining({ field: "gain", quantity: "medium.moisture", old: 1, new: 1.1 }),
      ]),
    );
  });

  it("a calibrated value past a physical limit is held at the limit; a measured value outside the probe range is still refused", async () => {
    const probe = server.credentials.filter((c) => c.kind === "combined")[1]!;
    await api().patch(`/api/sensors/${probe.id}`).auth(admin, { type: "bearer" }).send({ calibration: { "air.humidity": { offset: 3, gain: 1 } } }).expect(200);
    const refusedBefore = server.metrics.readingsRejected.get({ reason: "out-of-range" });
    const t = Date.now() - 20_000;
    await publish(probe, [
      { bn: `${probe.id}:`, bt: t / 1000, n: "air.humidity", u: "%RH", v: 99 },
      { n: "air.temperature", u: "Cel", v: 200 },
    ]);
    await waitFor(async () => storedValue(probe.id, "air.humidity", t));
    expect(await storedValue(probe.id, "air.humidity", t)).toBe(100);
    expect(await storedValue(probe.id, "air.temperature", t)).toBeUndefined();
    expect(server.metrics.readingsRejected.get({ reason: "out-of-range" })).toBe(refusedBefore + 1);
  });

  it("an offset beyond what a calibration can be is refused with the field named, and nothing changes", async () => {
    const probe = server.credentials.filter((c) => c.kind === "combined")[2]!;
    const res = await api()
      .patch(`/api/sensors/${probe.id}`)
      .auth(admin, { type: "bearer" })
      .send({ calibration: { "air.temperature": { offset: 9, gain: 1 }, "medium.moisture": { offset: 0, gain: 5 } } })
      .expect(400);
    expect(res.headers["content-type"]).toMatch(/application\/problem\+json/);
    const paths = (JSON.parse(res.text) as { errors: { path: string }[] }).errors.map((e) => e.path);
    expect(paths).toEqual(expect.arrayContaining(["calibration.air.temperature.offset", "calibration.medium.moisture.gain"]));
    const listed = sensorsResponseSchema.parse((await api().get("/api/sensors").auth(admin, { type: "bearer" }).expect(200)).body).sensors.find((s) => s.id === probe.id);
    expect(listed?.calibration).toEqual({});
  });

  it("a manager may not calibrate a sensor", async () => {
    const manager = await signIn(server, "manager");
    const probe = server.credentials[0]!;
    await api().patch(`/api/sensors/${probe.id}`).auth(manager, { type: "bearer" }).send({ calibration: {} }).expect(403);
  });
});
