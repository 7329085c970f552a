import { randomBytes } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Database from "better-sqlite3";
import mqtt, { type MqttClient } from "mqtt";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { rawDatabase } from "../../server/db/data-source.js";
import { mosquittoPasswordMatches } from "../../server/mqtt/mosquitto-files.js";
import { runExport, startMosquitto, type Mosquitto } from "../support/mosquitto.js";
import { connectSensor, signIn, startTestServer, waitFor, type TestServer } from "../support/test-server.js";

// The server as a client of a real Debian mosquitto (MQTT_URL), which signs the probes in with the
// password and ACL files written by npm run sensors:export-mosquitto.

const SERVER_USER = "benchwarden";
const SERVER_PASSWORD = randomBytes(18).toString("base64url");
const CLIENT_ID = `bw-test-${randomBytes(4).toString("hex")}`;

let broker: Mosquitto;
let server: TestServer;
let dir: string;
const clients: MqttClient[] = [];

function brokerEnv(): Record<string, string> {
  return { MQTT_URL: broker.url, MQTT_USERNAME: SERVER_USER, MQTT_PASSWORD: SERVER_PASSWORD, MQTT_CLIENT_ID: CLIENT_ID };
}

function exportEnv(): Record<string, string> {
  return { ...brokerEnv(), DATABASE_PATH: join(dir, "benchwarden.sqlite"), LOG_LEVEL: "silent" };
}

beforeAll(async () => {
  broker = await startMosquitto({ serverUser: SERVER_USER, serverPassword: SERVER_PASSWORD });
  server = await startTestServer(brokerEnv());
  dir = server.dir;
  const exported = runExport(exportEnv(), ["--out-dir", broker.dir, "--secrets", server.demoCredentialsPath!]);
  if (exported.status !== 0) throw new Error(`export failed (${exported.status}): ${exported.stderr}`);
  await broker.reload();
});

afterAll(async () => {
  try {
    await Promise.all(clients.map((c) => c.endAsync(true)));
    await Promise.race([server?.stop(), new Promise((r) => setTimeout(r, 20_000))]);
  } finally {
    await broker?.cleanup();
    if (dir) rmSync(dir, { recursive: true, force: true });
  }
});

async function sensor(kind: "air" | "medium" | "combined", index = 0, protocolVersion: 4 | 5 = 4) {
  const credential = server.credentials.filter((c) => c.kind === kind)[index]!;
  const client =
    protocolVersion === 4
      ? await connectSensor(server, credential)
      : await mqtt.connectAsync(broker.url, { username: credential.id, password: credential.secret, protocolVersion: 5, reconnectPeriod: 0 });
  clients.push(client);
  return { credential, client, topic: `benchwarden/v1/sensors/${credential.id}/readings` };
}

function storedCount(sensorId: string): number {
  const db = rawDatabase(server.dataSource);
  return (db.prepare("SELECT COUNT(*) AS n FROM reading WHERE sensor_id = ?").get(sensorId) as { n: number }).n;
}

/** Waits until the sensor has `n` stored readings; fails if it never gets there or goes past. */
async function expectStored(sensorId: string, n: number, timeoutMs = 5000): Promise<void> {
  await waitFor(async () => (storedCount(sensorId) >= n ? true : undefined), timeoutMs).catch(() => undefined);
  expect(storedCount(sensorId)).toBe(n);
}

