import request from "supertest";
import { afterEach, describe, expect, it } from "vitest";
import { alertsResponseSchema, dutyRotaResponseSchema, type AlertView } from "../../shared/schemas/alerts.js";
import { caughtMailResponseSchema, type CaughtMail } from "../../shared/schemas/mail.js";
import { AlertEntity } from "../../server/db/entities/alert.entity.js";
import { connectSensor, signIn, startTestServer, waitFor, type TestServer } from "../support/test-server.js";

/**
 * A site's own escalation and reminder times (set by a manager on the duty rota page) against the
 * server's defaults (ALERT_ESCALATE_AFTER, ALERT_RENOTIFY_EVERY), over the real pipeline: broker,
 * engine, notifier, outbox, SMTP sink. The timer is off (ALERT_TICK=1h); each step runs the
 * engine's round with server.alerts.pass().
 *
 * A site's times cannot go below 5 minutes, so instead of waiting the tests move the raised
 * alert's clock back in the database ("raised 6 minutes ago"), as readings are backdated to
 * complete a hold-off. The engine reads those times from the alert row at every pass.
 */
const FAST = { ALERT_TICK: "1h", ALERT_GROUP_WINDOW: "0s", MAIL_RETRY_FIRST: "100ms" };
const MIN = 60_000;

let server: TestServer | null = null;
afterEach(async () => {
  await server?.cleanup();
  server = null;
});

async function boot(env: Record<string, string>): Promise<{ server: TestServer; admin: string; manager: string; siteId: number }> {
  server = await startTestServer({ ...FAST, ...env });
  const admin = await signIn(server, "admin");
  const manager = await signIn(server, "manager");
  // The grower is on duty for every zone all day, so who is mailed does not depend on the clock.
  const rota = dutyRotaResponseSchema.parse((await request(server.baseUrl).get("/api/duty-rota").auth(manager, { type: "bearer" }).expect(200)).body);
  for (const shift of rota.shifts) await request(server.baseUrl).delete(`/api/duty-rota/shifts/${shift.id}`).auth(manager, { type: "bearer" }).expect(204);
  const users = await request(server.baseUrl).get("/api/users").auth(admin, { type: "bearer" }).expect(200);
  const grower = (users.body.users as { id: number; email: string }[]).find((u) => u.email === "grower@nursery.test")!;
  await request(server.baseUrl)
    .post("/api/duty-rota/shifts")
    .auth(manager, { type: "bearer" })
    .send({ zoneId: null, userId: grower.id, weekdays: 127, startMinute: 0, endMinute: 1440, isFallback: false })
    .expect(201);
  return { server, admin, manager, siteId: rota.alertTiming[0]!.siteId };
}

async function setSiteTiming(s: TestServer, manager: string, siteId: number, body: { escalateAfterS: number | null; renotifyEveryS: number | null }): Promise<void> {
  await request(s.baseUrl).put(`/api/sites/${siteId}/alert-timing`).auth(manager, { type: "bearer" }).send(body).expect(200);
}

async function mailbox(s: TestServer, admin: string): Promise<CaughtMail[]> {
  const res = await request(s.baseUrl).get("/api/mail").auth(admin, { type: "bearer" }).expect(200);
  return caughtMailResponseSchema.parse(res.body).messages.filter((m) => !m.subject.includes("Benchwarden password") && !m.subject.includes("invited"));
}

async function settle(s: TestServer): Promise<void> {
  await s.alerts.engine.idle();
  await s.alerts.pass();
}

/** Air at 15 °C for 12 minutes on the first air probe: past the demo's 10-minute hold-off, so raised at the next pass. */
async function raiseColdAlert(s: TestServer, admin: string): Promise<AlertView> {
  const air = s.credentials.find((c) => c.kind === "air")!;
  const nowS = Math.floor(Date.now() / 1000);
  const client = await connectSensor(s, air);
  await client.publishAsync(`benchwarden/v1/sensors/${air.id}/readings`, JSON.stringify([720, 360, 0].map((age) => ({ n: "air.temperature", u: "Cel", v: 15, t: nowS - age }))), {
    qos: 1,
  });
  await client.endAsync();
  await settle(s);
  const mails = await waitFor(async () => {
    const all = await mailbox(s, admin);
    return all.length > 0 ? all : undefined;
  });
  expect(mails.map((m) => [m.subject.split(" ")[0], m.to])).toEqual([["ALERT", ["grower@nursery.test"]]]);
  const res = await request(s.baseUrl).get("/api/alerts?status=open").auth(admin, { type: "bearer" }).expect(200);
  const alert = alertsResponseSchema.parse(res.body).alerts.find((a) => a.benchId === air.benchId)!;
  expect(alert.phase).toBe("raised");
  return alert;
}

