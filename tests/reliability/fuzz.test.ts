import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import fc from "fast-check";
import type { MqttClient } from "mqtt";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { RouteTable } from "../../server/lib/auth.js";
import { rawDatabase } from "../../server/db/data-source.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

let server: TestServer;

// Memory still held, told apart from garbage not yet collected: collect first (the test runs in-process with the server).
setFlagsFromString("--expose-gc");
const collectGarbage = runInNewContext("gc") as () => void;
function heldMb(): number {
  collectGarbage();
  const { heapUsed, arrayBuffers } = process.memoryUsage();
  return (heapUsed + arrayBuffers) / 1024 / 1024;
}

beforeAll(async () => {
  // The fuzzer is a fast talker on purpose; the rate limit has its own test (broker-limits).
  server = await startTestServer({ MQTT_BYTES_PER_SECOND: String(16 * 1024 * 1024) });
});

afterAll(async () => {
  await server.cleanup();
});

const NAMES = ["air.temperature", "air.humidity", "medium.temperature", "medium.moisture", "battery", "", "x", "../etc", "air.temperature\u0000", "💧", "a".repeat(300)];
const UNITS = ["Cel", "K", "%RH", "/", "%EL", "degF", "lux", "", "cel"];
const TIMES = [0, -1, -1e9, 1, 86_400, 268_435_455, 268_435_456, 1_000_000_000, 4_102_444_800, 1e12, Number.MAX_SAFE_INTEGER];

/** A record with plausible and implausible fields, as a device with a bug might send. */
const recordArb = fc.record(
  {
    bn: fc.oneof(fc.constant("urn:dev:bw:x:"), fc.string(), fc.integer()),
    bt: fc.oneof(fc.constantFrom(...TIMES), fc.double()),
    bver: fc.oneof(fc.integer({ min: -2, max: 20 }), fc.string()),
    n: fc.oneof(fc.constantFrom(...NAMES), fc.string(), fc.integer()),
    u: fc.oneof(fc.constantFrom(...UNITS), fc.string()),
    v: fc.oneof(fc.double({ noNaN: true }), fc.integer(), fc.string(), fc.boolean(), fc.constant(null)),
    vs: fc.string({ maxLength: 50 }),
    vb: fc.boolean(),
    t: fc.oneof(fc.constantFrom(...TIMES), fc.double({ noNaN: true })),
  },
  { requiredKeys: [] },
);

/** A record that is nearly right: a known or odd name, unit, value and time, no base fields. */
const nearlyRightArb = fc.record({
  n: fc.constantFrom(...NAMES),
  u: fc.constantFrom(...UNITS),
  v: fc.oneof(fc.double({ min: -100, max: 200, noNaN: true }), fc.constantFrom(0, 0.4, 22, 85, 101, -41, 1e308)),
  t: fc.oneof(fc.constant(0), fc.constantFrom(...TIMES), fc.integer({ min: -600, max: 0 })),
});

/** A payload: JSON of random shape, a pack of odd records, or text that is not JSON at all. */
const payloadArb = fc.oneof(
  { weight: 4, arbitrary: fc.array(nearlyRightArb, { minLength: 1, maxLength: 10 }).map((records) => JSON.stringify(records)) },
  { weight: 4, arbitrary: fc.array(recordArb, { maxLength: 20 }).map((records) => JSON.stringify(records)) },
  { weight: 2, arbitrary: fc.jsonValue().map((v) => JSON.stringify(v)) },
  { weight: 1, arbitrary: fc.array(recordArb, { minLength: 1, maxLength: 5 }).chain((r) => fc.nat({ max: 200 }).map((cut) => JSON.stringify(r).slice(0, cut))) },
  { weight: 1, arbitrary: fc.constantFrom('[{"n":"air.temperature","u":"Cel","v":NaN}]', '[{"n":"battery","u":"%EL","v":Infinity}]', '[{"v":-Infinity}]', "nul", "[", "]", "{}", "[]", "[[[]]]", "\uFEFF[]", '[{"n":"battery","u":"%EL","v":5,"x_":1}]') },
  { weight: 1, arbitrary: fc.nat({ max: 10_000 }).map((depth) => "[".repeat(depth) + "]".repeat(depth)) },
  { weight: 1, arbitrary: fc.uint8Array({ maxLength: 300 }).map((bytes) => Buffer.from(bytes).toString("latin1")) },
  { weight: 1, arbitrary: fc.integer({ min: 100, max: 1500 }).map((n) => JSON.stringify(Array.from({ length: n }, (_, i) => ({ n: "battery", u: "%EL", v: i % 100, t: -i })))) },
);

