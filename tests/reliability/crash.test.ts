import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createInterface } from "node:readline";
import Database from "better-sqlite3";
import { afterAll, describe, expect, it } from "vitest";
import { PROJECT_ROOT } from "../../server/index.js";

const TSX = join(PROJECT_ROOT, "node_modules/tsx/dist/cli.mjs");
const TOTAL = 20_000;

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const srv = createServer().listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as { port: number };
      srv.close(() => resolve(port));
    });
  });
}

const dir = mkdtempSync(join(tmpdir(), "benchwarden-crash-"));
const children: ChildProcess[] = [];
afterAll(() => {
  for (const c of children) if (c.exitCode === null) c.kill("SIGKILL");
  rmSync(dir, { recursive: true, force: true });
});

function startServer(httpPort: number, mqttPort: number): Promise<ChildProcess> {
  // tsx loaded in-process (not its CLI, which runs the server in a child): SIGKILL must hit the server itself.
  const child = spawn(process.execPath, ["--import", "tsx", "server/main.ts"], {
    cwd: PROJECT_ROOT,
    env: { ...process.env, TSX_TSCONFIG_PATH: "tsconfig.server.json", PORT: String(httpPort), HOST: "127.0.0.1", MQTT_PORT: String(mqttPort), MQTT_HOST: "127.0.0.1", DATABASE_PATH: join(dir, "db.sqlite"), DEMO: "1", SIM: "0", LOG_LEVEL: "warn" },
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

describe("a crash loses no acknowledged reading", () => {
  it(
    "20,000 numbered QoS 1 readings, the server SIGKILLed twice mid-stream and restarted: every one stored exactly once",
    async () => {
      const [httpPort, mqttPort] = [await freePort(), await freePort()];
      let server = await startServer(httpPort, mqttPort);
      const publisher = spawn(
        process.execPath,
        [TSX, "--tsconfig", "tsconfig.server.json", "tests/support/numbered-publisher.ts", `mqtt://127.0.0.1:${mqttPort}`, join(dir, "demo-sensors.json"), String(TOTAL), "2500"],
        { cwd: PROJECT_ROOT, stdio: ["ignore", "pipe", "inherit"] },
      );
      children.push(publisher);

      const t0 = Date.now();
      const kills = [5000, 12_000];
      let restarts = 0;
      let finalAcked = -1;
      const lines = createInterface({ input: publisher.stdout! });
      const finished = new Promise<void>((resolve, reject) => {
        lines.on("line", (line) => {
          const [word, n] = line.split(" ") as [string, string];
          const count = Number(n);
          if (process.env.CRASH_TEST_VERBOSE) console.log(`${Date.now() - t0} ms: ${line}`);
          if (word === "acked" && kills.length > 0 && count >= kills[0]!) {
            kills.shift();
            server.kill("SIGKILL");
            server.once("exit", () => {
              void startServer(httpPort, mqttPort).then((s) => {
                server = s;
                restarts++;
              }, reject);
            });
          }
          if (word === "done") {
            finalAcked = count;
            resolve();
          }
          if (word === "timeout") reject(new Error(`publisher timed out at ${count} acknowledged`));
        });
      });
      await finished;
      expect(restarts).toBe(2);
      expect(finalAcked).toBe(TOTAL);

      server.kill("SIGTERM");
      await new Promise((r) => server.once("exit", r));
      const db = new Database(join(dir, "db.sqlite"), { readonly: true });
      const { n, uniq } = db
        .prepare("SELECT COUNT(*) AS n, COUNT(DISTINCT sensor_id || ':' || time_ms) AS uniq FROM reading WHERE quantity = 'air.temperature'")
        .get() as { n: number; uniq: number };
      db.close();
      expect(n).toBe(TOTAL);
      expect(uniq).toBe(TOTAL);
    },
    180_000,
  );
});
