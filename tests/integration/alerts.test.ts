import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import request from "supertest";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { ackLinkResponseSchema, alertsResponseSchema, type AlertView } from "../../shared/schemas/alerts.js";
import { caughtMailResponseSchema, type CaughtMail } from "../../shared/schemas/mail.js";
import { BenchEntity } from "../../server/db/entities/bench.entity.js";
import { startSmtpSink } from "../../server/mail/smtp-sink.js";
import { connectSensor, signIn, startTestServer, waitFor, type TestServer } from "../support/test-server.js";

/**
 * The alert pipeline end to end: real broker over TCP, real SQLite file, real SMTP to the sink.
 * Time is controlled two ways: readings carry their own (past) times, so a 10-minute hold-off
 * can be completed at once; and the timer is off (ALERT_TICK=1h) — each test runs the engine's
 * round (evaluate → group → send) itself with server.alerts.pass().
 */
const FAST = { ALERT_TICK: "1h", ALERT_GROUP_WINDOW: "0s", MAIL_RETRY_FIRST: "100ms" };

const servers: TestServer[] = [];
afterAll(async () => {
  for (const s of servers) await s.cleanup();
});

async function boot(env: Record<string, string> = {}, dir?: string): Promise<{ server: TestServer; admin: string; manager: string }> {
  const server = await startTestServer({ ...FAST, ...env }, { dir });
  servers.push(server);
  const admin = await signIn(server, "admin");
  const manager = await signIn(server, "manager");
  return { server, admin, manager };
}

/** Put the demo grower on duty for every zone all day, so who is mailed does not depend on the clock. */
async function growerOnDutyAllDay(server: TestServer, manager: string): Promise<void> {
  const rota = await request(server.baseUrl).get("/api/duty-rota").auth(manager, { type: "bearer" }).expect(200);
  for (const shift of rota.body.shifts as { id: number }[]) {
    await request(server.baseUrl).delete(`/api/duty-rota/shifts/${shift.id}`).auth(manager, { type: "bearer" }).expect(204);
  }
  const users = await request(server.baseUrl).get("/api/users").auth(await signIn(server, "admin"), { type: "bearer" }).expect(200);
  const grower = (users.body.users as { id: number; email: string }[]).find((u) => u.email === "grower@nursery.test")!;
  await request(server.baseUrl)
    .post("/api/duty-rota/shifts")
    .auth(manager, { type: "bearer" })
    .send({ zoneId: null, userId: grower.id, weekdays: 127, startMinute: 0, endMinute: 1440, isFallback: false })
    .expect(201);
}

async function mailbox(server: TestServer, admin: string): Promise<CaughtMail[]> {
  const res = await request(server.baseUrl).get("/api/mail").auth(admin, { type: "bearer" }).expect(200);
  return caughtMailResponseSchema.parse(res.body).messages.filter((m) => !m.subject.includes("Benchwarden password") && !m.subject.includes("invited"));
}

async function publish(server: TestServer, credential: { id: string; secret: string }, pack: unknown[]): Promise<void> {
  const client = await connectSensor(server, credential);
  await client.publishAsync(`benchwarden/v1/sensors/${credential.id}/readings`, JSON.stringify(pack), { qos: 1 });
  await client.endAsync();
}

/** Air temperature readings at the given ages (seconds before now), one value. */
function coldFor(ages: number[], valueC: number) {
  const nowS = Math.floor(Date.now() / 1000);
  return ages.map((age) => ({ n: "air.temperature", u: "Cel", v: valueC, t: nowS - age }));
}

async function settle(server: TestServer): Promise<void> {
  await server.alerts.engine.idle();
  await server.alerts.pass();
}

async function openAlerts(server: TestServer, token: string): Promise<AlertView[]> {
  const res = await request(server.baseUrl).get("/api/alerts?status=open").auth(token, { type: "bearer" }).expect(200);
  return alertsResponseSchema.parse(res.body).alerts;
}

function ackToken(mail: CaughtMail): string {
  const match = /\/ack\?token=(\S+)/.exec(mail.text);
  if (!match) throw new Error(`no acknowledge link in:\n${mail.text}`);
  return decodeURIComponent(match[1]!);
}

