import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createInterface } from "node:readline";
import mqtt from "mqtt";
import pg from "pg";
import { SMTPServer } from "smtp-server";
import { afterAll, describe, expect, it } from "vitest";
import { PROJECT_ROOT } from "../../server/index.js";
import { freePort, runExport, startMosquitto, type Mosquitto } from "../support/mosquitto.js";
import { startPostgres, type Postgres } from "../support/postgres.js";

// Issue 11's topology on one machine: probes → Debian mosquitto → two Benchwarden instances (one
// shared subscription) → one PostgreSQL → the alert engine on whichever instance holds the lease →
// one mail relay. The relay is the one fake: it stands in for the hosted relay and counts messages.

const TSX = join(PROJECT_ROOT, "node_modules/tsx/dist/cli.mjs");
const TOTAL = 12_000;
const SERVER_USER = "benchwarden";
const SERVER_PASSWORD = randomBytes(18).toString("base64url");
const JWT_SECRET = randomBytes(32).toString("base64url");
const LEASE_TTL_MS = 3000;
const PASSWORD = "two-instance-test-2026";

const dir = mkdtempSync(join(tmpdir(), "benchwarden-two-instances-"));
const children: ChildProcess[] = [];
let broker: Mosquitto | undefined;
let database: Postgres | undefined;
let relay: SMTPServer | undefined;
afterAll(async () => {
  for (const c of children) if (c.exitCode === null && c.signalCode === null) c.kill("SIGKILL");
  await broker?.cleanup();
  await database?.cleanup();
  relay?.close(() => undefined);
  rmSync(dir, { recursive: true, force: true });
});

interface RelayedMail {
  messageId: string;
  to: string[];
}

async function startRelay(): Promise<{ url: string; mails: RelayedMail[] }> {
  const mails: RelayedMail[] = [];
  relay = new SMTPServer({
    secure: false,
    disabledCommands: ["STARTTLS"],
    authOptional: true,
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        const raw = Buffer.concat(chunks).toString("utf8");
        mails.push({
          messageId: /^Message-ID:\s*(<[^>]+>)/im.exec(raw)?.[1] ?? "",
          to: session.envelope.rcptTo.map((r) => r.address),
        });
        callback();
      });
    },
  });
  await new Promise<void>((resolve) => relay!.listen(0, "127.0.0.1", () => resolve()));
  const { port } = relay.server.address() as { port: number };
  return { url: `smtp://127.0.0.1:${port}`, mails };
}

interface Instance {
  name: string;
  httpPort: number;
  child: ChildProcess;
  baseUrl: string;
}

function instanceEnv(name: string, httpPort: number, databaseUrl: string, relayUrl: string): Record<string, string> {
  return {
    TSX_TSCONFIG_PATH: "tsconfig.server.json",
    PORT: String(httpPort),
    HOST: "127.0.0.1",
    DATABASE_URL: databaseUrl,
    // Only the folder matters here: the demo writes the probes' credentials beside it.
    DATABASE_PATH: join(dir, "unused.sqlite"),
    DEMO: "1",
    DEMO_PASSWORD: PASSWORD,
    SIM: "0",
    LOG_LEVEL: "warn",
    JWT_SECRET,
    MQTT_URL: broker!.url,
    MQTT_USERNAME: SERVER_USER,
    MQTT_PASSWORD: SERVER_PASSWORD,
    MQTT_CLIENT_ID: `benchwarden-${name}`,
    INSTANCE_ID: name,
    SMTP_URL: relayUrl,
    ALERT_TICK: "1s",
    ALERT_GROUP_WINDOW: "1s",
    LEADER_LEASE_TTL: `${LEASE_TTL_MS}ms`,
    MAIL_RETRY_FIRST: "1s",
  };
}

function startInstance(name: string, httpPort: number, env: Record<string, string>): Promise<Instance> {
  // tsx loaded in-process (not its CLI, which runs the server in a child): SIGKILL must hit the server itself.
  const child = spawn(process.execPath, ["--import", "tsx", "server/main.ts"], { cwd: PROJECT_ROOT, env: { ...process.env, ...env }, stdio: ["ignore", "pipe", "pipe"] });
  children.push(child);
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`instance ${name} did not start in 60 s`)), 60_000);
    child.stdout!.on("data", (chunk: Buffer) => {
      if (chunk.toString().includes("Benchwarden is running")) {
        clearTimeout(timer);
        resolve({ name, httpPort, child, baseUrl: `http://127.0.0.1:${httpPort}` });
      }
    });
    let stderr = "";
    child.stderr!.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
    child.once("exit", (code, signal) => reject(new Error(`instance ${name} exited early (${code ?? signal}): ${stderr.slice(-3000)}`)));
  });
}

async function metric(instance: Instance, name: string): Promise<number | null> {
  const text = await fetch(`${instance.baseUrl}/metrics`).then((r) => r.text());
  const value = new RegExp(`^${name}(?:\\{[^}]*\\})? (\\S+)`, "m").exec(text)?.[1];
  return value === undefined ? null : Number(value);
}

