import "reflect-metadata";
import { mkdirSync } from "node:fs";
import { dirname } from "node:path";
import type BetterSqlite3 from "better-sqlite3";
import pg from "pg";
import { DataSource, EntitySchema, type EntitySchemaColumnOptions } from "typeorm";
import { ENTITIES } from "./entities/index.js";
import { MIGRATIONS } from "./migrations/index.js";
import { POSTGRES_MIGRATIONS } from "./migrations/postgres/index.js";

/** Where the data lives: one SQLite file (the default), or a PostgreSQL database shared by several instances. */
export type DatabaseTarget = { kind: "sqlite"; path: string } | { kind: "postgres"; url: string };

export function databaseTarget(env: { DATABASE_PATH: string; DATABASE_URL?: string }): DatabaseTarget {
  return env.DATABASE_URL ? { kind: "postgres", url: env.DATABASE_URL } : { kind: "sqlite", path: env.DATABASE_PATH };
}

// int8 (bigint: every *_ms column, COUNT(*)) and numeric (SUM of integers) arrive from pg as
// strings; every such value here is a count or an epoch-millisecond time, far inside 2^53.
pg.types.setTypeParser(pg.types.builtins.INT8, (text) => Number(text));
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (text) => Number(text));

/**
 * The entities with PostgreSQL's column types where SQLite's would not do: epoch milliseconds need
 * 64 bits (SQLite's integer has them, PostgreSQL's has 32), and SQLite's real is a double (PostgreSQL's
 * real is 4 bytes). Everything else is declared once, portably, in the entity files.
 */
function forPostgres(schema: EntitySchema): EntitySchema {
  const options = schema.options;
  const columns: Record<string, EntitySchemaColumnOptions> = {};
  for (const [key, column] of Object.entries(options.columns)) {
    if (!column) continue;
    const name = column.name ?? key;
    let type = column.type;
    if (type === "integer" && name.endsWith("_ms") && !column.generated) type = "bigint";
    if (type === "real") type = "double precision";
    columns[key] = { ...column, type };
  }
  return new EntitySchema({ ...options, columns, withoutRowid: undefined });
}

export const POSTGRES_ENTITIES = ENTITIES.map((e) => forPostgres(e as EntitySchema));

/** A data source over one SQLite file (WAL, a busy timeout) or a PostgreSQL database; migrations only, never synchronize. */
export function createDataSource(target: DatabaseTarget | string): DataSource {
  const where: DatabaseTarget = typeof target === "string" ? { kind: "sqlite", path: target } : target;
  if (where.kind === "postgres") {
    return new DataSource({
      type: "postgres",
      url: where.url,
      entities: POSTGRES_ENTITIES,
      migrations: POSTGRES_MIGRATIONS,
      migrationsRun: false,
      synchronize: false,
      // Ingest, HTTP, the alert engine and the event listener share the pool; a statement that
      // waits longer than this for a lock is a bug, not load.
      poolSize: 20,
      extra: { statement_timeout: 60_000, application_name: "benchwarden" },
    });
  }
  if (where.path !== ":memory:") mkdirSync(dirname(where.path), { recursive: true });
  return new DataSource({
    type: "better-sqlite3",
    database: where.path,
    entities: ENTITIES,
    migrations: MIGRATIONS,
    migrationsRun: false,
    synchronize: false,
    enableWAL: true,
    timeout: 5000,
    prepareDatabase: (db: BetterSqlite3.Database) => {
      // NORMAL is durable across a process crash in WAL mode (only an OS crash can lose the last commits).
      db.pragma("synchronous = NORMAL");
      db.pragma("foreign_keys = ON");
    },
  });
}

export function isPostgres(dataSource: DataSource): boolean {
  return dataSource.options.type === "postgres";
}

/** The raw better-sqlite3 handle, for the ingest hot path's prepared statements (STACK.md). */
export function rawDatabase(dataSource: DataSource): BetterSqlite3.Database {
  if (isPostgres(dataSource)) throw new Error("rawDatabase() is the SQLite handle; on PostgreSQL use postgresPool()");
  return (dataSource.driver as unknown as { databaseConnection: BetterSqlite3.Database }).databaseConnection;
}

/** The pg pool TypeORM opened, for the readings' hot path on PostgreSQL (multi-row statements, LISTEN/NOTIFY). */
export function postgresPool(dataSource: DataSource): pg.Pool {
  if (!isPostgres(dataSource)) throw new Error("postgresPool() needs a PostgreSQL data source");
  return (dataSource.driver as unknown as { master: pg.Pool }).master;
}

// For the TypeORM CLI (npm run migration:generate; migration:generate:postgres with DATABASE_URL).
export default createDataSource(databaseTarget({ DATABASE_PATH: process.env.DATABASE_PATH ?? "data/benchwarden.sqlite", DATABASE_URL: process.env.DATABASE_URL }));
