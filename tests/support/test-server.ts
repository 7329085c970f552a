import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import mqtt, { type MqttClient } from "mqtt";
import { afterAll } from "vitest";
import { parseEnv } from "../../server/config/env.js";
import { isPostgres } from "../../server/db/data-source.js";
import type { DemoSensorCredential } from "../../server/demo/seed.js";
import { start, type RunningServer } from "../../server/index.js";
import type { Logger } from "../../server/lib/logger.js";
import { startPostgres, type Postgres } from "./postgres.js";

export interface TestServer extends RunningServer {
  baseUrl: string;
  credentials: DemoSensorCredential[];
  dir: string;
  /** The PostgreSQL database the server runs on (BENCHWARDEN_TEST_DATABASE=postgres), else null. */
  databaseUrl: string | null;
  cleanup(): Promise<void>;
}

/** BENCHWARDEN_TEST_DATABASE=postgres (the postgres-api vitest project) runs every test server on PostgreSQL. */
export const testsOnPostgres = process.env.BENCHWARDEN_TEST_DATABASE === "postgres";

// One throwaway PostgreSQL per test file (vitest isolates modules per file), started on first use.
let postgres: Promise<Postgres> | null = null;
// A restart passes the same dir and must find the same data: dir → its database.
const databaseOfDir = new Map<string, string>();
if (testsOnPostgres) {
  // Registered while the test file is collected; with vitest's stacked hooks it runs after the
  // file's own afterAll hooks have stopped their servers.
  afterAll(async () => {
    const running = postgres;
    postgres = null;
    databaseOfDir.clear();
    if (running) await (await running).cleanup();
  });
}

async function databaseUrlFor(dir: string): Promise<string> {
  const known = databaseOfDir.get(dir);
  if (known) return known;
  postgres ??= startPostgres();
  const url = await (await postgres).createDatabase();
  databaseOfDir.set(dir, url);
  return url;
}

/**
 * The real server on free loopback ports over a new SQLite file (or a new PostgreSQL database, see
 * testsOnPostgres), seeded with the demo nursery, simulator off so the test decides every reading.
 * DATABASE_PATH stays in the temporary folder either way: demo credentials and photos go beside it.
 */
export async function startTestServer(
  env: Record<string, string> = {},
  options: {
    staticDir?: string;
    /** Reuse a database folder (a restart); it is then not deleted. */
    dir?: string;
    logger?: Logger;
  } = {},
): Promise<TestServer> {
  const dir = options.dir ?? mkdtempSync(join(tmpdir(), "benchwarden-test-"));
  const databaseUrl = testsOnPostgres && !("DATABASE_URL" in env) ? await databaseUrlFor(dir) : null;
  const server = await start(
    parseEnv({
      PORT: "0",
      HOST: "127.0.0.1",
      MQTT_PORT: "0",
      MQTT_HOST: "127.0.0.1",
      DATABASE_PATH: join(dir, "benchwarden.sqlite"),
      DEMO: "1",
      SIM: "0",
      LOG_LEVEL: "silent",
      DEMO_PASSWORD: TEST_DEMO_PASSWORD,
      ...(databaseUrl ? { DATABASE_URL: databaseUrl } : {}),
      ...env,
    }),
    { staticDir: options.staticDir ?? join(dir, "no-client"), logger: options.logger },
  );
  // The project's whole point: never pass on SQLite by accident.
  if (databaseUrl && !isPostgres(server.dataSource)) throw new Error("BENCHWARDEN_TEST_DATABASE=postgres, but the server opened SQLite");
  const credentials = JSON.parse(readFileSync(server.demoCredentialsPath!, "utf8")) as DemoSensorCredential[];
  return {
    ...server,
    baseUrl: `http://127.0.0.1:${server.httpPort}`,
    credentials,
    dir,
    databaseUrl: databaseUrl ?? env.DATABASE_URL ?? null,
    cleanup: async () => {
      await server.stop();
      if (!options.dir) rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** A real mqtt.js client signed in as a sensor. */
export async function connectSensor(server: RunningServer, credential: { id: string; secret: string }): Promise<MqttClient> {
  return mqtt.connectAsync(`mqtt://127.0.0.1:${server.mqttPort}`, {
    username: credential.id,
    password: credential.secret,
    clientId: `test-${credential.id}-${Math.random().toString(16).slice(2, 8)}`,
    reconnectPeriod: 0,
    connectTimeout: 5000,
  });
}

/** Poll until check() returns a value (not undefined), or fail after timeoutMs. */
export async function waitFor<T>(check: () => Promise<T | undefined>, timeoutMs = 5000, stepMs = 50): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value !== undefined) return value;
    if (Date.now() > deadline) throw new Error(`condition not met within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, stepMs));
  }
}

export const TEST_DEMO_PASSWORD = "bench-demo-2026";

/** Signs in as the demo user of a role and returns the session token (for a Bearer header). */
export async function signIn(server: { baseUrl: string }, role: "admin" | "manager" | "grower" | "viewer"): Promise<string> {
  const res = await fetch(`${server.baseUrl}/api/session`, {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify({ email: `${role}@nursery.test`, password: TEST_DEMO_PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${role} failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers.getSetCookie().find((c) => c.startsWith("bw_session="));
  if (!cookie) throw new Error("no session cookie");
  return cookie.slice("bw_session=".length).split(";")[0]!;
}
