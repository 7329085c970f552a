import type { MqttClient } from "mqtt";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { zonesResponseSchema, type BenchSummary } from "../../shared/schemas/zones.js";
import { connectSensor, signIn, startTestServer, waitFor, type TestServer } from "../support/test-server.js";
import { query } from "../support/twin-databases.js";

let server: TestServer;
let token: string;
const clients: MqttClient[] = [];

beforeAll(async () => {
  server = await startTestServer();
  token = await signIn(server, "viewer");
});

afterAll(async () => {
  await Promise.all(clients.map((c) => c.endAsync(true)));
  await server.cleanup();
});

async function sensor(kind: "air" | "medium" | "combined", index = 0) {
  const credential = server.credentials.filter((c) => c.kind === kind)[index]!;
  const client = await connectSensor(server, credential);
  clients.push(client);
  return { credential, client };
}

async function benchSummary(benchId: number): Promise<BenchSummary> {
  const res = await request(server.baseUrl).get("/api/zones").auth(token, { type: "bearer" }).expect(200);
  const { zones } = zonesResponseSchema.parse(res.body);
  return zones.flatMap((z) => z.benches).find((b) => b.id === benchId)!;
}

async function storedCount(sensorId: string): Promise<number> {
  return (await query<{ n: number }>(server.dataSource, "SELECT COUNT(*) AS n FROM reading WHERE sensor_id = @sensorId", { sensorId }))[0]!.n;
}

describe("MQTT ingest", () => {
  it("when a sensor publishes a SenML pack, then its value is on the dashboard API within 2 s", async () => {
    const { credential, client } = await sensor("air");
    const t = Math.floor(Date.now() / 1000);
    await client.publishAsync(
      `benchwarden/v1/sensors/${credential.id}/readings`,
      JSON.stringify([
        { bn: `urn:dev:bw:${credential.id}:`, bt: t, n: "air.temperature", u: "Cel", v: 23.4 },
        { n: "air.humidity", u: "%RH", v: 82 },
      ]),
      { qos: 0 },
    );
    const latest = await waitFor(async () => {
      const bench = await benchSummary(credential.benchId);
      return bench.latest.find((l) => l.quantity === "air.temperature" && l.value === 23.4);
    }, 2000);
    expect(latest.status).toBe("inside");
    expect(latest.timeMs).toBe(t * 1000);
  });

  it("when a QoS 1 publish is acknowledged, then the reading is already committed", async () => {
    const { credential, client } = await sensor("medium");
    const before = await storedCount(credential.id);
    const t = Math.floor(Date.now() / 1000) - 30;
    await client.publishAsync(
      `benchwarden/v1/sensors/${credential.id}/readings`,
      JSON.stringify([{ bt: t, n: "medium.temperature", u: "Cel", v: 22.1 }, { n: "medium.moisture", u: "/", v: 0.42 }]),
      { qos: 1 },
    );
    // No waiting: the PUBACK itself means stored.
    expect(await storedCount(credential.id)).toBe(before + 2);
  });

  it("when the same reading is sent twice, then it is stored once", async () => {
    const { credential, client } = await sensor("medium", 1);
    const pack = JSON.stringify([{ bt: Math.floor(Date.now() / 1000) - 60, n: "medium.temperature", u: "Cel", v: 23 }]);
    const topic = `benchwarden/v1/sensors/${credential.id}/readings`;
    await client.publishAsync(topic, pack, { qos: 1 });
    await client.publishAsync(topic, pack, { qos: 1 });
    expect(await storedCount(credential.id)).toBe(1);
    expect(server.metrics.readingsDuplicate.get()).toBeGreaterThanOrEqual(1);
  });

  it("when a pack is malformed, then it is counted and the next good pack is stored", async () => {
    const { credential, client } = await sensor("combined");
    const topic = `benchwarden/v1/sensors/${credential.id}/readings`;
    const rejectedBefore = server.metrics.readingsRejected.get({ reason: "malformed-json" });
    await client.publishAsync(topic, '[{"n":"air.temperature","v":', { qos: 1 });
    await client.publishAsync(topic, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 24.2, t: -1 }]), { qos: 1 });
    expect(server.metrics.readingsRejected.get({ reason: "malformed-json" })).toBe(rejectedBefore + 1);
    expect(await storedCount(credential.id)).toBe(1);
    const metrics = await request(server.baseUrl).get("/metrics").expect(200);
    expect(metrics.text).toMatch(/benchwarden_readings_rejected_total\{reason="malformed-json"\} [1-9]/);
  });

  it("when one record of a pack is bad, then the others are still stored", async () => {
    const { credential, client } = await sensor("combined", 1);
    await client.publishAsync(
      `benchwarden/v1/sensors/${credential.id}/readings`,
      JSON.stringify([
        { bt: Math.floor(Date.now() / 1000), n: "air.temperature", u: "Cel", v: 22.8 },
        { n: "air.humidity", u: "lux", v: 80 },
        { n: "medium.moisture", u: "/", v: 0.4 },
      ]),
      { qos: 1 },
    );
    expect(await storedCount(credential.id)).toBe(2);
    expect(server.metrics.readingsRejected.get({ reason: "unit-not-accepted" })).toBeGreaterThanOrEqual(1);
  });

  it("when a reading leaves the window, then the bench is marked out of window", async () => {
    const { credential, client } = await sensor("air", 2);
    await client.publishAsync(
      `benchwarden/v1/sensors/${credential.id}/readings`,
      JSON.stringify([{ n: "air.temperature", u: "Cel", v: 15.5 }]),
      { qos: 1 },
    );
    const bench = await benchSummary(credential.benchId);
    expect(bench.latest.find((l) => l.quantity === "air.temperature")?.status).toBe("below");
    expect(bench.status).toBe("below");
  });
});

describe("sensor credentials", () => {
  it("when the secret is wrong, then the broker refuses the connection", async () => {
    const credential = server.credentials[0]!;
    await expect(connectSensor(server, { id: credential.id, secret: "not-the-secret" })).rejects.toThrow(/bad user ?name or password/i);
  });

  it("when a sensor publishes on another sensor's topic, then nothing is stored and it is disconnected", async () => {
    const [own, other] = server.credentials.filter((c) => c.kind === "air").slice(3, 5);
    const client = await connectSensor(server, own!);
    clients.push(client);
    const closed = new Promise<void>((r) => client.once("close", () => r()));
    client.publish(`benchwarden/v1/sensors/${other!.id}/readings`, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 5 }]), { qos: 1 });
    await closed;
    expect(await storedCount(other!.id)).toBe(0);
  });
});
