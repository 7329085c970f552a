import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createInterface } from "node:readline";
import Database from "better-sqlite3";
import { afterAll, describe, expect, it } from "vitest";
import { PROJECT_ROOT } from "../../server/index.js";
import { freePort, runExport, startMosquitto, type Mosquitto } from "../support/mosquitto.js";

// tests/reliability/crash.test.ts with the server behind a real mosquitto (MQTT_URL): the probes'
// PUBACKs come from mosquitto, the server's PUBACKs to mosquitto wait for the commit, so what a
// SIGKILL interrupts is still at mosquitto, which sends it again when the server's session returns.

const TSX = join(PROJECT_ROOT, "node_modules/tsx/dist/cli.mjs");
const TOTAL = 20_000;
const SERVER_USER = "benchwarden";
const SERVER_PASSWORD = randomBytes(18).toString("base64url");

const dir = mkdtempSync(join(tmpdir(), "benchwarden-crash-external-"));
const children: ChildProcess[] = [];
let broker: Mosquitto | undefined;
afterAll(async () => {
  for (const c of children) if (c.exitCode === null && c.signalCode === null) c.kill("SIGKILL");
  await broker?.cleanup();
  rmSync(dir, { recursive: true, force: true });
});

function serverEnv(httpPort: number): Record<string, string> {
  return {
    TSX_TSCONFIG_PATH: "tsconfig.server.json",
    PORT: String(httpPort),
    HOST: "127.0.0.1",
    DATABASE_PATH: join(dir, "db.sqlite"),
    DEMO: "1",
    SIM: "0",
    LOG_LEVEL: "warn",
    MQTT_URL: broker!.url,
    MQTT_USERNAME: SERVER_USER,
    MQTT_PASSWORD: SERVER_PASSWORD,
    // The same id after each restart: mosquitto keeps this session's unacknowledged and queued messages.
    MQTT_CLIENT_ID: "benchwarden-crash-test",
  };
}

function startServer(httpPort: number): Promise<ChildProcess> {
  // tsx loaded in-process (not its CLI, which runs the server in a child): SIGKILL must hit the server itself.
  const child = spawn(process.execPath, ["--import", "tsx", "server/main.ts"], {
    cwd: PROJECT_ROOT,
    env: { ...process.env, ...serverEnv(httpPort) },
    stdio: ["ignore", "pipe", "pipe"],
  });
  children.push(child);
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("server did not start in 30 s")), 30_000);
    child.stdout!.on("data", (chunk: Buffer) => {
      if (chunk.toString().includes("Benchwarden is running")) {
        clearTimeout(timer);
        resolve(child);
      }
    });
    let stderr = "";
    child.stderr!.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
    child.once("exit", (code) => reject(new Error(`server exited early with ${code}: ${stderr.slice(-2000)}`)));
  });
}

function storedCounts(): { n: number; uniq: number } {
  const db = new Database(join(dir, "db.sqlite"), { readonly: true });
  try {
    return db
      .prepare("SELECT COUNT(*) AS n, COUNT(DISTINCT sensor_id || ':' || time_ms) AS uniq FROM reading WHERE quantity = 'air.temperature'")
      .get() as { n: number; uniq: number };
  } finally {
    db.close();
  }
}

describe("behind mosquitto, a crash loses no reading", () => {
  it(
    "20,000 numbered QoS 1 readings through mosquitto, the server SIGKILLed twice mid-stream and restarted: every one stored exactly once",
    async () => {
      broker = await startMosquitto({ serverUser: SERVER_USER, serverPassword: SERVER_PASSWORD });
      const httpPort = await freePort();
      let server = await startServer(httpPort);
      // The demo seeded its probes; give mosquitto their credentials and ACL.
      const exported = runExport({ ...serverEnv(httpPort), LOG_LEVEL: "silent" }, ["--out-dir", broker.dir, "--secrets", join(dir, "demo-sensors.json")]);
      expect(exported.status, exported.stderr).toBe(0);
      await broker.reload();

      const publisher = spawn(
        process.execPath,
        [TSX, "--tsconfig", "tsconfig.server.json", "tests/support/numbered-publisher.ts", broker.url, join(dir, "demo-sensors.json"), String(TOTAL), "2500"],
        { cwd: PROJECT_ROOT, stdio: ["ignore", "pipe", "inherit"] },
      );
      children.push(publisher);

      const t0 = Date.now();
      // The probes' acknowledgements come from mosquitto and do not wait for the server, so the
      // kills follow what the server has stored: each lands while it is taking readings.
      const kills = [4000, 11_000];
      let restarts = 0;
      let restarting = false;
      let failure: unknown = null;
      const killer = setInterval(() => {
        if (restarting || kills.length === 0 || storedCounts().n < kills[0]!) return;
        kills.shift();
        restarting = true;
        if (process.env.CRASH_TEST_VERBOSE) console.log(`${Date.now() - t0} ms: SIGKILL at ${storedCounts().n} stored`);
        server.once("exit", () => {
          void startServer(httpPort).then(
            (s) => {
              server = s;
              restarts++;
              restarting = false;
            },
            (err: unknown) => (failure = err),
          );
        });
        server.kill("SIGKILL");
      }, 50);

      let finalAcked = -1;
      const lines = createInterface({ input: publisher.stdout! });
      const finished = new Promise<void>((resolve, reject) => {
        lines.on("line", (line) => {
          const [word, n] = line.split(" ") as [string, string];
          const count = Number(n);
          if (process.env.CRASH_TEST_VERBOSE) console.log(`${Date.now() - t0} ms: ${line}; stored ${storedCounts().n}`);
          if (word === "done") {
            finalAcked = count;
            resolve();
          }
          if (word === "timeout") reject(new Error(`publisher timed out at ${count} acknowledged`));
        });
      });
      await finished;
      expect(finalAcked).toBe(TOTAL);
      // mosquitto holds what the server has not taken yet; wait for both kills and the drain.
      const deadline = Date.now() + 120_000;
      while (failure === null && (restarts < 2 || storedCounts().n < TOTAL) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 250));
      clearInterval(killer);
      if (failure) throw failure;
      expect(restarts).toBe(2);
      const duplicates = await fetch(`http://127.0.0.1:${httpPort}/metrics`)
        .then((r) => r.text())
        .then((t) => /^benchwarden_readings_duplicate_total (\d+)/m.exec(t)?.[1]);
      if (process.env.CRASH_TEST_VERBOSE) console.log(`re-sent after the last restart and skipped as duplicates: ${duplicates}`);

      server.kill("SIGTERM");
      await new Promise((r) => server.once("exit", r));
      const { n, uniq } = storedCounts();
      expect(n).toBe(TOTAL);
      expect(uniq).toBe(TOTAL);
    },
    240_000,
  );
});
