import type { MigrationInterface } from "typeorm";
import { PostgresBaseline1796329492887 } from "./1796329492887-postgres-baseline.js";
import { PostgresLeaderLease1796330000000 } from "./1796330000000-leader-lease.js";

/** PostgreSQL's migrations, oldest first: generated from the same entities as the SQLite set (DEVELOPERS.md). */
export const POSTGRES_MIGRATIONS: (new () => MigrationInterface)[] = [PostgresBaseline1796329492887, PostgresLeaderLease1796330000000];
