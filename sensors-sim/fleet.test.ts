import { afterEach, describe, expect, it } from "vitest";
import { fleetFromCredentials, type SensorCredential } from "./credentials.js";
import { runFleet, type FleetConfig } from "./fleet.js";
import { GARBAGE_KINDS } from "./payload/garbage.js";
import { readingsTopic, statusTopic } from "./payload/senml.js";
import { startTestBroker, type TestBroker } from "./testing/broker.js";
import { packSchema } from "./testing/pack-schema.js";
import type { Publication } from "./transport/device.js";

const CREDENTIALS: SensorCredential[] = [
  { id: "bw-air-1", secret: "s3cret-a1", benchId: 1, benchName: "North 1", kind: "air" },
  { id: "bw-med-1", secret: "s3cret-m1", benchId: 1, benchName: "North 1", kind: "medium" },
  { id: "bw-combo-2", secret: "s3cret-c2", benchId: 2, benchName: "North 2", kind: "combined" },
];

function config(broker: TestBroker, overrides: Partial<FleetConfig> = {}, credentials = CREDENTIALS): FleetConfig {
  const fleet = fleetFromCredentials(credentials);
  return {
    brokerUrl: broker.url,
    benches: fleet.benches,
    sensors: fleet.sensors,
    intervalMs: 40,
    speed: 60,
    count: 5,
    scenario: "normal",
    seed: 3,
    qos: 1,
    startHour: 10,
    batch: 1,
    bufferLimit: 1000,
    affect: [],
    dropoutRate: 0,
    drainMs: 8000,
    signalDrainMs: 500,
    connectSpreadMs: 0,
    backoff: { initialMs: 50, maxMs: 400, factor: 2 },
    ...overrides,
  };
}

let broker: TestBroker | undefined;
afterEach(async () => {
  await broker?.close();
  broker = undefined;
});