describe("the server behind an external mosquitto", () => {
  it("the export writes a password file mosquitto accepts, and refuses to guess secrets it was not given", async () => {
    const lines = readFileSync(broker.passwordFile, "utf8").trimEnd().split("\n");
    expect(lines).toHaveLength(server.credentials.length + 1);
    const probe = server.credentials[0]!;
    const line = lines.find((l) => l.startsWith(`${probe.id}:`))!;
    expect(mosquittoPasswordMatches(line.slice(probe.id.length + 1), probe.secret)).toBe(true);

    // Without the secrets file it cannot know them (only hashes are stored): nothing is written.
    const before = statSync(broker.passwordFile).mtimeMs;
    const refused = runExport(exportEnv(), ["--out-dir", broker.dir]);
    expect(refused.status).toBe(1);
    expect(refused.stderr).toMatch(new RegExp(`secrets of ${server.credentials.length} enabled sensor\\(s\\) are not known`));
    expect(statSync(broker.passwordFile).mtimeMs).toBe(before);

    // mosquitto signs a probe in with its secret, and refuses a wrong one.
    await sensor("air", 0);
    await expect(connectSensor(server, { id: probe.id, secret: "not-the-secret" })).rejects.toThrow(/Bad username or password|Not authorized/);
  });

  it("readings a probe publishes through mosquitto are stored once each, re-sent ones too", async () => {
    const { credential, client, topic } = await sensor("medium", 0);
    const baseS = Math.floor(Date.now() / 1000) - 600;
    const duplicatesBefore = server.metrics.readingsDuplicate.get();
    for (let i = 0; i < 40; i++) {
      const pack = JSON.stringify([{ bt: baseS + i, n: "medium.temperature", u: "Cel", v: 22 + i / 100 }, { n: "medium.moisture", u: "/", v: 0.4 }]);
      await client.publishAsync(topic, pack, { qos: 1 });
      if (i % 4 === 0) await client.publishAsync(topic, pack, { qos: 1 }); // the probe re-sends
    }
    await expectStored(credential.id, 80);
    expect(server.metrics.readingsDuplicate.get() - duplicatesBefore).toBe(20);
  });

  it("a probe publishing to another probe's topic is refused by mosquitto's ACL", async () => {
    const { credential: mine, client: v311 } = await sensor("combined", 0);
    const { client: v5 } = await sensor("combined", 0, 5);
    const other = server.credentials.filter((c) => c.kind === "combined")[1]!;
    const otherTopic = `benchwarden/v1/sensors/${other.id}/readings`;
    const pack = JSON.stringify([{ n: "air.temperature", u: "Cel", v: 24.5 }]);
    // MQTT 3.1.1 (what probes speak) has no refusal in its PUBACK; MQTT 5 says it plainly. Either
    // way mqtt.js then drops the connection (mosquitto 2.0 sends a reason code to both).
    await v311.publishAsync(otherTopic, pack, { qos: 1 });
    await expect(v5.publishAsync(otherTopic, pack, { qos: 1 })).rejects.toThrow(/Not authorized/);
    // Its own topic works, and the server takes messages in the order mosquitto passes them on:
    // once this one is stored, the refused ones would have been too.
    const { client, topic: myTopic } = await sensor("combined", 0);
    await client.publishAsync(myTopic, pack, { qos: 1 });
    await expectStored(mine.id, 1);
    expect(storedCount(other.id)).toBe(0);
  });

  it("a sensor registered since the last export: the export refuses, then --rotate-missing gives it a new secret that mosquitto accepts", async () => {
    const admin = await signIn(server, "admin");
    const bench = server.credentials[0]!.benchId;
    const registered = await request(server.baseUrl).post("/api/sensors").auth(admin, { type: "bearer" }).send({ id: "spare-probe-9", kind: "air", benchId: bench }).expect(201);
    const shownOnce = (registered.body as { secret: string }).secret;

    const refused = runExport(exportEnv(), ["--out-dir", broker.dir, "--secrets", server.demoCredentialsPath!]);
    expect(refused.status).toBe(1);
    expect(refused.stderr).toContain("secrets of 1 enabled sensor(s) are not known (spare-probe-9)");

    const rotated = runExport(exportEnv(), ["--out-dir", broker.dir, "--secrets", server.demoCredentialsPath!, "--rotate-missing"]);
    expect(rotated.status, rotated.stderr).toBe(0);
    const fresh = JSON.parse(readFileSync(join(broker.dir, "new-sensor-secrets.json"), "utf8")) as { id: string; secret: string; benchId: number }[];
    expect(fresh.map((f) => f.id)).toEqual(["spare-probe-9"]);
    expect(fresh[0]!.secret).not.toBe(shownOnce);
    expect((statSync(join(broker.dir, "new-sensor-secrets.json")).mode & 0o777).toString(8)).toBe("600");
    await broker.reload();

    // The new secret signs in at mosquitto and its readings are stored; the old one is refused.
    const probe = { id: "spare-probe-9", secret: fresh[0]!.secret };
    const client = await connectSensor(server, probe);
    clients.push(client);
    await client.publishAsync("benchwarden/v1/sensors/spare-probe-9/readings", JSON.stringify([{ n: "air.temperature", u: "Cel", v: 22.2 }]), { qos: 1 });
    await expectStored("spare-probe-9", 1);
    await expect(connectSensor(server, { id: "spare-probe-9", secret: shownOnce })).rejects.toThrow(/Bad username or password|Not authorized/);
  });

  it("a bad pack is counted and acknowledged: after a restart mosquitto does not send it again", async () => {
    const { credential, client, topic } = await sensor("air", 1);
    const rejectedBefore = server.metrics.readingsRejected.get({ reason: "malformed-json" });
    await client.publishAsync(topic, '[{"n":"air.temperature","v":', { qos: 1 });
    await client.publishAsync(topic, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 23.1, t: -5 }]), { qos: 1 });
    await expectStored(credential.id, 1);
    expect(server.metrics.readingsRejected.get({ reason: "malformed-json" })).toBe(rejectedBefore + 1);
    const metrics = await request(server.baseUrl).get("/metrics").expect(200);
    expect(metrics.text).toMatch(/benchwarden_readings_rejected_total\{reason="malformed-json"\} [1-9]/);

    // Restart with the same client id: mosquitto re-sends whatever this session left
    // unacknowledged before anything newer, so once a new reading is stored, a bad pack that was
    // never acknowledged would have come back and been counted by the new instance.
    await server.stop();
    server = await startTestServer(brokerEnv(), { dir });
    await client.publishAsync(topic, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 23.2 }]), { qos: 1 });
    await expectStored(credential.id, 2);
    expect(server.metrics.mqttMessages.get()).toBe(1);
    expect(server.metrics.readingsRejected.get({ reason: "malformed-json" })).toBe(0);
  });

  it("stopping mid-stream (what SIGTERM does) acknowledges every committed message and leaves the rest with mosquitto", async () => {
    const { credential, client, topic } = await sensor("air", 2);
    const total = 2000;
    const baseMs = Date.now() - 3_600_000;
    const sends = Array.from({ length: total }, (_, i) =>
      client.publishAsync(topic, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 21 + (i % 50) / 10, t: (baseMs + i * 1000) / 1000 }]), { qos: 1 }),
    );
    await waitFor(async () => (storedCount(credential.id) >= 300 ? true : undefined), 10_000);
    await server.stop();
    const file = new Database(join(dir, "benchwarden.sqlite"), { readonly: true });
    const atStop = (file.prepare("SELECT COUNT(*) AS n FROM reading WHERE sensor_id = ?").get(credential.id) as { n: number }).n;
    file.close();
    expect(atStop).toBeLessThan(total);
    await Promise.all(sends); // mosquitto has them all

    server = await startTestServer(brokerEnv(), { dir });
    await expectStored(credential.id, total, 20_000);
    // Nothing the stopped instance committed came back: it was acknowledged before the disconnect.
    expect(server.metrics.readingsDuplicate.get()).toBe(0);
    expect(server.metrics.mqttMessages.get()).toBe(total - atStop);
  });

  it("a probe's last will through mosquitto raises a sensor-silent alert", async () => {
    const probe = server.credentials.filter((c) => c.kind === "combined")[2]!;
    const client = await mqtt.connectAsync(broker.url, {
      username: probe.id,
      password: probe.secret,
      reconnectPeriod: 0,
      will: { topic: `benchwarden/v1/sensors/${probe.id}/status`, payload: Buffer.from("offline"), qos: 1, retain: false },
    });
    // Gone without a DISCONNECT: mosquitto publishes the will.
    (client as unknown as { stream: { destroy(): void } }).stream.destroy();
    const db = rawDatabase(server.dataSource);
    const alert = await waitFor(async () => db.prepare("SELECT phase FROM alert WHERE kind = 'sensor-silent' AND sensor_id = ?").get(probe.id) as { phase: string } | undefined);
    expect(alert.phase).toBe("raised");
  });

  it("/healthz reports the broker connection: down while mosquitto is, up again after, and readings flow again", async () => {
    await request(server.baseUrl).get("/healthz").expect(200, { status: "ok", database: "ok", broker: "ok" });
    await broker.stop();
    const down = await waitFor(async () => {
      const res = await request(server.baseUrl).get("/healthz");
      return res.status === 503 ? res.body : undefined;
    });
    expect(down).toEqual({ status: "unavailable", database: "ok", broker: "not connected" });

    await broker.restart();
    await waitFor(async () => ((await request(server.baseUrl).get("/healthz")).status === 200 ? true : undefined), 10_000);
    const { credential, client, topic } = await sensor("medium", 1);
    await client.publishAsync(topic, JSON.stringify([{ n: "medium.temperature", u: "Cel", v: 21.7 }]), { qos: 1 });
    await expectStored(credential.id, 1);
  });

  it("start-up stops with a clear message when mosquitto refuses the server's own sign-in", async () => {
    const scratch = mkdtempSync(join(tmpdir(), "benchwarden-test-"));
    try {
      await expect(startTestServer({ ...brokerEnv(), MQTT_PASSWORD: "wrong-password", MQTT_CLIENT_ID: `${CLIENT_ID}-x` }, { dir: scratch })).rejects.toThrow(
        /MQTT_URL: the broker refused the server's sign-in as "benchwarden"/,
      );
    } finally {
      rmSync(scratch, { recursive: true, force: true });
    }
  });
});
