import type BetterSqlite3 from "better-sqlite3";
import type pg from "pg";
import type { DataSource } from "typeorm";
import { isPostgres, postgresPool, rawDatabase } from "./data-source.js";

/** Named parameters as better-sqlite3 takes them: `@benchId` in the SQL, `{ benchId }` here. */
export type SqlParams = Record<string, unknown>;

/** One SQL text for both databases, or one per dialect where they must differ. */
export type StatementText = string | { sqlite: string; postgres: string };

/** The pool, or the one client a PostgreSQL transaction runs on. */
export type PostgresQueryable = Pick<pg.Pool | pg.PoolClient, "query">;

export interface PositionalSql {
  text: string;
  /** The parameter of each `$n`, in order. */
  names: string[];
}

/**
 * `@name` parameters as PostgreSQL's `$1…$n` (numbered in order of first use; a name used twice is
 * one parameter), so a statement is written once for both databases.
 */
export function toPositional(sql: string): PositionalSql {
  const names: string[] = [];
  const text = sql.replace(/@([A-Za-z_]\w*)/g, (_, name: string) => {
    let index = names.indexOf(name);
    if (index < 0) index = names.push(name) - 1;
    return `$${index + 1}`;
  });
  return { text, names };
}

function positionalValues(sql: PositionalSql, params: SqlParams): unknown[] {
  return sql.names.map((name) => {
    // better-sqlite3 refuses a missing parameter; pg would bind it as NULL and answer nothing.
    if (params[name] === undefined) throw new Error(`missing SQL parameter @${name}`);
    return params[name];
  });
}

/**
 * A module's statements on whichever database the data source holds: prepared once on SQLite's raw
 * handle (STACK.md: the reading table's hot paths skip TypeORM), or run through the pg pool (or a
 * client holding a transaction) with `$n` parameters. On SQLite the async methods run the prepared
 * statement synchronously.
 */
export class Statements<K extends string> {
  private readonly sqliteStatements = new Map<K, BetterSqlite3.Statement>();
  private readonly postgresTexts = new Map<K, PositionalSql>();
  private readonly pool: pg.Pool | null;

  constructor(dataSource: DataSource, texts: Record<K, StatementText>) {
    const entries = Object.entries(texts) as [K, StatementText][];
    if (isPostgres(dataSource)) {
      this.pool = postgresPool(dataSource);
      for (const [key, text] of entries) this.postgresTexts.set(key, toPositional(typeof text === "string" ? text : text.postgres));
    } else {
      this.pool = null;
      const db = rawDatabase(dataSource);
      for (const [key, text] of entries) this.sqliteStatements.set(key, db.prepare(typeof text === "string" ? text : text.sqlite));
    }
  }

  get isPostgres(): boolean {
    return this.pool !== null;
  }

  /** The pg pool (PostgreSQL only), for a transaction on one of its clients. */
  postgresPool(): pg.Pool {
    if (!this.pool) throw new Error("not a PostgreSQL data source");
    return this.pool;
  }

  /** The prepared statement (SQLite only), for work that must stay inside one synchronous better-sqlite3 transaction. */
  sqlite(key: K): BetterSqlite3.Statement {
    const statement = this.sqliteStatements.get(key);
    if (!statement) throw new Error(`no SQLite statement ${key}`);
    return statement;
  }

  private async postgres(key: K, params: SqlParams, on: PostgresQueryable | undefined): Promise<pg.QueryResult> {
    const sql = this.postgresTexts.get(key);
    if (!sql) throw new Error(`no PostgreSQL statement ${key}`);
    return (on ?? this.pool!).query(sql.text, positionalValues(sql, params));
  }

  async all<T>(key: K, params: SqlParams = {}, on?: PostgresQueryable): Promise<T[]> {
    if (this.pool) return (await this.postgres(key, params, on)).rows as T[];
    return this.sqlite(key).all(params) as T[];
  }

  async get<T>(key: K, params: SqlParams = {}, on?: PostgresQueryable): Promise<T | undefined> {
    if (this.pool) return (await this.postgres(key, params, on)).rows[0] as T | undefined;
    return this.sqlite(key).get(params) as T | undefined;
  }

  /** Runs a write; resolves to the number of rows it changed. */
  async run(key: K, params: SqlParams = {}, on?: PostgresQueryable): Promise<number> {
    if (this.pool) return (await this.postgres(key, params, on)).rowCount ?? 0;
    return this.sqlite(key).run(params).changes;
  }
}