describe("runFleet against a real aedes broker", () => {
  it("when run with a bounded count, then every pack arrives well-formed, on its own topic, with the sensor's credentials", async () => {
    broker = await startTestBroker(CREDENTIALS);
    const summary = await runFleet(config(broker, { count: 6 }));

    expect(summary.stoppedBy).toBe("count");
    expect(summary.packs).toBe(18);
    expect(summary.acknowledged).toBe(18);
    expect(summary.unsent).toBe(0);
    expect(broker.badLogins).toEqual([]);
    expect(broker.refused).toEqual([]);

    const readings = broker.received.filter((r) => r.topic.endsWith("/readings"));
    expect(readings).toHaveLength(18);
    for (const cred of CREDENTIALS) {
      const mine = readings.filter((r) => r.username === cred.id);
      expect(mine).toHaveLength(6);
      for (const r of mine) {
        expect(r.topic).toBe(readingsTopic(cred.id));
        expect(r.clientId).toBe(cred.id);
        expect(r.qos).toBe(1);
        const pack = packSchema.parse(JSON.parse(r.payload.toString("utf8")));
        expect(pack[0]?.bn).toBe(`urn:dev:bw:${cred.id}:`);
        const names = pack.map((p) => p.n).sort();
        const expected = {
          air: ["air.humidity", "air.temperature", "battery"],
          medium: ["battery", "medium.moisture", "medium.temperature"],
          combined: ["air.humidity", "air.temperature", "battery", "medium.moisture", "medium.temperature"],
        }[cred.kind];
        expect(names).toEqual(expected);
        // Wall-clock times, so the dashboard shows them live.
        expect(Math.abs((pack[0]?.bt as number) * 1000 - Date.now())).toBeLessThan(60_000);
      }
    }
    // A clean end: DISCONNECT, so no last will was published.
    expect(broker.received.filter((r) => r.topic.endsWith("/status"))).toEqual([]);
  });

  it("when QoS 0 is asked for, then packs go at QoS 0 and are counted as written", async () => {
    broker = await startTestBroker(CREDENTIALS);
    const summary = await runFleet(config(broker, { qos: 0, count: 3 }));
    expect(summary.acknowledged).toBe(9);
    expect(broker.received.every((r) => r.qos === 0)).toBe(true);
  });

  it("when the broker crashes and comes back mid-run, then no QoS 1 pack the simulator produced is lost", async () => {
    broker = await startTestBroker(CREDENTIALS);
    const produced: Publication[] = [];
    const b = broker;
    const run = runFleet(config(b, { count: 60, intervalMs: 30 }), { onPublication: (_s, p) => produced.push(p) });
    await new Promise((resolve) => setTimeout(resolve, 600));
    await b.crash();
    const producedWhileDown = produced.length;
    await new Promise((resolve) => setTimeout(resolve, 500));
    expect(produced.length).toBeGreaterThan(producedWhileDown); // it kept sampling meanwhile
    await b.restart();
    const summary = await run;

    expect(produced).toHaveLength(180);
    expect(summary.reconnects).toBeGreaterThan(0);
    expect(summary.unsent).toBe(0);
    expect(summary.acknowledged).toBe(summary.sent);
    const arrived = new Set(b.received.map((r) => r.payload.toString("utf8")));
    const missing = produced.filter((p) => !arrived.has(String(p.payload)));
    expect(missing).toEqual([]);
  });

  it("when the broker is away at the start, then the simulator buffers and sends the backlog once it is up", async () => {
    broker = await startTestBroker(CREDENTIALS);
    const b = broker;
    await b.crash();
    const run = runFleet(config(b, { count: 10, intervalMs: 30 }));
    await new Promise((resolve) => setTimeout(resolve, 500));
    await b.restart();
    const summary = await run;
    expect(summary.unsent).toBe(0);
    expect(b.received.filter((r) => r.topic.endsWith("/readings"))).toHaveLength(30);
  });

  it("when the buffer is full, then the oldest packs are dropped and counted", async () => {
    broker = await startTestBroker(CREDENTIALS);
    const b = broker;
    await b.crash();
    const run = runFleet(config(b, { count: 10, intervalMs: 20, bufferLimit: 4, drainMs: 3000 }));
    await new Promise((resolve) => setTimeout(resolve, 400));
    await b.restart();
    const summary = await run;
    expect(summary.overflow).toBe(18); // 10 per sensor, 4 kept
    expect(b.received.filter((r) => r.topic.endsWith("/readings"))).toHaveLength(12);
  });

  it("when a secret is wrong, then that sensor is refused and counted, and the others publish", async () => {
    broker = await startTestBroker(CREDENTIALS);
    const wrong = CREDENTIALS.map((c, i) => (i === 0 ? { ...c, secret: "nope" } : c));
    const events: string[] = [];
    const summary = await runFleet(config(broker, { count: 3, drainMs: 800 }, wrong), { onEvent: (m) => events.push(m) });
    expect(summary.refused).toBeGreaterThan(0);
    expect(broker.badLogins.every((l) => l.username === "bw-air-1")).toBe(true);
    expect(broker.received.filter((r) => r.username === "bw-air-1")).toEqual([]);
    expect(broker.received.filter((r) => r.username === "bw-med-1")).toHaveLength(3);
    expect(events.some((e) => e.startsWith("bw-air-1:") && /refused|password/i.test(e))).toBe(true);
  });

  it("dead-sensor: the sensor drops off without DISCONNECT and the broker publishes its last will, offline", async () => {
    broker = await startTestBroker(CREDENTIALS);
    // 45 simulated minutes in: at 40 ms per sample and speed 3600, about sample 19.
    const summary = await runFleet(config(broker, { scenario: "dead-sensor", speed: 3600, count: 30 }));
    expect(summary.dead).toBe(1);
    const b = broker;
    await expect.poll(() => b.received.filter((r) => r.topic === statusTopic("bw-air-1")).length).toBe(1);
    const will = b.received.find((r) => r.topic === statusTopic("bw-air-1"));
    expect(will?.payload.toString()).toBe("offline");
    const packs = b.received.filter((r) => r.topic === readingsTopic("bw-air-1"));
    expect(packs.length).toBeGreaterThan(10);
    expect(packs.length).toBeLessThan(30);
    expect(b.received.filter((r) => r.topic === readingsTopic("bw-med-1"))).toHaveLength(30);
  });

  it("garbage: every kind goes out, the refused wrong-topic publish costs a reconnect, and good packs keep flowing", async () => {
    broker = await startTestBroker(CREDENTIALS);
    const samples = 2 * GARBAGE_KINDS.length + 4;
    const summary = await runFleet(config(broker, { scenario: "garbage", count: samples, intervalMs: 30 }));
    const b = broker;
    expect(summary.garbage).toBe(GARBAGE_KINDS.length + 2);
    expect(b.refused.map((r) => r.topic)).toEqual([readingsTopic("bw-air-1-not-me")]);
    const fromGarbage = b.received.filter((r) => r.username === "bw-air-1");
    // Half good packs, half garbage; the wrong-topic one refused.
    const good = fromGarbage.filter((r) => {
      try {
        return packSchema.safeParse(JSON.parse(r.payload.toString("utf8"))).success;
      } catch {
        return false;
      }
    });
    expect(good.length).toBeGreaterThanOrEqual(samples / 2 - 2);
    expect(fromGarbage.filter((r) => r.qos === 0).length).toBeGreaterThanOrEqual(GARBAGE_KINDS.length);
    expect(b.received.filter((r) => r.username === "bw-combo-2")).toHaveLength(samples);
  });

  it("when batching, then a pack carries several samples with relative times", async () => {
    broker = await startTestBroker(CREDENTIALS);
    const summary = await runFleet(config(broker, { batch: 3, count: 6 }));
    expect(summary.packs).toBe(6);
    const pack = packSchema.parse(JSON.parse((broker.received[0] as { payload: Buffer }).payload.toString()));
    expect(pack.filter((r) => r.t !== undefined).length).toBeGreaterThan(0);
  });

  it("when aborted, then it stops producing, disconnects cleanly and says why", async () => {
    broker = await startTestBroker(CREDENTIALS);
    const controller = new AbortController();
    const run = runFleet(config(broker, { count: undefined, intervalMs: 50 }), { signal: controller.signal });
    await new Promise((resolve) => setTimeout(resolve, 400));
    controller.abort();
    const summary = await run;
    expect(summary.stoppedBy).toBe("signal");
    expect(summary.packs).toBeGreaterThan(3);
    expect(broker.received.filter((r) => r.topic.endsWith("/status"))).toEqual([]);
  });

  it("when given a duration, then it stops by itself", async () => {
    broker = await startTestBroker(CREDENTIALS);
    const started = Date.now();
    const summary = await runFleet(config(broker, { count: undefined, durationMs: 300, intervalMs: 50 }));
    expect(summary.stoppedBy).toBe("duration");
    expect(Date.now() - started).toBeLessThan(5000);
    expect(summary.samples).toBeGreaterThanOrEqual(15);
    expect(summary.samples).toBeLessThanOrEqual(21);
  });
});
