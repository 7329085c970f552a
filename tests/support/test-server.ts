import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import mqtt, { type MqttClient } from "mqtt";
import { parseEnv } from "../../server/config/env.js";
import type { DemoSensorCredential } from "../../server/demo/seed.js";
import { start, type RunningServer } from "../../server/index.js";
import type { Logger } from "../../server/lib/logger.js";

export interface TestServer extends RunningServer {
  baseUrl: string;
  credentials: DemoSensorCredential[];
  dir: string;
  cleanup(): Promise<void>;
}

/**
 * The real server on free loopback ports over a new SQLite file, seeded with the demo nursery,
 * simulator off so the test decides every reading.
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
      ...env,
    }),
    { staticDir: options.staticDir ?? join(dir, "no-client"), logger: options.logger },
  );
  const credentials = JSON.parse(readFileSync(server.demoCredentialsPath!, "utf8")) as DemoSensorCredential[];
  return {
    ...server,
    baseUrl: `http://127.0.0.1:${server.httpPort}`,
    credentials,
    dir,
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
