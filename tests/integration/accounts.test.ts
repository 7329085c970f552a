import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { caughtMailResponseSchema } from "../../shared/schemas/mail.js";
import { signIn, startTestServer, TEST_DEMO_PASSWORD, waitFor, type TestServer } from "../support/test-server.js";

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

async function mailboxFor(address: string) {
  const res = await api().get("/api/mail").auth(admin, { type: "bearer" }).expect(200);
  return caughtMailResponseSchema.parse(res.body).messages.filter((m) => m.to.includes(address));
}

/** Mail goes through the outbox, so it arrives a moment later: wait for `count` messages. */
async function mailTo(address: string, count = 1) {
  return waitFor(async () => {
    const messages = await mailboxFor(address);
    return messages.length >= count ? messages : undefined;
  }, 5000);
}

function linkToken(text: string): string {
  const match = /\/set-password\?token=([^\s]+)/.exec(text);
  if (!match) throw new Error(`no link in: ${text}`);
  return decodeURIComponent(match[1]!);
}

describe("sign-in", () => {
  it("sets an httpOnly, SameSite=Strict cookie for one shift and returns the user without secrets", async () => {
    const res = await api().post("/api/session").send({ email: "Grower@Nursery.test ", password: TEST_DEMO_PASSWORD }).expect(200);
    const cookie = res.headers["set-cookie"]![0]!;
    expect(cookie).toMatch(/^bw_session=/);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Strict/);
    expect(cookie).toMatch(/Max-Age=43200/);
    expect(res.body.user).toMatchObject({ email: "grower@nursery.test", role: "grower" });
    expect(JSON.stringify(res.body)).not.toMatch(/passwordHash|\$2[aby]\$/);
  });

  it("restores the session from the cookie, and sign-out clears it", async () => {
    const agent = request.agent(server.baseUrl);
    await agent.post("/api/session").send({ email: "viewer@nursery.test", password: TEST_DEMO_PASSWORD }).expect(200);
    const me = await agent.get("/api/session").expect(200);
    expect(me.body.user.role).toBe("viewer");
    const out = await agent.delete("/api/session").expect(204);
    expect(out.headers["set-cookie"]![0]).toMatch(/bw_session=;/);
    await agent.get("/api/session").expect(401);
  });

  it("answers a wrong password and an unknown address the same way", async () => {
    const wrong = await api().post("/api/session").send({ email: "manager@nursery.test", password: "wrong password" }).expect(401);
    const unknown = await api().post("/api/session").send({ email: "nobody@nursery.test", password: "wrong password" }).expect(401);
    expect(JSON.parse(wrong.text)).toEqual(JSON.parse(unknown.text));
  });

  it("after five failures for one address, even the right password waits, with a clear message", async () => {
    const email = "viewer@nursery.test";
    for (let i = 0; i < 5; i++) await api().post("/api/session").send({ email, password: `guess ${i}` }).expect(401);
    const res = await api().post("/api/session").send({ email, password: TEST_DEMO_PASSWORD }).expect(429);
    const problem = JSON.parse(res.text);
    expect(problem.code).toBe("too-many-sign-in-attempts");
    expect(problem.detail).toMatch(/Try again in 15 minutes/);
    // Another address from the same IP is not locked out by this one.
    await api().post("/api/session").send({ email: "manager@nursery.test", password: TEST_DEMO_PASSWORD }).expect(200);
  });
});

