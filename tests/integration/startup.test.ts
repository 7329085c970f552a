import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { ConfigError, parseEnv } from "../../server/config/env.js";
import { createDataSource } from "../../server/db/data-source.js";
import { PROJECT_ROOT } from "../../server/index.js";

describe("configuration", () => {
  it("when PORT is not a number, then parsing names PORT and the value given", () => {
    expect(() => parseEnv({ PORT: "abc" })).toThrow(ConfigError);
    expect(() => parseEnv({ PORT: "abc" })).toThrow(/PORT: .*\(got "abc"\)/);
  });

  it("names every bad key in one message", () => {
    try {
      parseEnv({ PORT: "99999", MQTT_PORT: "x", APP_URL: "not a url", DEMO: "yes" });
      expect.unreachable();
    } catch (err) {
      expect((err as ConfigError).problems.map((p) => p.split(":")[0])).toEqual(["PORT", "MQTT_PORT", "APP_URL", "DEMO"]);
    }
  });

  it("when the server is started with PORT=abc, then it exits non-zero with a message naming PORT", () => {
    const result = spawnSync(process.execPath, ["node_modules/tsx/dist/cli.mjs", "--tsconfig", "tsconfig.server.json", "server/main.ts"], {
      cwd: PROJECT_ROOT,
      env: { ...process.env, PORT: "abc" },
      encoding: "utf8",
      timeout: 20_000,
    });
    expect(result.status).toBe(1);
    expect(result.stderr).toContain("PORT");
    expect(result.stderr).toContain('"abc"');
  });

  it("when demo mode is off and JWT_SECRET is missing, then start-up stops naming JWT_SECRET", async () => {
    const dir = mkdtempSync(join(tmpdir(), "benchwarden-cfg-"));
    const { start } = await import("../../server/index.js");
    await expect(
      start(parseEnv({ DEMO: "0", PORT: "0", MQTT_PORT: "0", DATABASE_PATH: join(dir, "db.sqlite"), LOG_LEVEL: "silent" })),
    ).rejects.toThrow(/JWT_SECRET/);
    rmSync(dir, { recursive: true, force: true });
  });
});

describe("first run outside demo mode", () => {
  it("admin:create makes the first admin, who can then sign in to a server that is not in demo mode", async () => {
    const dir = mkdtempSync(join(tmpdir(), "benchwarden-admin-"));
    const databasePath = join(dir, "db.sqlite");
    const cli = spawnSync(
      process.execPath,
      ["node_modules/tsx/dist/cli.mjs", "--tsconfig", "tsconfig.server.json", "server/cli/create-admin.ts", "--email", "Owner@Example.test", "--name", "Wren Ashby", "--password-stdin"],
      { cwd: PROJECT_ROOT, env: { ...process.env, DATABASE_PATH: databasePath }, input: "correct horse battery\n", encoding: "utf8", timeout: 30_000 },
    );
    expect(cli.stderr).toBe("");
    expect(cli.status).toBe(0);
    expect(cli.stdout).toContain("Admin Wren Ashby <owner@example.test> created");

    const { start } = await import("../../server/index.js");
    const server = await start(
      parseEnv({ PORT: "0", HOST: "127.0.0.1", MQTT_PORT: "0", MQTT_HOST: "127.0.0.1", DATABASE_PATH: databasePath, JWT_SECRET: "x".repeat(40), LOG_LEVEL: "silent" }),
    );
    try {
      expect(server.demo).toBe(false);
      const res = await fetch(`http://127.0.0.1:${server.httpPort}/api/session`, {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify({ email: "owner@example.test", password: "correct horse battery" }),
      });
      expect(res.status).toBe(200);
      expect(((await res.json()) as { user: { role: string } }).user.role).toBe("admin");
    } finally {
      await server.stop();
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe("database", () => {
  it("upgrades a database of the first release's schema, keeping its data", async () => {
    const dir = mkdtempSync(join(tmpdir(), "benchwarden-upgrade-"));
    const path = join(dir, "db.sqlite");
    const { MIGRATIONS } = await import("../../server/db/migrations/index.js");
    const { DataSource } = await import("typeorm");
    // The first release: only the first migration.
    const old = new DataSource({ type: "better-sqlite3", database: path, migrations: [MIGRATIONS[0]!], synchronize: false });
    await old.initialize();
    await old.runMigrations();
    await old.query(`INSERT INTO site (id, name, time_zone, created_at_ms) VALUES (1, 'Old Orchard', 'UTC', 1)`);
    await old.query(`INSERT INTO zone (id, site_id, name, position) VALUES (1, 1, 'House A', 0)`);
    await old.query(`INSERT INTO bench (id, zone_id, name, position) VALUES (1, 1, 'Bench 1', 0)`);
    await old.query(`INSERT INTO sensor (id, kind, secret_hash, bench_id, created_at_ms) VALUES ('old-1', 'air', '${"0".repeat(64)}', 1, 1)`);
    await old.query(`INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id) VALUES ('old-1', 'air.temperature', 1000, 21.5, 1)`);
    await old.destroy();

    const current = createDataSource(path);
    await current.initialize();
    const applied = await current.runMigrations();
    expect(applied.length).toBe(MIGRATIONS.length - 1);
    expect((await current.driver.createSchemaBuilder().log()).upQueries).toEqual([]);
    expect(await current.query("SELECT name FROM site")).toEqual([{ name: "Old Orchard" }]);
    expect(await current.query("SELECT value FROM reading WHERE sensor_id = 'old-1'")).toEqual([{ value: 21.5 }]);
    expect(await current.query("SELECT disabled_at_ms FROM sensor WHERE id = 'old-1'")).toEqual([{ disabled_at_ms: null }]);
    await current.destroy();
    rmSync(dir, { recursive: true, force: true });
  });

  it("the migrations build exactly the schema the entities describe", async () => {
    const dir = mkdtempSync(join(tmpdir(), "benchwarden-db-"));
    const dataSource = createDataSource(join(dir, "db.sqlite"));
    await dataSource.initialize();
    await dataSource.runMigrations();
    const pending = await dataSource.driver.createSchemaBuilder().log();
    expect(pending.upQueries.map((q) => q.query)).toEqual([]);
    expect((await dataSource.query("PRAGMA journal_mode"))[0].journal_mode).toBe("wal");
    await dataSource.destroy();
    rmSync(dir, { recursive: true, force: true });
  });
});