/** The alert was raised (and last mailed) `raisedAgoMs` ago, last mailed `notifiedAgoMs` ago. */
async function moveAlertClock(s: TestServer, alertId: number, raisedAgoMs: number, notifiedAgoMs = raisedAgoMs): Promise<void> {
  const nowMs = Date.now();
  await s.dataSource.getRepository(AlertEntity).update({ id: alertId }, { raisedAtMs: nowMs - raisedAgoMs, lastNotifiedMs: nowMs - notifiedAgoMs });
}

/** Mails after the first `skip`, as "SUBJECT-PREFIX → recipients". */
async function newMails(s: TestServer, admin: string, skip: number): Promise<string[]> {
  await s.alerts.outbox.sendDue();
  return (await mailbox(s, admin))
    .slice(0, -skip || undefined)
    .reverse()
    .map((m) => `${m.subject.startsWith("NOT ACKNOWLEDGED") ? "escalation" : m.subject.startsWith("STILL OUT") ? "reminder" : m.subject} → ${m.to.join(", ")}`);
}

describe("escalation and reminder times per site", () => {
  it("when a site's own escalation time (shorter than the server's default) runs out unacknowledged, then the managers are mailed; its reminder interval likewise", async () => {
    const { server: s, admin, manager, siteId } = await boot({ ALERT_ESCALATE_AFTER: "12h", ALERT_RENOTIFY_EVERY: "12h" });
    await setSiteTiming(s, manager, siteId, { escalateAfterS: 5 * 60, renotifyEveryS: 10 * 60 });
    const alert = await raiseColdAlert(s, admin);

    // 4 minutes unacknowledged: inside the site's 5 minutes, nothing more.
    await moveAlertClock(s, alert.id, 4 * MIN);
    await settle(s);
    expect(await newMails(s, admin, 1)).toEqual([]);

    // 6 minutes: past the site's 5 (the server's default would wait 12 hours). Not yet 10 for a reminder.
    await moveAlertClock(s, alert.id, 6 * MIN);
    await settle(s);
    const escalated = await waitFor(async () => {
      const mails = await newMails(s, admin, 1);
      return mails.length > 0 ? mails : undefined;
    });
    expect(escalated).toEqual(["escalation → manager@nursery.test"]);

    // Last mailed 11 minutes ago: past the site's 10-minute reminder interval.
    await moveAlertClock(s, alert.id, 11 * MIN, 11 * MIN);
    await settle(s);
    const reminded = await waitFor(async () => {
      const mails = await newMails(s, admin, 1);
      return mails.length > 1 ? mails : undefined;
    });
    expect(reminded).toEqual(["escalation → manager@nursery.test", "reminder → grower@nursery.test"]);
  });

  it("a site's longer escalation time holds the managers' mail back past the server's default; back on the default, it goes at the next pass", async () => {
    const { server: s, admin, manager, siteId } = await boot({ ALERT_ESCALATE_AFTER: "5m", ALERT_RENOTIFY_EVERY: "12h" });
    await setSiteTiming(s, manager, siteId, { escalateAfterS: 60 * 60, renotifyEveryS: null });
    const alert = await raiseColdAlert(s, admin);

    // 20 minutes unacknowledged: four times the server's 5 minutes, but inside the site's hour.
    await moveAlertClock(s, alert.id, 20 * MIN, 0);
    await settle(s);
    await settle(s);
    expect(await newMails(s, admin, 1)).toEqual([]);

    // The manager puts the site back on the default: the next pass escalates.
    await setSiteTiming(s, manager, siteId, { escalateAfterS: null, renotifyEveryS: null });
    await settle(s);
    const escalated = await waitFor(async () => {
      const mails = await newMails(s, admin, 1);
      return mails.length > 0 ? mails : undefined;
    });
    expect(escalated).toEqual(["escalation → manager@nursery.test"]);
  });
});