describe("invitations and password resets by e-mail", () => {
  it("an invited user sets a password through the e-mailed link, which works once", async () => {
    const invited = await api()
      .post("/api/users")
      .auth(admin, { type: "bearer" })
      .send({ name: "Priya Lindqvist", email: "priya@nursery.test", role: "grower" })
      .expect(201);
    expect(invited.body.user).toMatchObject({ hasPassword: false, role: "grower" });

    const [mail] = await mailTo("priya@nursery.test");
    expect(mail?.subject).toBe("You are invited to Benchwarden");
    const token = linkToken(mail!.text);

    // Opening the link changes nothing.
    const described = await api().get(`/api/password-links/${encodeURIComponent(token)}`).expect(200);
    expect(described.body).toMatchObject({ purpose: "invite", email: "priya@nursery.test" });
    await api().get(`/api/password-links/${encodeURIComponent(token)}`).expect(200);

    await api()
      .post(`/api/password-links/${encodeURIComponent(token)}`)
      .send({ password: "a long enough password", confirm: "a long enough password" })
      .expect(200);
    await api().post("/api/session").send({ email: "priya@nursery.test", password: "a long enough password" }).expect(200);

    const again = await api()
      .post(`/api/password-links/${encodeURIComponent(token)}`)
      .send({ password: "another long password", confirm: "another long password" })
      .expect(410);
    expect(JSON.parse(again.text).code).toBe("link-not-valid");
  });

  it("a reset is answered the same for known and unknown addresses, and mailed only to a real account", async () => {
    const known = await api().post("/api/password-resets").send({ email: "manager@nursery.test" }).expect(202);
    const unknown = await api().post("/api/password-resets").send({ email: "stranger@nursery.test" }).expect(202);
    expect(known.body).toEqual(unknown.body);
    const [mail] = await mailTo("manager@nursery.test");
    await server.alerts.outbox.sendDue();
    expect(await mailboxFor("stranger@nursery.test")).toHaveLength(0);
    expect(mail?.subject).toBe("Reset your Benchwarden password");
  });

  it("a password reset signs out the sessions opened with the old password", async () => {
    const oldSession = await signIn(server, "manager");
    await api().post("/api/password-resets").send({ email: "manager@nursery.test" }).expect(202);
    const [latest] = await mailTo("manager@nursery.test", 2);
    await api()
      .post(`/api/password-links/${encodeURIComponent(linkToken(latest!.text))}`)
      .send({ password: TEST_DEMO_PASSWORD + "!", confirm: TEST_DEMO_PASSWORD + "!" })
      .expect(200);
    await api().get("/api/zones").auth(oldSession, { type: "bearer" }).expect(401);
  });

  it("refuses mismatched passwords with the field named", async () => {
    const res = await api().post("/api/password-links/whatever-token").send({ password: "long enough one", confirm: "different one!" }).expect(400);
    expect(JSON.parse(res.text).errors).toContainEqual({ path: "confirm", message: "The two passwords differ" });
  });
});

describe("user administration", () => {
  it("a disabled user's session stops working at once", async () => {
    const viewerSession = await signIn(server, "grower");
    const users = (await api().get("/api/users").auth(admin, { type: "bearer" }).expect(200)).body.users as { id: number; email: string }[];
    const grower = users.find((u) => u.email === "grower@nursery.test")!;
    await api().patch(`/api/users/${grower.id}`).auth(admin, { type: "bearer" }).send({ disabled: true }).expect(200);
    await api().get("/api/zones").auth(viewerSession, { type: "bearer" }).expect(401);
    await api().patch(`/api/users/${grower.id}`).auth(admin, { type: "bearer" }).send({ disabled: false }).expect(200);
  });

  it("nobody can remove the last admin", async () => {
    const users = (await api().get("/api/users").auth(admin, { type: "bearer" }).expect(200)).body.users as { id: number; role: string }[];
    const onlyAdmin = users.find((u) => u.role === "admin")!;
    const res = await api().patch(`/api/users/${onlyAdmin.id}`).auth(admin, { type: "bearer" }).send({ role: "manager" }).expect(409);
    expect(JSON.parse(res.text).code).toBe("last-admin");
  });

  it("never shows a password hash", async () => {
    const res = await api().get("/api/users").auth(admin, { type: "bearer" }).expect(200);
    expect(res.text).not.toMatch(/\$2[aby]\$/);
    expect(res.text).not.toMatch(/passwordHash/);
  });

  it("a user can change their own temperature unit", async () => {
    const res = await api().patch("/api/me").auth(admin, { type: "bearer" }).send({ temperatureUnit: "C" }).expect(200);
    expect(res.body.user.temperatureUnit).toBe("C");
    const session = await api().get("/api/session").auth(admin, { type: "bearer" }).expect(200);
    expect(session.body.user.temperatureUnit).toBe("C");
  });
});
