import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { DataSource } from "typeorm";
import { createDataSource, isPostgres, postgresPool, rawDatabase } from "../../server/db/data-source.js";
import { BenchEntity, type Bench } from "../../server/db/entities/bench.entity.js";
import { SiteEntity } from "../../server/db/entities/site.entity.js";
import { ZoneEntity } from "../../server/db/entities/zone.entity.js";
import { Statements, type SqlParams } from "../../server/db/statements.js";
import type { Postgres } from "./postgres.js";

/**
 * The same migrated schema on a temporary SQLite file and on a fresh database of a throwaway
 * PostgreSQL, so a test can write the same rows to both and compare what each implementation answers.
 */
export interface TwinDatabases {
  sqlite: DataSource;
  postgres: DataSource;
  both: DataSource[];
  /** A second data source on the PostgreSQL database (another instance of the server). */
  openAnotherPostgres(): Promise<DataSource>;
  destroy(): Promise<void>;
}

export async function twinDatabases(server: Postgres): Promise<TwinDatabases> {
  const dir = mkdtempSync(join(tmpdir(), "benchwarden-twin-"));
  const url = await server.createDatabase();
  const sqlite = createDataSource({ kind: "sqlite", path: join(dir, "benchwarden.sqlite") });
  const postgres = createDataSource({ kind: "postgres", url });
  const others: DataSource[] = [];
  for (const ds of [sqlite, postgres]) {
    await ds.initialize();
    await ds.runMigrations({ transaction: "each" });
  }
  return {
    sqlite,
    postgres,
    both: [sqlite, postgres],
    async openAnotherPostgres() {
      const ds = createDataSource({ kind: "postgres", url });
      await ds.initialize();
      others.push(ds);
      return ds;
    },
    async destroy() {
      for (const ds of [sqlite, postgres, ...others]) if (ds.isInitialized) await ds.destroy();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export const nameOf = (ds: DataSource) => (isPostgres(ds) ? "postgres" : "sqlite");

/** One ad hoc statement with @name parameters on either database. */
export async function query<T>(ds: DataSource, sql: string, params: SqlParams = {}): Promise<T[]> {
  return new Statements(ds, { q: sql }).all<T>("q", params);
}

/** One ad hoc write with @name parameters on either database; the rows it changed. */
export async function execute(ds: DataSource, sql: string, params: SqlParams = {}): Promise<number> {
  return new Statements(ds, { q: sql }).run("q", params);
}

export interface TestReading {
  sensorId: string;
  quantity: string;
  timeMs: number;
  value: number;
  benchId: number | null;
}

/** Readings with plain INSERTs (no rollups: see rollUp). */
export async function insertReadings(ds: DataSource, rows: TestReading[]): Promise<void> {
  if (isPostgres(ds)) {
    await postgresPool(ds).query(
      `INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id)
       SELECT * FROM unnest($1::varchar[], $2::varchar[], $3::bigint[], $4::float8[], $5::int[])`,
      [rows.map((r) => r.sensorId), rows.map((r) => r.quantity), rows.map((r) => r.timeMs), rows.map((r) => r.value), rows.map((r) => r.benchId)],
    );
    return;
  }
  const db = rawDatabase(ds);
  const insert = db.prepare(`INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id) VALUES (@sensorId, @quantity, @timeMs, @value, @benchId)`);
  db.transaction(() => rows.forEach((r) => insert.run(r)))();
}

/**
 * The three rollup tiers of every bench's readings in [fromMs, toMs), rebuilt from the raw readings
 * (what ingest writes with them), by the same SQL on both databases.
 */
export async function rollUp(ds: DataSource, fromMs = 0, toMs = Number.MAX_SAFE_INTEGER): Promise<void> {
  for (const resolutionMs of [60_000, 900_000, 3_600_000]) {
    const range = { fromMs: Math.floor(fromMs / resolutionMs) * resolutionMs, toMs };
    await execute(ds, `DELETE FROM reading_rollup WHERE resolution_ms = ${resolutionMs} AND start_ms >= @fromMs AND start_ms < @toMs`, range);
    await execute(
      ds,
      `INSERT INTO reading_rollup (bench_id, quantity, resolution_ms, start_ms, min, max, sum, count)
       SELECT bench_id, quantity, ${resolutionMs}, (time_ms / ${resolutionMs}) * ${resolutionMs}, MIN(value), MAX(value), SUM(value), COUNT(*)
         FROM reading WHERE bench_id IS NOT NULL AND time_ms >= @fromMs AND time_ms < @toMs
        GROUP BY bench_id, quantity, (time_ms / ${resolutionMs})`,
      range,
    );
  }
}

/** A site (in `timeZone`), one zone and `benchCount` benches in walking order; the same ids on both databases. */
export async function seedLayout(ds: DataSource, benchCount: number, timeZone = "America/Chicago"): Promise<{ zoneId: number; benches: Bench[] }> {
  const site = await ds.getRepository(SiteEntity).save({ name: "Test site", timeZone, createdAtMs: 0, archivedAtMs: null, escalateAfterS: null, renotifyEveryS: null });
  const zone = await ds.getRepository(ZoneEntity).save({ siteId: site.id, name: "House 1", position: 0, archivedAtMs: null, dewPointMarginC: 2 });
  const benches: Bench[] = [];
  for (let i = 0; i < benchCount; i++) {
    benches.push(await ds.getRepository(BenchEntity).save({ zoneId: zone.id, name: `Bench ${i + 1}`, position: i, archivedAtMs: null, dewPointMarginC: null }));
  }
  return { zoneId: zone.id, benches };
}

/** Numbers to 12 significant digits: sums added in another order differ in the last bits. */
export function roughly<T>(value: T): T {
  return JSON.parse(JSON.stringify(value, (_, v: unknown) => (typeof v === "number" && Number.isFinite(v) ? Number(v.toPrecision(12)) : v))) as T;
}
