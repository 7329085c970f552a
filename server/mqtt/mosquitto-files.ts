import { pbkdf2Sync, randomBytes, timingSafeEqual } from "node:crypto";
import { readingsTopic, statusTopic, TOPIC_PREFIX } from "./topics.js";

/**
 * mosquitto 2.x's password-file hash: `$7$<iterations>$<salt>$<hash>`, PBKDF2 over SHA-512 with a
 * 12-byte salt and a 64-byte key, both in standard base64 (mosquitto_passwd's own format, read by
 * the broker on start and on SIGHUP). 101 iterations is mosquitto_passwd's default; sensor secrets
 * are 32 random bytes, so a slow hash would buy nothing and slow every reconnect of a large fleet.
 */
export function mosquittoPasswordHash(password: string, options: { iterations?: number; salt?: Buffer } = {}): string {
  const iterations = options.iterations ?? 101;
  const salt = options.salt ?? randomBytes(12);
  const hash = pbkdf2Sync(Buffer.from(password, "utf8"), salt, iterations, 64, "sha512");
  return `$7$${iterations}$${salt.toString("base64")}$${hash.toString("base64")}`;
}

/** Whether `password` matches a `$7$` hash of a mosquitto password file. */
export function mosquittoPasswordMatches(hashField: string, password: string): boolean {
  const parts = hashField.split("$");
  if (parts.length !== 5 || parts[0] !== "" || parts[1] !== "7") return false;
  const iterations = Number(parts[2]);
  if (!Number.isInteger(iterations) || iterations < 1) return false;
  const expected = Buffer.from(parts[4]!, "base64");
  const actual = pbkdf2Sync(Buffer.from(password, "utf8"), Buffer.from(parts[3]!, "base64"), iterations, expected.length, "sha512");
  return expected.length > 0 && timingSafeEqual(expected, actual);
}

/** A password file: one `user:hash` line each. User names must not contain ":" (sensor ids cannot). */
export function mosquittoPasswordFile(users: { username: string; password: string }[], iterations?: number): string {
  return users
    .map((u) => {
      if (u.username.includes(":") || /[\r\n]/.test(u.username)) throw new Error(`${JSON.stringify(u.username)} cannot be a mosquitto user name`);
      return `${u.username}:${mosquittoPasswordHash(u.password, { iterations })}\n`;
    })
    .join("");
}

/**
 * The ACL file (acl_file): the server's user reads every sensor's readings and status; each sensor
 * writes only its own readings and its last will (PRODUCT.md §4). Nobody else may do anything.
 */
export function mosquittoAclFile(serverUser: string, sensorIds: string[], generatedAt = new Date()): string {
  const lines = [
    `# Benchwarden sensor ACL, written by npm run sensors:export-mosquitto on ${generatedAt.toISOString()}.`,
    "# Re-run the export after registering, rotating or disabling a sensor, then reload mosquitto (SIGHUP).",
    "",
    "# The server instances (they subscribe through $share/<group>/…).",
    `user ${serverUser}`,
    `topic read ${TOPIC_PREFIX}+/readings`,
    `topic read ${TOPIC_PREFIX}+/status`,
  ];
  for (const id of sensorIds) {
    lines.push("", `user ${id}`, `topic write ${readingsTopic(id)}`, `topic write ${statusTopic(id)}`);
  }
  return lines.join("\n") + "\n";
}
