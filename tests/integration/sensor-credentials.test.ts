import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sensorSecretResponseSchema, sensorsResponseSchema } from "../../shared/schemas/sensors.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

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

describe("sensor credentials over real MQTT", () => {
  it("a registered sensor's secret is shown once and lets it publish; the list never shows it", async () => {
    const benchId = server.credentials[0]!.benchId;
    const res = await api().post("/api/sensors").auth(admin, { type: "bearer" }).send({ id: "spare-probe-01", kind: "combined", benchId }).expect(201);
    const { secret, sensor } = sensorSecretResponseSchema.parse(res.body);
    expect(secret.length).toBeGreaterThanOrEqual(40);
    expect(sensor).toMatchObject({ id: "spare-probe-01", benchId, disabled: false, lastSeenMs: null });

    const client = await connectSensor(server, { id: "spare-probe-01", secret });
    await client.publishAsync("benchwarden/v1/sensors/spare-probe-01/readings", JSON.stringify([{ n: "battery", u: "%EL", v: 88 }]), { qos: 1 });
    await client.endAsync();

    const list = await api().get("/api/sensors").auth(admin, { type: "bearer" }).expect(200);
    expect(list.text).not.toContain(secret);
    const listed = sensorsResponseSchema.parse(list.body).sensors.find((s) => s.id === "spare-probe-01");
    expect(listed).toMatchObject({ batteryPct: 88 });
    expect(listed?.lastSeenMs).not.toBeNull();
  });

  it("a second registration with the same id is refused with the field named", async () => {
    const res = await api().post("/api/sensors").auth(admin, { type: "bearer" }).send({ id: "spare-probe-01", kind: "air", benchId: null }).expect(409);
    expect(JSON.parse(res.text).errors).toEqual([{ path: "id", message: "This id is taken" }]);
  });

  it("after rotation the old secret is refused and the connected device is dropped", async () => {
    const credential = server.credentials.find((c) => c.kind === "medium")!;
    const client = await connectSensor(server, credential);
    const dropped = new Promise<void>((r) => client.once("close", () => r()));
    const res = await api().post(`/api/sensors/${credential.id}/secret`).auth(admin, { type: "bearer" }).expect(200);
    const { secret } = sensorSecretResponseSchema.parse(res.body);
    await dropped;
    await expect(connectSensor(server, credential)).rejects.toThrow(/bad user ?name or password/i);
    const fresh = await connectSensor(server, { id: credential.id, secret });
    await fresh.endAsync();
  });

  it("a disabled sensor cannot sign in", async () => {
    const credential = server.credentials.find((c) => c.kind === "air")!;
    await api().patch(`/api/sensors/${credential.id}`).auth(admin, { type: "bearer" }).send({ disabled: true }).expect(200);
    await expect(connectSensor(server, credential)).rejects.toThrow(/bad user ?name or password/i);
    await api().patch(`/api/sensors/${credential.id}`).auth(admin, { type: "bearer" }).send({ disabled: false }).expect(200);
    const client = await connectSensor(server, credential);
    await client.endAsync();
  });

  it("a sensor may not subscribe to other sensors' topics", async () => {
    const credential = server.credentials.find((c) => c.kind === "combined")!;
    const client = await connectSensor(server, credential);
    // MQTT 3.1.1 §3.9.3 answers a refused subscription with return code 0x80 in the SUBACK,
    // which mqtt.js reports as a subscribe error.
    await expect(client.subscribeAsync("benchwarden/v1/sensors/#", { qos: 1 })).rejects.toThrow(/Subscribe error/);
    expect(server.metrics.mqttRefused.get({ reason: "subscribe" })).toBeGreaterThanOrEqual(1);
    await client.endAsync(true);
  });

  it("a publish on another sensor's topic is refused and counted", async () => {
    const [own, other] = server.credentials.filter((c) => c.kind === "combined").slice(1, 3);
    const before = server.metrics.mqttRefused.get({ reason: "foreign-topic" });
    const client = await connectSensor(server, own!);
    const closed = new Promise<void>((r) => client.once("close", () => r()));
    client.publish(`benchwarden/v1/sensors/${other!.id}/readings`, "[]", { qos: 1 });
    await closed;
    expect(server.metrics.mqttRefused.get({ reason: "foreign-topic" })).toBe(before + 1);
  });
});