describe("a bench out of window", () => {
  let server: TestServer;
  let admin: string;
  let manager: string;

  beforeAll(async () => {
    ({ server, admin, manager } = await boot({ ALERT_ESCALATE_AFTER: "2s", ALERT_RENOTIFY_EVERY: "1s" }));
    await growerOnDutyAllDay(server, manager);
  });

  it("when air stays below the window longer than the hold-off, then exactly one e-mail goes to the person on duty", async () => {
    const air = server.credentials.find((c) => c.kind === "air")!;
    // 15 °C for 12 minutes; the demo window is 70–80 °F with a 10-minute hold-off.
    await publish(server, air, coldFor([720, 360, 0], 15));
    await settle(server);
    const mails = await waitFor(async () => ((await mailbox(server, admin)).length > 0 ? mailbox(server, admin) : undefined), 5000);
    expect(mails).toHaveLength(1);
    const [mail] = mails;
    expect(mail!.to).toEqual(["grower@nursery.test"]);
    expect(mail!.subject).toBe("ALERT House 1 · Fig cuttings, Bench 1: air too cold 59.0 °F");
    expect(mail!.text).toContain("Hollin Lane Nursery · House 1 · Fig cuttings");
    expect(mail!.text).toContain("59.0 °F (window 70.0–80.0 °F)");
    expect(mail!.text).toMatch(/since \d\d:\d\d \(12 min\)/);

    await settle(server);
    expect(await mailbox(server, admin)).toHaveLength(1);
    const [alert] = (await openAlerts(server, admin)).filter((a) => a.benchId === air.benchId);
    expect(alert).toMatchObject({ kind: "window", phase: "raised", quantity: "air.temperature", direction: "below" });
    // The bench and time filters the bench page and the charts use.
    const forBench = await request(server.baseUrl).get(`/api/alerts?status=all&benchId=${air.benchId}&fromMs=${Date.now() - 3_600_000}`).auth(admin, { type: "bearer" }).expect(200);
    expect(alertsResponseSchema.parse(forBench.body).alerts.map((a) => a.benchId)).toEqual([air.benchId]);
    const before = await request(server.baseUrl).get(`/api/alerts?status=all&benchId=${air.benchId}&toMs=${Date.now() - 3_600_000}`).auth(admin, { type: "bearer" }).expect(200);
    expect(alertsResponseSchema.parse(before.body).alerts).toEqual([]);
  });

  it("opening the acknowledge link changes nothing; one tap acknowledges; the link then fails", async () => {
    const [mail] = await mailbox(server, admin);
    const token = ackToken(mail!);
    const shown = ackLinkResponseSchema.parse((await request(server.baseUrl).get(`/api/ack-links/${encodeURIComponent(token)}`).expect(200)).body);
    expect(shown).toMatchObject({ recipientName: "Marisol Ortega", recipientUnit: "F", canAcknowledge: true });
    expect(shown.alerts[0]!.phase).toBe("raised");
    await request(server.baseUrl).get(`/api/ack-links/${encodeURIComponent(token)}`).expect(200);
    expect((await openAlerts(server, admin))[0]!.phase).toBe("raised");

    const done = await request(server.baseUrl).post(`/api/ack-links/${encodeURIComponent(token)}`).send({ note: "Heater reset, checking again at 4" }).expect(200);
    expect(ackLinkResponseSchema.parse(done.body).alerts[0]).toMatchObject({ phase: "acknowledged", acknowledgedByName: "Marisol Ortega", acknowledgeNote: "Heater reset, checking again at 4" });

    const again = await request(server.baseUrl).post(`/api/ack-links/${encodeURIComponent(token)}`).send({}).expect(410);
    expect(JSON.parse(again.text)).toMatchObject({ code: "already-acknowledged", detail: "Already acknowledged by Marisol Ortega" });
  });

  it("an acknowledged alert is not re-notified nor escalated", async () => {
    await new Promise((r) => setTimeout(r, 2200));
    await settle(server);
    expect(await mailbox(server, admin)).toHaveLength(1);
  });

  it("when it comes back inside past the hysteresis band, then a short all-clear goes out", async () => {
    const air = server.credentials.find((c) => c.kind === "air")!;
    // 21.3 °C is inside (min 21.1) but within the 0.5 °C band: still open.
    await publish(server, air, coldFor([0], 21.3));
    await settle(server);
    expect((await openAlerts(server, admin)).filter((a) => a.benchId === air.benchId)).toHaveLength(1);
    await publish(server, air, [{ n: "air.temperature", u: "Cel", v: 23 }]);
    await settle(server);
    const mails = await waitFor(async () => {
      const all = await mailbox(server, admin);
      return all.length >= 2 ? all : undefined;
    }, 5000);
    expect(mails[0]!.subject).toBe("All clear: House 1 · Fig cuttings, Bench 1 back in window");
    expect(mails[0]!.text).not.toContain("/ack?token=");
    expect((await openAlerts(server, admin)).filter((a) => a.benchId === air.benchId)).toHaveLength(0);
  });

  it("a short excursion, back inside before the hold-off ends, sends nothing and leaves no alert", async () => {
    const air = server.credentials.filter((c) => c.kind === "air")[1]!;
    const before = (await mailbox(server, admin)).length;
    const nowS = Math.floor(Date.now() / 1000);
    await publish(server, air, [
      { n: "air.temperature", u: "Cel", v: 18, t: nowS - 300 },
      { n: "air.temperature", u: "Cel", v: 23, t: nowS - 10 },
    ]);
    await settle(server);
    await settle(server);
    expect(await mailbox(server, admin)).toHaveLength(before);
    expect((await openAlerts(server, admin)).filter((a) => a.benchId === air.benchId)).toHaveLength(0);
  });

  it("readings stamped in the future (a fast probe clock) do not shorten the hold-off", async () => {
    const air = server.credentials.filter((c) => c.kind === "air")[2]!;
    const before = (await mailbox(server, admin)).length;
    const nowS = Math.floor(Date.now() / 1000);
    // Cold since 6 min 40 s ago, and a reading stamped 4 minutes ahead (accepted: within the
    // 5-minute future limit). Taken at its word it would complete the 10-minute hold-off now.
    await publish(server, air, [
      { n: "air.temperature", u: "Cel", v: 15, t: nowS - 400 },
      { n: "air.temperature", u: "Cel", v: 15, t: nowS + 240 },
    ]);
    await settle(server);
    await settle(server);
    expect(await mailbox(server, admin)).toHaveLength(before);
    const watching = (await openAlerts(server, admin)).find((a) => a.benchId === air.benchId);
    expect(watching?.phase).toBe("watching");
  });

  it("when nobody acknowledges, then it is re-notified and then escalated to the manager", async () => {
    const medium = server.credentials.find((c) => c.kind === "medium")!;
    const before = (await mailbox(server, admin)).length;
    const nowS = Math.floor(Date.now() / 1000);
    // Medium soaked (0.7 m³/m³) for two hours: the moisture hold-off is an hour.
    await publish(server, medium, [
      { n: "medium.moisture", u: "/", v: 0.7, t: nowS - 7200 },
      { n: "medium.moisture", u: "/", v: 0.72, t: nowS },
    ]);
    await settle(server);
    const raised = await waitFor(async () => {
      const all = await mailbox(server, admin);
      return all.length > before ? all : undefined;
    });
    expect(raised[0]!.subject).toMatch(/^ALERT House 1 · Fig cuttings, Bench 1: medium too wet 72 % VWC$/);

    await new Promise((r) => setTimeout(r, 1100));
    await settle(server);
    const reminded = await waitFor(async () => {
      const all = await mailbox(server, admin);
      return all.some((m) => m.subject.startsWith("STILL OUT")) ? all : undefined;
    });
    expect(reminded.find((m) => m.subject.startsWith("STILL OUT"))!.to).toEqual(["grower@nursery.test"]);

    await new Promise((r) => setTimeout(r, 1000));
    await settle(server);
    const escalated = await waitFor(async () => {
      const all = await mailbox(server, admin);
      return all.find((m) => m.subject.startsWith("NOT ACKNOWLEDGED"));
    });
    expect(escalated.to).toEqual(["manager@nursery.test"]);
    expect(escalated.text).toContain("/ack?token=");
  });
});

