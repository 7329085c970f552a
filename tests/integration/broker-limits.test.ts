import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { connectSensor, startTestServer, type TestServer } from "../support/test-server.js";

let server: TestServer;
/** Bytes per second one connection may send (the default, pinned: the flooding test measures against it); 4× that as a burst. */
const RATE = 64 * 1024;

beforeAll(async () => {
  server = await startTestServer({ MQTT_BYTES_PER_SECOND: String(RATE) });
});

afterAll(async () => {
  await server.cleanup();
});

describe("broker limits", () => {
  it("acknowledges one sensor's sequential QoS 1 publishes without a per-message stall", async () => {
    // 100 publishes one after another. With Nagle's algorithm left on behind the guard, each
    // PUBACK waited for the client's delayed ACK (~40 ms): 4 s. Now about 1 ms each.
    const sensor = server.credentials.find((c) => c.kind === "medium")!;
    const client = await connectSensor(server, sensor);
    const started = Date.now();
    for (let i = 0; i < 100; i++) {
      await client.publishAsync(`benchwarden/v1/sensors/${sensor.id}/readings`, JSON.stringify([{ n: "medium.temperature", u: "Cel", v: 22, t: (started - 600_000 + i) / 1000 }]), { qos: 1 });
    }
    expect(Date.now() - started).toBeLessThan(1500);
    await client.endAsync();
  });

  it("a packet over 64 KiB closes that sensor's connection and is counted; others carry on", async () => {
    const [big, small] = server.credentials.filter((c) => c.kind === "air");
    const offender = await connectSensor(server, big!);
    const closed = new Promise<void>((r) => offender.once("close", () => r()));
    offender.publish(`benchwarden/v1/sensors/${big!.id}/readings`, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 20, vs: "x".repeat(100_000) }]), { qos: 1 });
    await closed;
    expect(server.metrics.mqttRefused.get({ reason: "packet-too-large" })).toBe(1);

    const other = await connectSensor(server, small!);
    await other.publishAsync(`benchwarden/v1/sensors/${small!.id}/readings`, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 22 }]), { qos: 1 });
    await other.endAsync();
    offender.end(true);
  });

  it("a flooding client is slowed down while another sensor's readings are still acknowledged promptly", async () => {
    const [flooder, honest] = server.credentials.filter((c) => c.kind === "combined");
    const messagesBefore = server.metrics.mqttMessages.get();
    const floodConnected = Date.now();
    const flood = await connectSensor(server, flooder!);
    const topic = `benchwarden/v1/sensors/${flooder!.id}/readings`;
    const padding = "p".repeat(4000);
    let stop = false;
    const flooding = (async () => {
      // About 1 MB/s offered for two seconds: far over the 64 KiB/s a connection may send.
      for (let i = 0; i < 500 && !stop; i++) {
        flood.publish(topic, JSON.stringify([{ n: "battery", u: "%EL", v: 50, t: Date.now() / 1000 - 60 + i / 1000, vs: padding }]), { qos: 0 });
        await new Promise((r) => setTimeout(r, 4));
      }
    })();

    const good = await connectSensor(server, honest!);
    const latencies: number[] = [];
    for (let i = 0; i < 10; i++) {
      const sent = Date.now();
      await good.publishAsync(`benchwarden/v1/sensors/${honest!.id}/readings`, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 22, t: Date.now() / 1000 }]), { qos: 1 });
      latencies.push(Date.now() - sent);
      await new Promise((r) => setTimeout(r, 100));
    }
    stop = true;
    // What reached the broker from the flooder: no more than the burst and the rate since it
    // connected allow (plus one socket read held back at most), far less than it offered.
    const floodThrough = server.metrics.mqttMessages.get() - messagesBefore - latencies.length;
    const allowedBytes = 4 * RATE + (RATE * (Date.now() - floodConnected)) / 1000 + 64 * 1024;
    const floodPacketBytes = topic.length + JSON.stringify([{ n: "battery", u: "%EL", v: 50, t: Date.now() / 1000, vs: padding }]).length;
    await flooding;
    expect(floodThrough).toBeLessThanOrEqual(allowedBytes / floodPacketBytes);
    expect(server.metrics.mqttRefused.get({ reason: "rate-limited" })).toBeGreaterThan(0);
    expect(Math.max(...latencies)).toBeLessThan(500);
    await good.endAsync();
    flood.end(true);
  });
});