describe("fuzzing the ingest and the API", () => {
  it("thousands of bad packs through the real broker: the server stays up, memory stays bounded, good readings interleaved are all stored", async () => {
    const [fuzzer, honest] = server.credentials.filter((c) => c.kind === "combined");
    const good = await connectSensor(server, honest!);
    let bad: MqttClient = await connectSensor(server, fuzzer!);
    const payloads = fc.sample(payloadArb, { numRuns: 2500, seed: 8428 });
    // Plus the big ones the broker must refuse outright: 1 MB strings.
    payloads.splice(500, 0, JSON.stringify([{ n: "air.temperature", u: "Cel", vs: "x".repeat(1_000_000) }]));
    payloads.splice(1500, 0, JSON.stringify([{ n: "x".repeat(1_000_000) }]));
    // And packs of the fuzzer's own that hide one good reading among odd records: that one is stored.
    const mixed = fc.sample(fc.tuple(fc.array(nearlyRightArb, { minLength: 1, maxLength: 9 }), fc.nat()), { numRuns: 260, seed: 3137 });
    let mixedSent = 0;

    const rssBefore = process.memoryUsage().rss;
    const goodTopic = `benchwarden/v1/sensors/${honest!.id}/readings`;
    const badTopic = `benchwarden/v1/sensors/${fuzzer!.id}/readings`;
    const base = Date.now() - 3_600_000;
    let goodSent = 0;
    for (const [i, payload] of payloads.entries()) {
      if (!bad.connected) bad = await connectSensor(server, fuzzer!);
      if (i % 10 === 5) {
        const [records, at] = mixed[mixedSent]!;
        const pack: unknown[] = [...records];
        pack.splice(at % (pack.length + 1), 0, { n: "medium.moisture", u: "/", v: 0.5, t: (base + mixedSent * 1000) / 1000 });
        await bad.publishAsync(badTopic, JSON.stringify(pack), { qos: 1 });
        mixedSent++;
      }
      // Awaited, so every pack is really processed; a refused (oversized) one closes the connection,
      // and then mqtt.js neither acknowledges nor fails the publish: stop waiting at the close.
      const client = bad;
      let onClose = () => {};
      await Promise.race([
        client.publishAsync(badTopic, payload, { qos: 1 }).catch(() => undefined),
        new Promise<void>((r) => {
          onClose = () => r();
          client.once("close", onClose);
        }),
      ]);
      client.off("close", onClose);
      if (i % 10 === 0) {
        await good.publishAsync(goodTopic, JSON.stringify([{ n: "medium.moisture", u: "/", v: 0.4, t: (base + goodSent * 1000) / 1000 }]), { qos: 1 });
        goodSent++;
      }
    }
    await good.publishAsync(goodTopic, JSON.stringify([{ n: "medium.moisture", u: "/", v: 0.41, t: (base + goodSent * 1000) / 1000 }]), { qos: 1 });
    goodSent++;

    // Bounded: 40 MB more of refused packs leave nothing behind. (RSS grows by tens of MB over this
    // test anyway, so the RSS check below would not notice a server keeping every refused pack.)
    if (!bad.connected) bad = await connectSensor(server, fuzzer!);
    const refused = [
      JSON.stringify([{ n: "air.temperature", u: "degF", v: 70, vs: "y".repeat(40_000) }]),
      `[{"n":"battery","u":"%EL","vs":"${"z".repeat(40_000)}"`,
      JSON.stringify({ n: "battery", vs: "w".repeat(40_000) }),
    ];
    const heldBefore = heldMb();
    for (let i = 0; i < 1000; i++) await bad.publishAsync(badTopic, refused[i % refused.length]!, { qos: 1 });
    const heldGrowthMb = heldMb() - heldBefore;
    bad.end(true);
    await good.endAsync();

    const db = rawDatabase(server.dataSource);
    const stored = (db.prepare("SELECT COUNT(*) AS n FROM reading WHERE sensor_id = ? AND quantity = 'medium.moisture'").get(honest!.id) as { n: number }).n;
    expect(stored).toBe(goodSent);
    // The fuzz itself stores a few moisture readings now and then; the hidden ones are those of the hour-old minutes.
    const storedMixed = (
      db.prepare("SELECT COUNT(*) AS n FROM reading WHERE sensor_id = ? AND quantity = 'medium.moisture' AND time_ms BETWEEN ? AND ?").get(fuzzer!.id, base - 500, base + mixedSent * 1000) as { n: number }
    ).n;
    expect(mixedSent).toBeGreaterThan(200);
    expect(storedMixed).toBe(mixedSent);

    const reasons = server.metrics.readingsRejected.entries().filter((e) => e.value > 0).map((e) => e.labels.reason);
    expect(reasons).toEqual(expect.arrayContaining(["malformed-json", "not-a-pack", "unit-not-accepted", "unknown-quantity", "invalid-record", "unknown-mandatory-field"]));
    expect(server.metrics.mqttMessages.get()).toBeGreaterThanOrEqual(payloads.length - 2 + goodSent);
    expect(server.metrics.mqttRefused.get({ reason: "packet-too-large" })).toBeGreaterThanOrEqual(2);
    const metrics = await (await fetch(`${server.baseUrl}/metrics`)).text();
    expect(metrics).toMatch(/benchwarden_readings_rejected_total\{reason="malformed-json"\} \d+/);
    expect((await fetch(`${server.baseUrl}/healthz`)).status).toBe(200);
    const rssGrowthMb = (process.memoryUsage().rss - rssBefore) / 1024 / 1024;
    expect(rssGrowthMb).toBeLessThan(200);
    expect(heldGrowthMb).toBeLessThan(10);
  }, 120_000);

  it("random bodies and queries to every API route never cause a server error", async () => {
    const admin = await signIn(server, "admin");
    const rules = (server.app.locals as { routeTable: RouteTable }).routeTable.rules.filter((r) => r.path.startsWith("/api") && r.path !== "/api/stream");
    const bodies = fc.sample(fc.oneof(fc.jsonValue(), fc.object(), fc.array(fc.anything())), { numRuns: 25, seed: 9457 });
    const failures: string[] = [];
    for (const rule of rules) {
      const path = rule.path.replace(/:[A-Za-z]+/g, (m) => (m === ":token" ? "eyJhbGciOiJIUzI1NiJ9.e30.x" : "1"));
      for (const body of bodies) {
        const query = rule.method === "GET" ? `?${new URLSearchParams({ from: String(body).slice(0, 20), to: "x", status: "🙂", limit: "-1" })}` : "";
        const res = await fetch(`${server.baseUrl}${path}${query}`, {
          method: rule.method,
          headers: { "Content-Type": "application/json", Authorization: `Bearer ${admin}` },
          body: rule.method === "GET" || rule.method === "DELETE" ? undefined : JSON.stringify(body),
        });
        if (res.status >= 500) failures.push(`${rule.method} ${path} ${JSON.stringify(body).slice(0, 80)} → ${res.status} ${(await res.text()).slice(0, 120)}`);
        else await res.arrayBuffer();
      }
    }
    expect(failures).toEqual([]);
  }, 120_000);
});
