import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { connect, createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { PROJECT_ROOT } from "../../server/index.js";
import { mosquittoPasswordFile } from "../../server/mqtt/mosquitto-files.js";

export const MOSQUITTO_BINARY = "/usr/sbin/mosquitto";
const TSX = join(PROJECT_ROOT, "node_modules/tsx/dist/cli.mjs");

// A last resort when a test file dies before its afterAll: no broker outlives the test process.
const running = new Set<ChildProcess>();
process.once("exit", () => {
  for (const child of running) child.kill("SIGKILL");
});

/** A throwaway Debian mosquitto on a free loopback port, with its files in a temporary folder. */
export interface Mosquitto {
  port: number;
  /** mqtt://127.0.0.1:<port>, no credentials. */
  url: string;
  dir: string;
  passwordFile: string;
  aclFile: string;
  /** What it wrote to stderr (notices, warnings, errors). */
  log(): string;
  /** SIGHUP: mosquitto re-reads its password and ACL files. */
  reload(): Promise<void>;
  /** Stop it (SIGTERM; it saves its persistence file) and wait for the exit. */
  stop(): Promise<void>;
  /** Start it again on the same port, configuration and persistence. */
  restart(): Promise<void>;
  /** Stop it and delete its folder (afterAll). */
  cleanup(): Promise<void>;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const srv = createServer().listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as { port: number };
      srv.close(() => resolve(port));
    });
  });
}

/** Fails (never skips) when the package is missing: the suite needs the real broker. */
export function requireMosquitto(): void {
  if (!existsSync(MOSQUITTO_BINARY)) {
    throw new Error(`${MOSQUITTO_BINARY} not found: these tests need Debian's mosquitto package. Install it with: sudo apt-get install -y mosquitto (or run: bash scripts/ensure-system-packages.sh)`);
  }
}

async function waitForPort(port: number, timeoutMs: number, child: ChildProcess, log: () => string): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`mosquitto exited with ${child.exitCode}:\n${log()}`);
    const open = await new Promise<boolean>((resolve) => {
      const socket = connect(port, "127.0.0.1");
      socket.once("connect", () => {
        socket.destroy();
        resolve(true);
      });
      socket.once("error", () => resolve(false));
    });
    if (open) return;
    if (Date.now() > deadline) throw new Error(`mosquitto did not listen on ${port} within ${timeoutMs} ms:\n${log()}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/**
 * Starts mosquitto with a generated configuration: one listener on 127.0.0.1, no anonymous
 * clients, the given password and ACL files (by default only the server's user, who may read the
 * sensor topics), persistence in the folder, and an unbounded queue per client (the server's
 * session must hold every reading that arrives while it is down).
 */
export async function startMosquitto(options: { serverUser: string; serverPassword: string }): Promise<Mosquitto> {
  requireMosquitto();
  const dir = mkdtempSync(join(tmpdir(), "benchwarden-mosquitto-"));
  const port = await freePort();
  const passwordFile = join(dir, "passwd");
  const aclFile = join(dir, "acl");
  mkdirSync(join(dir, "data"));
  writeFileSync(passwordFile, mosquittoPasswordFile([{ username: options.serverUser, password: options.serverPassword }]));
  writeFileSync(aclFile, `user ${options.serverUser}\ntopic read benchwarden/v1/sensors/+/readings\ntopic read benchwarden/v1/sensors/+/status\n`);
  const conf = join(dir, "mosquitto.conf");
  writeFileSync(
    conf,
    [
      `listener ${port} 127.0.0.1`,
      "allow_anonymous false",
      `password_file ${passwordFile}`,
      `acl_file ${aclFile}`,
      "persistence true",
      `persistence_location ${join(dir, "data")}/`,
      "max_queued_messages 0",
      "max_packet_size 65536",
      "log_dest stderr",
      "log_type error",
      "log_type warning",
      "log_type notice",
      // Started as root, mosquitto would switch to the mosquitto user, who cannot read a 0700 temp folder.
      ...(process.getuid?.() === 0 ? ["user root"] : []),
      "",
    ].join("\n"),
  );

  let child: ChildProcess;
  let stderr = "";
  const log = () => stderr;
  const launch = async () => {
    child = spawn(MOSQUITTO_BINARY, ["-c", conf], { stdio: ["ignore", "ignore", "pipe"] });
    const started = child;
    running.add(started);
    started.once("exit", () => running.delete(started));
    child.stderr!.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
    await waitForPort(port, 10_000, child, log);
  };
  const stop = async () => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    const exited = new Promise((r) => child.once("exit", r));
    child.kill("SIGTERM");
    const timer = setTimeout(() => child.kill("SIGKILL"), 5000);
    await exited;
    clearTimeout(timer);
  };
  await launch();
  return {
    port,
    url: `mqtt://127.0.0.1:${port}`,
    dir,
    passwordFile,
    aclFile,
    log,
    reload: async () => {
      const before = stderr.length;
      child.kill("SIGHUP");
      // mosquitto logs "Reloading config." when it has handled the signal.
      const deadline = Date.now() + 5000;
      while (!stderr.slice(before).includes("Reloading config") && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
    },
    stop,
    restart: async () => {
      await stop();
      await launch();
    },
    cleanup: async () => {
      await stop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/**
 * Runs the real `npm run sensors:export-mosquitto` (through tsx) against a database, writing the
 * broker's password and ACL files into `outDir`. Returns its exit status and output.
 */
export function runExport(env: Record<string, string>, args: string[]): { status: number | null; stdout: string; stderr: string } {
  const result = spawnSync(process.execPath, [TSX, "--tsconfig", "tsconfig.server.json", "server/cli/export-mosquitto.ts", ...args], {
    cwd: PROJECT_ROOT,
    env: { ...process.env, ...env },
    encoding: "utf8",
    timeout: 60_000,
  });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}