async function until<T>(what: string, check: () => Promise<T | null | undefined | false>, timeoutMs: number): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value !== null && value !== undefined && value !== false) return value;
    if (Date.now() > deadline) throw new Error(`${what}: not within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

async function signIn(instance: Instance, role: string): Promise<string> {
  const res = await fetch(`${instance.baseUrl}/api/session`, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify({ email: `${role}@nursery.test`, password: PASSWORD }) });
  if (res.status !== 200) throw new Error(`sign-in on ${instance.name}: ${res.status} ${await res.text()}`);
  return res.headers.getSetCookie().find((c) => c.startsWith("bw_session="))!.split(";")[0]!;
}

async function api<T>(instance: Instance, cookie: string, method: string, path: string, body?: unknown): Promise<T> {
  const res = await fetch(`${instance.baseUrl}${path}`, {
    method,
    headers: { cookie, Origin: instance.baseUrl, ...(body === undefined ? {} : { "Content-Type": "application/json" }) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  if (!res.ok) throw new Error(`${method} ${path} on ${instance.name}: ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

describe("two instances on PostgreSQL behind mosquitto", () => {
  it(
    "split the readings, store each once, raise an alert and mail it once; the engine moves when its instance is killed mid-stream",
    async () => {
      database = await startPostgres();
      const databaseUrl = await database.createDatabase();
      broker = await startMosquitto({ serverUser: SERVER_USER, serverPassword: SERVER_PASSWORD });
      const { url: relayUrl, mails } = await startRelay();
      const ports = { a: await freePort(), b: await freePort() };
      // Started together on an empty database: one migrates and seeds, the other waits for it.
      const [a, b] = await Promise.all([
        startInstance("a", ports.a, instanceEnv("a", ports.a, databaseUrl, relayUrl)),
        startInstance("b", ports.b, instanceEnv("b", ports.b, databaseUrl, relayUrl)),
      ]);
      const db = new pg.Client({ connectionString: databaseUrl });
      await db.connect();
      try {
        const users = ((await db.query(`SELECT COUNT(*)::int AS n FROM "user"`)).rows[0] as { n: number }).n;
        expect(users).toBe(4); // seeded once
        const exported = runExport({ ...instanceEnv("export", 0, databaseUrl, relayUrl), LOG_LEVEL: "silent" }, ["--out-dir", broker.dir, "--secrets", join(dir, "demo-sensors.json")]);
        expect(exported.status, exported.stderr).toBe(0);
        await broker.reload();

        // Exactly one instance runs the alert engine.
        const running = async () => [(await metric(a, "benchwarden_alert_engine_running")) ?? 0, (await metric(b, "benchwarden_alert_engine_running")) ?? 0];
        expect((await running()).reduce((x, y) => x + y)).toBe(1);
        const [leader, follower] = (await running())[0] === 1 ? [a, b] : [b, a];

        // A bench whose air window raises at once (no hold-off), set through the follower: the
        // leader's engine must see the change.
        const credentials = JSON.parse(readFileSync(join(dir, "demo-sensors.json"), "utf8")) as { id: string; secret: string; benchId: number; kind: string }[];
        const manager = await signIn(follower, "manager");
        // The numbered publisher plays the first four probes; the alert probes are two others, on other benches.
        const numberedBenches = new Set(credentials.slice(0, 4).map((c) => c.benchId));
        const alertProbes = credentials.slice(4).filter((c, i, all) => !numberedBenches.has(c.benchId) && all.findIndex((o) => o.benchId === c.benchId) === i).slice(0, 2);
        expect(alertProbes).toHaveLength(2);
        for (const probe of alertProbes) {
          await api(follower, manager, "PUT", `/api/benches/${probe.benchId}/windows`, {
            windows: [{ quantity: "air.temperature", min: 21, max: 29, delayS: 0, hysteresis: 0.5 }],
            dewPointMarginC: null,
          });
        }
        const coldReading = async (probe: { id: string; secret: string }) => {
          const client = await mqtt.connectAsync(broker!.url, { username: probe.id, password: probe.secret, clientId: `cold-${probe.id}-${Date.now()}` });
          await client.publishAsync(`benchwarden/v1/sensors/${probe.id}/readings`, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 12.5, t: Date.now() / 1000 }]), { qos: 1 });
          await client.endAsync();
        };
        const raisedFor = async (benchId: number) =>
          ((await db.query(`SELECT id FROM alert WHERE bench_id = $1 AND kind = 'window' AND phase = 'raised'`, [benchId])).rows as { id: number }[])[0]?.id ?? null;

        // 1. An alert before the kill, raised by the first leader and mailed.
        await coldReading(alertProbes[0]!);
        const firstAlert = await until("first alert raised", () => raisedFor(alertProbes[0]!.benchId), 20_000);
        const firstMails = await until("first alert mailed", async () => mails.length > 0 && [...mails], 20_000);

        // 2. A stream of numbered readings, split between the instances by the shared subscription.
        const publisher = spawn(process.execPath, [TSX, "--tsconfig", "tsconfig.server.json", "tests/support/numbered-publisher.ts", broker.url, join(dir, "demo-sensors.json"), String(TOTAL), "2000"], {
          cwd: PROJECT_ROOT,
          stdio: ["ignore", "pipe", "inherit"],
        });
        children.push(publisher);
        const done = new Promise<number>((resolve, reject) => {
          createInterface({ input: publisher.stdout! }).on("line", (line) => {
            const [word, n] = line.split(" ") as [string, string];
            if (word === "done") resolve(Number(n));
            if (word === "timeout") reject(new Error(`publisher timed out at ${n}`));
          });
        });
        const numbered = credentials.slice(0, 4).map((c) => c.id);
        const stored = async () =>
          (await db.query(`SELECT COUNT(*)::int AS n, COUNT(DISTINCT (sensor_id, time_ms))::int AS uniq FROM reading WHERE quantity = 'air.temperature' AND sensor_id = ANY($1)`, [numbered])).rows[0] as { n: number; uniq: number };

        // 3. Kill the leader mid-stream; the follower takes the engine over within the lease's time.
        await until("a third of the stream stored", async () => (await stored()).n >= TOTAL / 3, 60_000);
        // The shared subscription gives each instance its part of the stream.
        for (const instance of [a, b]) expect(await metric(instance, "benchwarden_readings_stored_total")).toBeGreaterThan(100);
        const killedAtMs = Date.now();
        leader.child.kill("SIGKILL");
        await until("the follower runs the engine", async () => (await metric(follower, "benchwarden_alert_engine_running")) === 1, 4 * LEASE_TTL_MS);
        const takeoverMs = Date.now() - killedAtMs;
        console.log(`two instances: the engine moved ${takeoverMs} ms after the SIGKILL (lease ${LEASE_TTL_MS} ms)`);
        expect(takeoverMs).toBeLessThanOrEqual(LEASE_TTL_MS + LEASE_TTL_MS / 5 + 1500);

        // 4. An alert after the kill, raised and mailed by the new leader.
        await coldReading(alertProbes[1]!);
        await until("second alert raised", () => raisedFor(alertProbes[1]!.benchId), 20_000);
        await until("second alert mailed", async () => mails.length > firstMails.length, 20_000);

        // 5. The new leader drained the killed instance's broker session (the broker kept dealing
        // that session a share of the readings): every reading is stored exactly once, without
        // waiting for the killed instance to come back.
        expect(await done).toBe(TOTAL);
        const final = await until(
          "every reading stored",
          async () => {
            const s = await stored();
            return s.n >= TOTAL && s;
          },
          60_000,
        );
        expect(final).toEqual({ n: TOTAL, uniq: TOTAL });
        console.log(`two instances: all ${TOTAL} readings stored once, ${Date.now() - killedAtMs} ms after the SIGKILL`);

        // The killed instance comes back (as its supervisor would restart it), takes its share of
        // new readings again, and does not take the engine back.
        const restarted = await startInstance(leader.name, leader.httpPort, instanceEnv(leader.name, leader.httpPort, databaseUrl, relayUrl));
        const probe = credentials[0]!;
        const client = await mqtt.connectAsync(broker.url, { username: probe.id, password: probe.secret, clientId: `after-${probe.id}` });
        for (let i = 0; i < 20; i++) {
          await client.publishAsync(`benchwarden/v1/sensors/${probe.id}/readings`, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 22, t: Date.now() / 1000 + i / 1000 }]), { qos: 1 });
        }
        await client.endAsync();
        await until("the restarted instance stores its share", async () => ((await metric(restarted, "benchwarden_readings_stored_total")) ?? 0) > 0, 15_000);
        expect(await metric(restarted, "benchwarden_alert_engine_running")).toBe(0);

        // 6. No mail twice: the first alert's mail went out once, before the kill, and the new
        // leader did not send it again; the second went out once.
        await new Promise((r) => setTimeout(r, 3000));
        const ids = mails.map((m) => m.messageId);
        expect(new Set(ids).size).toBe(ids.length);
        expect(mails.filter((m) => firstMails.some((f) => f.messageId === m.messageId))).toHaveLength(firstMails.length);
        const unsent = ((await db.query(`SELECT COUNT(*)::int AS n FROM outbox WHERE sent_at_ms IS NULL`)).rows[0] as { n: number }).n;
        expect(unsent).toBe(0);
        const outboxRows = ((await db.query(`SELECT COUNT(*)::int AS n FROM outbox`)).rows[0] as { n: number }).n;
        expect(mails).toHaveLength(outboxRows);
        expect(firstAlert).toBeGreaterThan(0);

        restarted.child.kill("SIGTERM");
        follower.child.kill("SIGTERM");
        await Promise.all([restarted.child, follower.child].map((c) => new Promise((r) => (c.exitCode !== null ? r(null) : c.once("exit", r)))));
      } finally {
        await db.end();
      }
    },
    300_000,
  );
});
