import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { chownSync, existsSync, mkdtempSync, readdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import pg from "pg";
import { freePort } from "./mosquitto.js";

// A last resort when a test file dies before its afterAll: no database server outlives the test process.
const running = new Set<ChildProcess>();
process.once("exit", () => {
  for (const child of running) child.kill("SIGKILL");
});

/** Debian installs the server binaries per major version, outside PATH. The newest wins. */
function findBinaries(): { initdb: string; postgres: string } | null {
  const root = "/usr/lib/postgresql";
  const versions = existsSync(root) ? readdirSync(root).filter((v) => /^\d+$/.test(v)).sort((a, b) => Number(b) - Number(a)) : [];
  for (const version of versions) {
    const bin = join(root, version, "bin");
    if (existsSync(join(bin, "initdb")) && existsSync(join(bin, "postgres"))) return { initdb: join(bin, "initdb"), postgres: join(bin, "postgres") };
  }
  return null;
}

/** Fails (never skips) when the package is missing: the suite needs the real database server. */
export function requirePostgres(): { initdb: string; postgres: string } {
  const binaries = findBinaries();
  if (!binaries) {
    throw new Error(
      "PostgreSQL server binaries not found under /usr/lib/postgresql/<version>/bin: these tests need Debian's postgresql package. " +
        "Install it with: sudo apt-get install -y postgresql (or run: bash scripts/ensure-system-packages.sh)",
    );
  }
  return binaries;
}

/** PostgreSQL refuses to run as root: as root, initdb and postgres run as the postgres user. */
function runAs(): { uid: number; gid: number } | undefined {
  if (process.getuid?.() !== 0) return undefined;
  const uid = spawnSync("id", ["-u", "postgres"], { encoding: "utf8" });
  const gid = spawnSync("id", ["-g", "postgres"], { encoding: "utf8" });
  if (uid.status !== 0 || gid.status !== 0) throw new Error("running as root, but there is no postgres user to run PostgreSQL as (Debian's postgresql package creates it)");
  return { uid: Number(uid.stdout.trim()), gid: Number(gid.stdout.trim()) };
}

export interface Postgres {
  port: number;
  /** A new empty database on this server; returns its postgres:// URL. */
  createDatabase(name?: string): Promise<string>;
  /** What the server wrote to stderr. */
  log(): string;
  /** Stop it (fast shutdown) and delete its folder (afterAll). */
  cleanup(): Promise<void>;
}

let databaseCounter = 0;

/**
 * A throwaway PostgreSQL: initdb into a temporary folder, then postgres on a free loopback port,
 * socket in the same folder, trust authentication for the local superuser `benchwarden`. fsync is
 * off: the folder is deleted afterwards and a test never survives an OS crash anyway.
 */
export async function startPostgres(): Promise<Postgres> {
  const { initdb, postgres } = requirePostgres();
  const owner = runAs();
  const dir = mkdtempSync(join(tmpdir(), "benchwarden-postgres-"));
  if (owner) chownSync(dir, owner.uid, owner.gid);
  const dataDir = join(dir, "data");
  const init = spawnSync(initdb, ["-D", dataDir, "-U", "benchwarden", "-A", "trust", "-E", "UTF8", "--no-sync", "--locale=C"], {
    encoding: "utf8",
    timeout: 120_000,
    ...owner,
  });
  if (init.status !== 0) throw new Error(`initdb failed (${init.status}):\n${init.stdout}\n${init.stderr}`);

  const port = await freePort();
  const args = ["-D", dataDir, "-p", String(port), "-k", dir, "-c", "listen_addresses=127.0.0.1", "-c", "fsync=off", "-c", "synchronous_commit=off", "-c", "full_page_writes=off", "-c", "max_connections=200"];
  const child = spawn(postgres, args, { stdio: ["ignore", "ignore", "pipe"], ...owner });
  running.add(child);
  child.once("exit", () => running.delete(child));
  let stderr = "";
  child.stderr!.on("data", (chunk: Buffer) => (stderr += chunk.toString()));

  const adminUrl = `postgres://benchwarden@127.0.0.1:${port}/postgres`;
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`postgres exited with ${child.exitCode}:\n${stderr}`);
    const client = new pg.Client({ connectionString: adminUrl });
    try {
      await client.connect();
      await client.query("SELECT 1");
      await client.end();
      break;
    } catch (err) {
      await client.end().catch(() => undefined);
      if (Date.now() > deadline) throw new Error(`postgres did not accept connections on ${port} within 30 s: ${String(err)}\n${stderr}`, { cause: err });
      await new Promise((r) => setTimeout(r, 100));
    }
  }

  return {
    port,
    async createDatabase(name = `benchwarden_${process.pid}_${++databaseCounter}`) {
      const client = new pg.Client({ connectionString: adminUrl });
      await client.connect();
      try {
        await client.query(`CREATE DATABASE "${name}"`);
      } finally {
        await client.end();
      }
      return `postgres://benchwarden@127.0.0.1:${port}/${name}`;
    },
    log: () => stderr,
    async cleanup() {
      if (child.exitCode === null && child.signalCode === null) {
        const exited = new Promise((r) => child.once("exit", r));
        child.kill("SIGINT"); // fast shutdown: roll back open transactions, then exit
        const timer = setTimeout(() => child.kill("SIGKILL"), 10_000);
        await exited;
        clearTimeout(timer);
      }
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
