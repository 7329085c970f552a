import { chmodSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { Command } from "commander";
import type { DataSource } from "typeorm";
import { ConfigError, loadDotEnv, parseEnv } from "../config/env.js";
import { createDataSource, databaseTarget } from "../db/data-source.js";
import { BenchEntity } from "../db/entities/bench.entity.js";
import { SensorEntity } from "../db/entities/sensor.entity.js";
import { ZoneEntity } from "../db/entities/zone.entity.js";
import { generateSecret, hashSecret } from "../modules/sensors/sensors.service.js";
import { mosquittoAclFile, mosquittoPasswordFile } from "../mqtt/mosquitto-files.js";

/**
 * Writes mosquitto's password file and ACL file for the sensors of DATABASE_PATH (issue 11).
 *
 * Benchwarden keeps only a SHA-256 of each sensor secret, so it cannot put a secret it does not
 * know into mosquitto's file. The export takes the plain secrets from the secrets files the admin
 * kept (the demo's demo-sensors.json, the new-sensor-secrets.json of an earlier export, or one
 * they keep themselves as [{ "id", "secret" }]), checks each against the stored hash, and refuses
 * when an enabled sensor's secret is missing, unless told to rotate those: then they get new
 * secrets, stored as hashes as usual and written once to a file for loading into the probes.
 */

export interface ExportOptions {
  outDir: string;
  /** Plain secrets the admin holds: [{ id, secret }] (other fields are ignored). */
  secrets: { id: string; secret: string }[];
  rotateMissing: boolean;
  server: { username: string; password: string };
}

export interface NewSecret {
  id: string;
  secret: string;
  kind: string;
  benchId: number | null;
  benchName: string | null;
}

export type ExportResult =
  | { ok: true; passwordFile: string; aclFile: string; exported: number; rotated: NewSecret[]; newSecretsFile: string | null; disabled: number; stale: string[] }
  | { ok: false; missing: string[]; stale: string[] };

/** Write through a temporary file and rename, so the broker never reads half a file on reload. */
function writeAtomic(path: string, text: string, mode: number): void {
  const tmp = `${path}.tmp-${process.pid}`;
  writeFileSync(tmp, text, { mode });
  chmodSync(tmp, mode);
  renameSync(tmp, path);
}

export async function exportMosquitto(dataSource: DataSource, options: ExportOptions): Promise<ExportResult> {
  const sensors = await dataSource.getRepository(SensorEntity).find({ order: { id: "ASC" } });
  const enabled = sensors.filter((s) => s.disabledAtMs === null);
  const given = new Map<string, string>();
  const stale: string[] = [];
  for (const { id, secret } of options.secrets) {
    const sensor = enabled.find((s) => s.id === id);
    if (!sensor) continue;
    if (hashSecret(secret) === sensor.secretHash) given.set(id, secret);
    else if (!given.has(id)) stale.push(id);
  }
  if (enabled.some((s) => s.id === options.server.username)) {
    throw new Error(`A sensor is called ${options.server.username}, the server's MQTT user name: choose another MQTT_USERNAME`);
  }
  const staleNow = stale.filter((id) => !given.has(id));
  const missing = enabled.filter((s) => !given.has(s.id)).map((s) => s.id);
  if (missing.length > 0 && !options.rotateMissing) return { ok: false, missing, stale: staleNow };

  const rotated: NewSecret[] = [];
  if (missing.length > 0) {
    const [benches, zones] = await Promise.all([dataSource.getRepository(BenchEntity).find(), dataSource.getRepository(ZoneEntity).find()]);
    await dataSource.transaction(async (tx) => {
      for (const id of missing) {
        const sensor = enabled.find((s) => s.id === id)!;
        const secret = generateSecret();
        await tx.getRepository(SensorEntity).update({ id }, { secretHash: hashSecret(secret) });
        const bench = benches.find((b) => b.id === sensor.benchId);
        const zone = zones.find((z) => z.id === bench?.zoneId);
        rotated.push({ id, secret, kind: sensor.kind, benchId: sensor.benchId, benchName: bench ? `${zone?.name ?? ""} – ${bench.name}` : null });
        given.set(id, secret);
      }
    });
  }

  const outDir = resolve(options.outDir);
  mkdirSync(outDir, { recursive: true });
  let newSecretsFile: string | null = null;
  if (rotated.length > 0) {
    // Written before the broker's files: if anything below fails, the new secrets are not lost.
    newSecretsFile = join(outDir, "new-sensor-secrets.json");
    writeAtomic(newSecretsFile, JSON.stringify(rotated, null, 2) + "\n", 0o600);
  }
  const users = [options.server, ...enabled.map((s) => ({ username: s.id, password: given.get(s.id)! }))];
  const passwordFile = join(outDir, "passwd");
  const aclFile = join(outDir, "acl");
  // Group-readable: Debian's mosquitto reads them as its own user (chgrp mosquitto, see docs/mosquitto.md).
  writeAtomic(passwordFile, mosquittoPasswordFile(users.map((u) => ({ username: u.username, password: u.password }))), 0o640);
  writeAtomic(aclFile, mosquittoAclFile(options.server.username, enabled.map((s) => s.id)), 0o640);
  return { ok: true, passwordFile, aclFile, exported: enabled.length, rotated, newSecretsFile, disabled: sensors.length - enabled.length, stale: staleNow };
}

function readSecretsFile(path: string): { id: string; secret: string }[] {
  const parsed: unknown = JSON.parse(readFileSync(path, "utf8"));
  if (!Array.isArray(parsed)) throw new Error(`${path}: expected a JSON array of { "id", "secret" }`);
  return parsed.flatMap((e: unknown) => {
    const entry = e as { id?: unknown; secret?: unknown };
    return typeof entry?.id === "string" && typeof entry.secret === "string" ? [{ id: entry.id, secret: entry.secret }] : [];
  });
}

/** The server's own MQTT sign-in, as the server itself reads it (MQTT_URL, MQTT_USERNAME, MQTT_PASSWORD). */
function serverCredentials(env: ReturnType<typeof parseEnv>): { username: string; password: string } {
  const url = env.MQTT_URL ? new URL(env.MQTT_URL) : null;
  const username = env.MQTT_USERNAME ?? (url?.username ? decodeURIComponent(url.username) : undefined);
  const password = env.MQTT_PASSWORD ?? (url?.password ? decodeURIComponent(url.password) : undefined);
  if (!username || !password) {
    throw new ConfigError(["MQTT_USERNAME / MQTT_PASSWORD (or a user and password in MQTT_URL): the server's own sign-in goes into the password file too"]);
  }
  return { username, password };
}

const program = new Command()
  .name("sensors:export-mosquitto")
  .description("Write mosquitto's password_file and acl_file for the sensors in the database of DATABASE_URL or DATABASE_PATH, and the server's user from MQTT_URL / MQTT_USERNAME / MQTT_PASSWORD")
  .requiredOption("--out-dir <dir>", "folder for passwd, acl (and new-sensor-secrets.json when secrets are rotated)")
  .option("--secrets <file>", "a JSON array of { \"id\", \"secret\" } with sensors' current secrets (repeatable)", (v: string, acc: string[]) => [...acc, v], [] as string[])
  .option("--rotate-missing", "give every enabled sensor whose secret is not in a --secrets file a new one (written once to new-sensor-secrets.json)")
  .action(async (opts: { outDir: string; secrets: string[]; rotateMissing?: boolean }) => {
    loadDotEnv();
    const env = parseEnv();
    const server = serverCredentials(env);
    const secrets = opts.secrets.flatMap(readSecretsFile);
    const dataSource = createDataSource(databaseTarget(env));
    await dataSource.initialize();
    try {
      await dataSource.runMigrations({ transaction: "each" });
      const result = await exportMosquitto(dataSource, { outDir: opts.outDir, secrets, rotateMissing: opts.rotateMissing ?? false, server });
      for (const id of result.stale) console.error(`The secret given for ${id} is not its current one (rotated since?).`);
      if (!result.ok) {
        console.error(
          [
            `Nothing written: the secrets of ${result.missing.length} enabled sensor(s) are not known (${result.missing.slice(0, 20).join(", ")}${result.missing.length > 20 ? ", …" : ""}).`,
            "Benchwarden keeps only hashes of sensor secrets. Either pass the files that hold them with --secrets,",
            "or add --rotate-missing to give those sensors new secrets (their probes must then be given the new ones).",
          ].join("\n"),
        );
        process.exitCode = 1;
        return;
      }
      const lines = [`Wrote ${result.passwordFile} (${result.exported} sensor(s) and the server's user ${server.username}) and ${result.aclFile}.`];
      if (result.disabled > 0) lines.push(`Left out ${result.disabled} disabled sensor(s): they cannot sign in.`);
      if (result.newSecretsFile) {
        lines.push(`Gave ${result.rotated.length} sensor(s) new secrets; they are in ${result.newSecretsFile} and nowhere else. Load them into the probes, then pass that file with --secrets next time.`);
      }
      lines.push("Reload mosquitto to apply: systemctl reload mosquitto (or kill -HUP its pid).");
      console.log(lines.join("\n"));
    } finally {
      await dataSource.destroy();
    }
  });

program.parseAsync().catch((err: unknown) => {
  console.error(err instanceof ConfigError ? err.message : err instanceof Error ? err.message : err);
  process.exit(1);
});
