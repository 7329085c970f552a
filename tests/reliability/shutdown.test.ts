import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createInterface } from "node:readline";
import Database from "better-sqlite3";
import { SMTPServer, type SMTPServerSession } from "smtp-server";
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { caughtMailResponseSchema } from "../../shared/schemas/mail.js";
import { rawDatabase } from "../../server/db/data-source.js";
import { PROJECT_ROOT } from "../../server/index.js";
import { ReadingWriter } from "../../server/modules/readings/reading-writer.js";
import { createReadingStore } from "../../server/modules/readings/reading-store.js";
import { signIn, startTestServer, waitFor } from "../support/test-server.js";

const TSX = join(PROJECT_ROOT, "node_modules/tsx/dist/cli.mjs");
const dir = mkdtempSync(join(tmpdir(), "benchwarden-shutdown-"));
const children: ChildProcess[] = [];
const relays: SMTPServer[] = [];
afterAll(() => {
  for (const c of children) if (c.exitCode === null && c.signalCode === null) c.kill("SIGKILL");
  for (const r of relays) r.close(() => undefined);
  rmSync(dir, { recursive: true, force: true });
});

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const srv = createServer().listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as { port: number };
      srv.close(() => resolve(port));
    });
  });
}

/** Rejects when `promise` has not settled within `ms` (every wait in these tests is bounded). */
function within<T>(promise: Promise<T>, ms: number, what: string): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`${what}: not within ${ms} ms`)), ms);
    promise.then(
      (v) => (clearTimeout(timer), resolve(v)),
      (e: unknown) => (clearTimeout(timer), reject(e instanceof Error ? e : new Error(String(e)))),
    );
  });
}

/** server/main.ts as a real child process, as in production; resolves once it says it is running. */
async function startServerProcess(dbDir: string, env: Record<string, string>): Promise<{ child: ChildProcess; baseUrl: string }> {
  const [httpPort, mqttPort] = [await freePort(), await freePort()];
  const child = spawn(process.execPath, ["--import", "tsx", "server/main.ts"], {
    cwd: PROJECT_ROOT,
    env: { ...process.env, TSX_TSCONFIG_PATH: "tsconfig.server.json", PORT: String(httpPort), HOST: "127.0.0.1", MQTT_PORT: String(mqttPort), MQTT_HOST: "127.0.0.1", DATABASE_PATH: join(dbDir, "db.sqlite"), DEMO: "1", SIM: "0", LOG_LEVEL: "warn", ...env },
    stdio: ["ignore", "pipe", "inherit"],
  });
  children.push(child);
  const running = new Promise<void>((resolve, reject) => {
    child.stdout!.on("data", (c: Buffer) => c.toString().includes("Benchwarden is running") && resolve());
    child.once("exit", (code) => reject(new Error(`the server exited with ${code} before it was running`)));
  });
  await within(running, 60_000, "server start");
  return { child, baseUrl: `http://127.0.0.1:${httpPort}` };
}

function exitOf(child: ChildProcess): Promise<number | null> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve(child.exitCode);
  return new Promise((resolve) => child.once("exit", (code) => resolve(code)));
}

/**
 * A mail relay on loopback that is slow to accept: it answers the end of DATA with 250 only
 * `holdMs` after the message arrived, and keeps a message only if the client was still connected
 * to hear that 250 (a client that went away before it never learnt the message was taken).
 */
async function startSlowRelay(holdMs: number) {
  const accepted: { messageId: string; to: string[]; atMs: number }[] = [];
  let transactions = 0;
  const closed = new Set<string>();
  let dataStarted!: () => void;
  const firstData = new Promise<void>((resolve) => (dataStarted = resolve));
  const server = new SMTPServer({
    // smtp-server's built-in certificate has expired (STACK.md): plain SMTP on loopback only.
    secure: false,
    disabledCommands: ["STARTTLS"],
    authOptional: true,
    logger: false,
    closeTimeout: 1000,
    onMailFrom(_address, _session, callback) {
      transactions++;
      callback();
    },
    onClose(session: SMTPServerSession) {
      closed.add(session.id);
    },
    onData(stream, session, callback) {
      dataStarted();
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        setTimeout(() => {
          if (closed.has(session.id)) return callback(new Error("client went away"));
          const raw = Buffer.concat(chunks).toString("utf8");
          accepted.push({ messageId: /^Message-ID:\s*(<[^>]+>)/im.exec(raw)?.[1] ?? "", to: session.envelope.rcptTo.map((r) => r.address), atMs: Date.now() });
          callback();
        }, holdMs);
      });
    },
  });
  relays.push(server);
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => resolve());
  });
  const { port } = server.server.address() as { port: number };
  return { url: `smtp://127.0.0.1:${port}`, accepted, transactions: () => transactions, firstData };
}