describe("a house-wide failure", () => {
  it("twelve benches of one zone failing together go out as one e-mail", async () => {
    const { server, admin, manager } = await boot({ ALERT_GROUP_WINDOW: "1s" });
    await growerOnDutyAllDay(server, manager);
    // Make House 1 twelve benches: eight more, each with a new probe.
    const zoneId = (await server.dataSource.getRepository(BenchEntity).findOneByOrFail({ id: server.credentials[0]!.benchId })).zoneId;
    const probes = server.credentials.filter((c) => c.benchName.startsWith("House 1") && c.kind !== "medium");
    for (let i = 5; i <= 12; i++) {
      const bench = await server.dataSource.getRepository(BenchEntity).save({ zoneId, name: `Bench ${i}`, position: i, archivedAtMs: null });
      const res = await request(server.baseUrl).post("/api/sensors").auth(admin, { type: "bearer" }).send({ id: `h1-b${i}-extra`, kind: "air", benchId: bench.id }).expect(201);
      probes.push({ id: `h1-b${i}-extra`, secret: res.body.secret, benchId: bench.id, benchName: `House 1 – Bench ${i}`, kind: "air" });
    }
    await server.alerts.engine.tick(); // picks up the new benches' windows
    expect(new Set(probes.map((p) => p.benchId)).size).toBe(12);

    await Promise.all(probes.map((p) => publish(server, p, coldFor([700, 0], 12))));
    await settle(server);
    expect(await mailbox(server, admin)).toHaveLength(0); // still inside the grouping interval

    await new Promise((r) => setTimeout(r, 1100));
    await settle(server);
    const mails = await waitFor(async () => {
      const all = await mailbox(server, admin);
      return all.length > 0 ? all : undefined;
    });
    expect(mails).toHaveLength(1);
    expect(mails[0]!.subject).toBe("ALERT House 1 · Fig cuttings: 12 benches, air too cold");
    for (let i = 1; i <= 12; i++) expect(mails[0]!.text).toContain(`Bench ${i}: Air too cold`);
  });
});

