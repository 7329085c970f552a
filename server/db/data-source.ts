import "reflect-metadata";
import { mkdirSync } from "node:fs";
import { dirname } from "node:path";
import type BetterSqlite3 from "better-sqlite3";
import { DataSource } from "typeorm";
import { ENTITIES } from "./entities/index.js";
import { MIGRATIONS } from "./migrations/index.js";

/** A data source over one SQLite file: WAL, a busy timeout, migrations (never synchronize). */
export function createDataSource(databasePath: string): DataSource {
  if (databasePath !== ":memory:") mkdirSync(dirname(databasePath), { recursive: true });
  return new DataSource({
    type: "better-sqlite3",
    database: databasePath,
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

/** The raw better-sqlite3 handle, for the ingest hot path's prepared statements (STACK.md). */
export function rawDatabase(dataSource: DataSource): BetterSqlite3.Database {
  return (dataSource.driver as unknown as { databaseConnection: BetterSqlite3.Database }).databaseConnection;
}

// For the TypeORM CLI (npm run migration:generate).
export default createDataSource(process.env.DATABASE_PATH ?? "data/benchwarden.sqlite");