describe("graceful shutdown", () => {
  it("SIGTERM mid-stream: the server exits 0 promptly and every reading it acknowledged is stored", async () => {
    const [httpPort, mqttPort] = [await freePort(), await freePort()];
    const dbDir = join(dir, "term");
    const server = spawn(process.execPath, ["--import", "tsx", "server/main.ts"], {
      cwd: PROJECT_ROOT,
      env: { ...process.env, TSX_TSCONFIG_PATH: "tsconfig.server.json", PORT: String(httpPort), HOST: "127.0.0.1", MQTT_PORT: String(mqttPort), MQTT_HOST: "127.0.0.1", DATABASE_PATH: join(dbDir, "db.sqlite"), DEMO: "1", SIM: "0", LOG_LEVEL: "warn" },
      stdio: ["ignore", "pipe", "inherit"],
    });
    children.push(server);
    await new Promise<void>((resolve) => server.stdout!.on("data", (c: Buffer) => c.toString().includes("Benchwarden is running") && resolve()));

    const publisher = spawn(process.execPath, [TSX, "--tsconfig", "tsconfig.server.json", "tests/support/numbered-publisher.ts", `mqtt://127.0.0.1:${mqttPort}`, join(dbDir, "demo-sensors.json"), "20000", "3000"], {
      cwd: PROJECT_ROOT,
      stdio: ["ignore", "pipe", "inherit"],
    });
    children.push(publisher);
    const lines = createInterface({ input: publisher.stdout! });
    const stoppedAt = new Promise<number>((resolve) => lines.on("line", (l) => l.startsWith("stopped ") && resolve(Number(l.split(" ")[1]))));
    await new Promise<void>((resolve) => lines.on("line", (l) => l.startsWith("acked ") && Number(l.split(" ")[1]) >= 3000 && resolve()));

    const termAt = Date.now();
    server.kill("SIGTERM");
    const code = await new Promise<number | null>((resolve) => server.once("exit", (c) => resolve(c)));
    const exitMs = Date.now() - termAt;
    publisher.kill("SIGTERM");
    const acked = await stoppedAt;

    expect(code).toBe(0);
    expect(exitMs).toBeLessThan(10_000);
    const db = new Database(join(dbDir, "db.sqlite"), { readonly: true });
    const stored = (db.prepare("SELECT COUNT(*) AS n FROM reading WHERE quantity = 'air.temperature'").get() as { n: number }).n;
    db.close();
    expect(acked).toBeGreaterThanOrEqual(3000);
    expect(stored).toBeGreaterThanOrEqual(acked);
  }, 120_000);

  // The test above cannot see this: a reading still waiting for its batch has not been acknowledged,
  // so the sensor would send it again. stop() closes the reading writer, which must store it, not drop it.
  it("the reading writer, closed at stop, commits the batch still waiting, then refuses new readings", async () => {
    const server = await startTestServer({ ALERT_TICK: "1h" });
    try {
      // A writer that would otherwise wait a minute before committing: only close() can store these now.
      const writer = new ReadingWriter(createReadingStore(server.dataSource), () => undefined, server.metrics, server.logger, { maxWaitMs: 60_000 });
      const sensorId = server.credentials[0]!.id;
      const t0 = Date.now() - 60_000;
      const waiting = writer.enqueue([0, 1, 2].map((i) => ({ sensorId, benchId: null, quantity: "air.temperature" as const, timeMs: t0 + i, value: 21 })));
      await writer.close();
      const stored = rawDatabase(server.dataSource).prepare("SELECT COUNT(*) AS n FROM reading WHERE sensor_id = ? AND time_ms >= ?").get(sensorId, t0) as { n: number };
      expect(stored.n).toBe(3);
      await waiting;
      await expect(writer.enqueue([{ sensorId, benchId: null, quantity: "air.temperature", timeMs: t0 + 3, value: 21 }])).rejects.toThrow(/closed/);
    } finally {
      await server.cleanup();
    }
  });

  it("mail waiting in the outbox when the server stops is sent after the restart", async () => {
    const dbDir = mkdtempSync(join(dir, "outbox-"));
    const first = await startTestServer({ ALERT_TICK: "1h" }, { dir: dbDir });
    const admin = await signIn(first, "admin");
    await first.smtpSink!.close(); // the relay is down
    await request(first.baseUrl).post("/api/users").auth(admin, { type: "bearer" }).send({ name: "Ines Marlowe", email: "ines@nursery.test", role: "grower" }).expect(201);
    await first.alerts.outbox.sendDue();
    expect(first.metrics.mailFailed.get()).toBeGreaterThanOrEqual(1);
    await first.stop();

    const second = await startTestServer({ ALERT_TICK: "1h" }, { dir: dbDir });
    try {
      const token = await signIn(second, "admin");
      const mail = await waitFor(async () => {
        const res = await request(second.baseUrl).get("/api/mail").auth(token, { type: "bearer" }).expect(200);
        return caughtMailResponseSchema.parse(res.body).messages.find((m) => m.to.includes("ines@nursery.test"));
      }, 15_000);
      expect(mail.subject).toBe("You are invited to Benchwarden");
    } finally {
      await second.stop();
    }
  }, 60_000);

  it("SIGTERM during an SMTP conversation: the send finishes and is marked sent before the exit, and is not sent again after a restart", async () => {
    const holdMs = 2500;
    const relay = await startSlowRelay(holdMs);
    const dbDir = mkdtempSync(join(dir, "outbox-term-"));
    // SMTP_URL: the server talks to this relay, not to its own sink. The first retry comes 1 s after a failure.
    const env = { SMTP_URL: relay.url, MAIL_RETRY_FIRST: "1s", ALERT_TICK: "1h" };
    const first = await startServerProcess(dbDir, env);

    // A password reset goes through the outbox like every e-mail, and the worker starts sending it at once.
    const res = await fetch(`${first.baseUrl}/api/password-resets`, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify({ email: "grower@nursery.test" }) });
    expect(res.status).toBe(202);
    await within(relay.firstData, 15_000, "the relay receiving DATA");
    expect(relay.accepted).toHaveLength(0); // the relay has not answered yet: the send is in progress

    first.child.kill("SIGTERM");
    const code = await within(exitOf(first.child), 20_000, "exit after SIGTERM");
    const exitedAtMs = Date.now();

    expect(code).toBe(0);
    expect(relay.accepted).toHaveLength(1);
    expect(relay.accepted[0]!.atMs).toBeLessThanOrEqual(exitedAtMs);
    expect(relay.accepted[0]!.to).toEqual(["grower@nursery.test"]);
    expect(relay.transactions()).toBe(1);
    const readOutbox = () => {
      const db = new Database(join(dbDir, "db.sqlite"), { readonly: true });
      try {
        return db.prepare("SELECT message_id AS messageId, to_address AS toAddress, attempts, sent_at_ms AS sentAtMs, last_error AS lastError FROM outbox").all() as {
          messageId: string;
          toAddress: string;
          attempts: number;
          sentAtMs: number | null;
          lastError: string | null;
        }[];
      } finally {
        db.close();
      }
    };
    const rows = readOutbox();
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ messageId: relay.accepted[0]!.messageId, toAddress: "grower@nursery.test", attempts: 1, lastError: null });
    expect(rows[0]!.sentAtMs).not.toBeNull();

    // Restart on the same database: the outbox sends at start and polls every 5 s; a row it took for
    // unsent would reach the relay well within 7 s (past the 1 s first retry and one poll).
    const second = await startServerProcess(dbDir, env);
    await new Promise((r) => setTimeout(r, 7000));
    second.child.kill("SIGTERM");
    expect(await within(exitOf(second.child), 20_000, "exit of the restarted server")).toBe(0);
    expect(relay.transactions()).toBe(1);
    expect(relay.accepted).toHaveLength(1);
    expect(readOutbox()).toEqual(rows);
  }, 120_000);
});