describe("mail relay outage and restarts", () => {
  let dir: string;
  afterEach(() => undefined);

  it("when the SMTP sink is down during an alert, then the mail arrives once after it returns", async () => {
    const { server, admin, manager } = await boot();
    await growerOnDutyAllDay(server, manager);
    const port = server.smtpSinkPort!;
    await server.smtpSink!.close();

    const air = server.credentials.find((c) => c.kind === "air")!;
    await publish(server, air, coldFor([700, 0], 14));
    await settle(server);
    await settle(server);
    expect(server.metrics.mailFailed.get()).toBeGreaterThanOrEqual(1);

    const revived = await startSmtpSink(server.dataSource, server.logger, port);
    try {
      await new Promise((r) => setTimeout(r, 250));
      await settle(server);
      const mails = await waitFor(async () => {
        const all = await mailbox(server, admin);
        return all.length > 0 ? all : undefined;
      });
      await new Promise((r) => setTimeout(r, 300));
      await settle(server);
      expect(await mailbox(server, admin)).toHaveLength(1);
      expect(mails[0]!.subject).toMatch(/^ALERT/);
    } finally {
      await revived.close();
    }
  });

  it("when the server restarts while an alert is raised, then it stays raised and no mail is sent again", async () => {
    dir = mkdtempSync(join(tmpdir(), "benchwarden-restart-"));
    const first = await boot({}, dir);
    await growerOnDutyAllDay(first.server, first.manager);
    const air = first.server.credentials.find((c) => c.kind === "air")!;
    await publish(first.server, air, coldFor([700, 0], 14));
    await settle(first.server);
    await waitFor(async () => ((await mailbox(first.server, first.admin)).length === 1 ? true : undefined));
    await first.server.stop();

    const second = await boot({}, dir);
    try {
      // Still out. No "t": the server stamps it now, so it cannot collide with the last reading's second.
      await publish(second.server, air, [{ n: "air.temperature", u: "Cel", v: 13.5 }]);
      await settle(second.server);
      await settle(second.server);
      expect(await mailbox(second.server, second.admin)).toHaveLength(1);
      const open = (await openAlerts(second.server, second.admin)).filter((a) => a.benchId === air.benchId);
      expect(open).toHaveLength(1);
      expect(open[0]).toMatchObject({ phase: "raised", worstValue: 13.5 });
    } finally {
      await second.server.stop();
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe("silent sensors", () => {
  it("a sensor that stops reporting raises a sensor-silent alert; its MQTT last will raises one at once", async () => {
    const { server, admin } = await boot({ SENSOR_SILENT_AFTER: "1s" });
    const [quiet, dying] = server.credentials.filter((c) => c.kind === "combined");
    // The last will: the device drops off without a goodbye.
    const client = await (await import("mqtt")).default.connectAsync(`mqtt://127.0.0.1:${server.mqttPort}`, {
      username: dying!.id,
      password: dying!.secret,
      reconnectPeriod: 0,
      will: { topic: `benchwarden/v1/sensors/${dying!.id}/status`, payload: Buffer.from("offline"), qos: 1, retain: false },
    });
    (client as unknown as { stream: { destroy(): void } }).stream.destroy();
    const willAlert = await waitFor(async () => (await openAlerts(server, admin)).find((a) => a.kind === "sensor-silent" && a.sensorId === dying!.id));
    expect(willAlert.phase).toBe("raised");

    await publish(server, quiet!, [{ n: "battery", u: "%EL", v: 80 }]);
    await new Promise((r) => setTimeout(r, 1100));
    await settle(server);
    const silent = (await openAlerts(server, admin)).find((a) => a.kind === "sensor-silent" && a.sensorId === quiet!.id);
    expect(silent).toMatchObject({ phase: "raised", summary: `Sensor ${quiet!.id} silent`, benchId: quiet!.benchId });

    // It speaks again: the alert clears.
    await publish(server, quiet!, [{ n: "battery", u: "%EL", v: 80 }]);
    await server.alerts.engine.idle();
    expect((await openAlerts(server, admin)).find((a) => a.kind === "sensor-silent" && a.sensorId === quiet!.id)).toBeUndefined();
  });
});
