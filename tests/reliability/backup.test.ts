import { copyFileSync, mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Database from "better-sqlite3";
import { afterAll, describe, expect, it } from "vitest";
import { backupDatabase } from "../../server/cli/backup.js";
import { connectSensor, startTestServer, type TestServer } from "../support/test-server.js";

const dir = mkdtempSync(join(tmpdir(), "benchwarden-backup-"));
const servers: TestServer[] = [];
afterAll(async () => {
  for (const s of servers) await s.cleanup();
  rmSync(dir, { recursive: true, force: true });
});

describe("backup and restore", () => {
  it("a backup taken while readings stream in restores into a working server with the data", async () => {
    const live = await startTestServer();
    servers.push(live);
    const sensor = live.credentials[0]!;
    const client = await connectSensor(live, sensor);
    const topic = `benchwarden/v1/sensors/${sensor.id}/readings`;
    const base = Date.now() - 3_600_000;
    let sent = 0;
    const streaming = (async () => {
      for (; sent < 3000; sent++) {
        await client.publishAsync(topic, JSON.stringify([{ n: "air.temperature", u: "Cel", v: 22, t: (base + sent * 1000) / 1000 }]), { qos: 1 });
      }
    })();
    await new Promise((r) => setTimeout(r, 300));
    const sentAtBackup = sent;
    const backupPath = join(dir, "copy.sqlite");
    const result = await backupDatabase(join(live.dir, "benchwarden.sqlite"), backupPath);
    await streaming;
    await client.endAsync();
    expect(result.bytes).toBeGreaterThan(0);

    // The copy is consistent on its own (no WAL beside it) and holds a prefix of the stream.
    const copy = new Database(backupPath, { readonly: true });
    expect((copy.prepare("PRAGMA integrity_check").get() as { integrity_check: string }).integrity_check).toBe("ok");
    const inCopy = (copy.prepare("SELECT COUNT(*) AS n FROM reading WHERE sensor_id = ?").get(sensor.id) as { n: number }).n;
    copy.close();
    expect(inCopy).toBeGreaterThan(0);
    expect(inCopy).toBeLessThanOrEqual(3000);
    // Everything acknowledged before the backup began is in it.
    expect(inCopy).toBeGreaterThanOrEqual(sentAtBackup - 1);

    // Restore as the README says: copy the file into place (no -wal/-shm), start the server on it.
    const restoreDir = join(dir, "restored");
    mkdirSync(restoreDir);
    copyFileSync(backupPath, join(restoreDir, "benchwarden.sqlite"));
    copyFileSync(join(live.dir, "demo-sensors.json"), join(restoreDir, "demo-sensors.json"));
    const restored = await startTestServer({}, { dir: restoreDir });
    servers.push(restored);
    const rows = (restored.dataSource.driver as unknown as { databaseConnection: Database.Database }).databaseConnection
      .prepare("SELECT COUNT(*) AS n FROM reading WHERE sensor_id = ?")
      .get(sensor.id) as { n: number };
    expect(rows.n).toBe(inCopy);
    const res = await fetch(`${restored.baseUrl}/healthz`);
    expect(res.status).toBe(200);
  });
});
