import { PassThrough } from "node:stream";
import jwt from "jsonwebtoken";
import { pino } from "pino";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signAckLink } from "../../server/alerts/ack-links.js";
import { connectSensor, signIn, startTestServer, TEST_DEMO_PASSWORD, waitFor, type TestServer } from "../support/test-server.js";

const SECRET = "security-test-secret-0123456789abcdefgh";
const logLines: string[] = [];
let server: TestServer;
let admin: string;

beforeAll(async () => {
  // Every log line of the run, at debug level, to grep for secrets afterwards.
  const sink = new PassThrough();
  sink.on("data", (chunk: Buffer) => logLines.push(...chunk.toString().split("\n").filter(Boolean)));
  server = await startTestServer({ JWT_SECRET: SECRET, LOG_LEVEL: "debug", ALERT_TICK: "1h", ALERT_GROUP_WINDOW: "0s" }, { logger: pino({ level: "debug" }, sink) });
  admin = await signIn(server, "admin");
});

afterAll(async () => {
  await server.cleanup();
});

const api = () => request(server.baseUrl);

describe("tokens", () => {
  it("a tampered session token is refused", async () => {
    const [head, body, sig] = admin.split(".") as [string, string, string];
    const claims = JSON.parse(Buffer.from(body, "base64url").toString()) as Record<string, unknown>;
    const forgedBody = Buffer.from(JSON.stringify({ ...claims, sub: "2" })).toString("base64url");
    await api().get("/api/zones").auth(`${head}.${forgedBody}.${sig}`, { type: "bearer" }).expect(401);
    await api().get("/api/zones").auth(`${head}.${body}.${sig.slice(0, -2)}xx`, { type: "bearer" }).expect(401);
    // alg "none" is never accepted.
    const none = `${Buffer.from('{"alg":"none","typ":"JWT"}').toString("base64url")}.${body}.`;
    await api().get("/api/zones").auth(none, { type: "bearer" }).expect(401);
  });

  it("acknowledge links that are altered, expired or for another purpose are refused; replay is refused", async () => {
    const air = server.credentials.find((c) => c.kind === "air")!;
    const client = await connectSensor(server, air);
    const nowS = Math.floor(Date.now() / 1000);
    await client.publishAsync(
      `benchwarden/v1/sensors/${air.id}/readings`,
      JSON.stringify([{ n: "air.temperature", u: "Cel", v: 12, t: nowS - 700 }, { n: "air.temperature", u: "Cel", v: 12, t: nowS }]),
      { qos: 1 },
    );
    await client.endAsync();
    await server.alerts.engine.idle();
    await server.alerts.pass();
    const alertId = await waitFor(async () => {
      const res = await api().get("/api/alerts").auth(admin, { type: "bearer" });
      return (res.body.alerts as { id: number; phase: string }[]).find((a) => a.phase === "raised")?.id;
    });

    const good = signAckLink([alertId], 1, SECRET, 60_000);
    const altered = good.slice(0, -3) + (good.endsWith("a") ? "bbb" : "aaa");
    expect(JSON.parse((await api().post(`/api/ack-links/${altered}`).send({}).expect(410)).text).code).toBe("link-not-valid");
    const expired = jwt.sign({ purpose: "ack", aids: [alertId], exp: Math.floor(Date.now() / 1000) - 5 }, SECRET, { subject: "1" });
    await api().post(`/api/ack-links/${expired}`).send({}).expect(410);
    const wrongPurpose = jwt.sign({ purpose: "reset", pwv: 1 }, SECRET, { subject: "1", expiresIn: 60 });
    await api().post(`/api/ack-links/${wrongPurpose}`).send({}).expect(410);
    const otherSecret = signAckLink([alertId], 1, "x".repeat(40), 60_000);
    await api().post(`/api/ack-links/${otherSecret}`).send({}).expect(410);

    await api().post(`/api/ack-links/${good}`).send({}).expect(200);
    expect(JSON.parse((await api().post(`/api/ack-links/${good}`).send({}).expect(410)).text).code).toBe("already-acknowledged");
  });
});

describe("cross-site requests", () => {
  it("a form posted from another site is refused, even with a valid session cookie", async () => {
    const res = await api()
      .post("/api/users")
      .set("Origin", "https://elsewhere.example")
      .set("Cookie", `bw_session=${admin}`)
      .type("form")
      .send("name=Mallory&email=m@elsewhere.example&role=admin")
      .expect(403);
    expect(JSON.parse(res.text).code).toBe("cross-site-request");
  });

  it("a form body is refused even without an Origin header (the API speaks JSON only)", async () => {
    const res = await api().post("/api/session").type("form").send(`email=admin%40nursery.test&password=${TEST_DEMO_PASSWORD}`).expect(415);
    expect(JSON.parse(res.text).code).toBe("unsupported-media-type");
  });

  it("same-origin JSON still works", async () => {
    await api().post("/api/session").set("Origin", server.baseUrl).send({ email: "viewer@nursery.test", password: TEST_DEMO_PASSWORD }).expect(200);
  });
});

describe("headers", () => {
  it("the content-security policy allows scripts only from our origin, never inline", async () => {
    const res = await api().get("/healthz").expect(200);
    const csp = res.headers["content-security-policy"] as string;
    const scriptSrc = /script-src ([^;]*)/.exec(csp)?.[1] ?? /default-src ([^;]*)/.exec(csp)![1]!;
    expect(scriptSrc.trim()).toBe("'self'");
    expect(csp).not.toMatch(/script-src[^;]*'unsafe-inline'/);
    expect(csp).toMatch(/object-src 'none'/);
    expect(res.headers["x-content-type-options"]).toBe("nosniff");
  });
});

describe("logs", () => {
  it("no password, secret, hash or token appears in any log line of the run", async () => {
    // Exercise the paths that handle secrets: sign-in, invite (link), reset, sensor registration.
    await api().post("/api/users").auth(admin, { type: "bearer" }).send({ name: "Oskar Hale", email: "oskar@nursery.test", role: "viewer" }).expect(201);
    await api().post("/api/password-resets").send({ email: "manager@nursery.test" }).expect(202);
    const reg = await api().post("/api/sensors").auth(admin, { type: "bearer" }).send({ id: "log-probe-1", kind: "air", benchId: null }).expect(201);
    await api().post("/api/session").send({ email: "viewer@nursery.test", password: "a wrong password" }).expect(401);
    await server.alerts.outbox.sendDue();

    const text = logLines.join("\n");
    expect(logLines.length).toBeGreaterThan(5);
    const forbidden = [TEST_DEMO_PASSWORD, "a wrong password", reg.body.secret as string, admin, SECRET, ...server.credentials.map((c) => c.secret)];
    for (const secret of forbidden) expect(text).not.toContain(secret);
    expect(text).not.toMatch(/\$2[aby]\$\d\d\$/); // bcrypt hashes
    expect(text).not.toMatch(/token=/);
    expect(text).not.toMatch(/eyJ[A-Za-z0-9_-]{10,}\.[A-Za-z0-9_-]{10,}/); // any JWT
  });
});
