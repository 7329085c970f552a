import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startPostgres, type Postgres } from "../support/postgres.js";
import { connectSensor, signIn, startTestServer, type TestServer } from "../support/test-server.js";

// Two instances on one PostgreSQL database, each with its own embedded broker (probes may sign in
// at either): what one learns, the other's users see, and a change made through one binds the other.

let database: Postgres;
let a: TestServer;
let b: TestServer;

beforeAll(async () => {
  database = await startPostgres();
  const url = await database.createDatabase();
  a = await startTestServer({ DATABASE_URL: url, ALERT_TICK: "1h" });
  // The same folder: b finds the demo probes' credentials a wrote, rather than renewing them.
  b = await startTestServer({ DATABASE_URL: url, ALERT_TICK: "1h" }, { dir: a.dir });
}, 120_000);

afterAll(async () => {
  await b?.cleanup();
  await a?.cleanup();
  await database?.cleanup();
});

/** Reads an instance's live stream until `seen` says enough, or fails after timeoutMs. */
async function streamUntil(server: TestServer, token: string, seen: (text: string) => boolean, timeoutMs: number): Promise<string> {
  const controller = new AbortController();
  const timer = setTimeout(() => controller.abort(), timeoutMs);
  let text = "";
  try {
    const res = await fetch(`${server.baseUrl}/api/stream`, { headers: { cookie: `bw_session=${token}` }, signal: controller.signal });
    const reader = res.body!.getReader();
    for (;;) {
      const { value, done } = await reader.read();
      if (done) break;
      text += new TextDecoder().decode(value);
      if (seen(text)) return text;
    }
  } catch (err) {
    if (!controller.signal.aborted) throw err;
  } finally {
    clearTimeout(timer);
    controller.abort();
  }
  throw new Error(`not seen on ${server.baseUrl}'s stream within ${timeoutMs} ms; got: ${text.slice(0, 500)}`);
}

describe("two instances on one PostgreSQL database", () => {
  it("a reading stored by one instance is on the other's live stream", async () => {
    const token = await signIn(b, "viewer");
    const probe = a.credentials.find((c) => c.kind === "combined")!;
    const value = 23.4567;
    const watching = streamUntil(b, token, (text) => text.includes(`"sensorId":"${probe.id}"`) && text.includes(String(value)), 10_000);
    await new Promise((r) => setTimeout(r, 300)); // the stream is open
    const client = await connectSensor(a, probe);
    await client.publishAsync(`benchwarden/v1/sensors/${probe.id}/readings`, JSON.stringify([{ n: "air.temperature", u: "Cel", v: value, t: Date.now() / 1000 }]), { qos: 1 });
    await client.endAsync();
    await watching;
  });

  it("a probe disabled through one instance is refused at once by the other's broker", async () => {
    const probe = a.credentials.find((c) => c.kind === "air")!;
    // b has the probe cached: it signs in there.
    const before = await connectSensor(b, probe);
    await before.endAsync();
    const admin = await signIn(a, "admin");
    const res = await fetch(`${a.baseUrl}/api/sensors/${probe.id}`, {
      method: "PATCH",
      headers: { cookie: `bw_session=${admin}`, "Content-Type": "application/json", Origin: a.baseUrl },
      body: JSON.stringify({ disabled: true }),
    });
    expect(res.status).toBe(200);
    // The event reaches b through NOTIFY; give it a moment, then the sign-in must fail.
    const deadline = Date.now() + 5000;
    let refused = false;
    while (!refused && Date.now() < deadline) {
      refused = await connectSensor(b, probe).then(
        async (c) => {
          await c.endAsync();
          return false;
        },
        () => true,
      );
      if (!refused) await new Promise((r) => setTimeout(r, 100));
    }
    expect(refused).toBe(true);
  });

  it("exactly one of them runs the alert engine", () => {
    expect([a.instance.runsAlerts(), b.instance.runsAlerts()].filter(Boolean)).toHaveLength(1);
  });
});
