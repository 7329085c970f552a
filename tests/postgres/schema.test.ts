import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDataSource } from "../../server/db/data-source.js";
import { startPostgres, type Postgres } from "../support/postgres.js";

let server: Postgres;

beforeAll(async () => {
  server = await startPostgres();
}, 120_000);

afterAll(async () => {
  await server?.cleanup();
});

/** A new database with the PostgreSQL migrations applied, for one check. */
async function withMigratedDatabase(check: (ds: DataSource) => Promise<void>): Promise<void> {
  const ds = createDataSource({ kind: "postgres", url: await server.createDatabase() });
  await ds.initialize();
  try {
    await ds.runMigrations({ transaction: "each" });
    await check(ds);
  } finally {
    await ds.destroy();
  }
}

describe("PostgreSQL schema", () => {
  it("the PostgreSQL migrations build exactly what the entities describe", async () => {
    await withMigratedDatabase(async (ds) => {
      const pending = await ds.driver.createSchemaBuilder().log();
      expect(pending.upQueries.map((q) => q.query)).toEqual([]);
    });
  });

  it("epoch milliseconds and counts come back as numbers, not strings", async () => {
    await withMigratedDatabase(async (ds) => {
      const timeMs = 1_796_329_492_887;
      await ds.query(`INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id) VALUES ($1, 'air.temperature', $2, 21.5, NULL)`, ["probe-1", timeMs]);
      const [row] = (await ds.query(`SELECT time_ms, value, COUNT(*) OVER () AS n FROM reading`)) as { time_ms: unknown; value: unknown; n: unknown }[];
      expect(row).toEqual({ time_ms: timeMs, value: 21.5, n: 1 });
    });
  });

  it("re-filing a reading to another bench marks the rollup hour stale on both benches (trigger)", async () => {
    await withMigratedDatabase(async (ds) => {
      const timeMs = 1_796_329_492_887;
      await ds.query(`INSERT INTO reading (sensor_id, quantity, time_ms, value, bench_id) VALUES ('probe-1', 'air.temperature', $1, 21.5, 1)`, [timeMs]);
      await ds.query(`UPDATE reading SET bench_id = 2 WHERE sensor_id = 'probe-1'`);
      await ds.query(`UPDATE reading SET value = 22 WHERE sensor_id = 'probe-1'`); // not a move: nothing more
      const stale = (await ds.query(`SELECT bench_id, hour_ms FROM reading_rollup_stale ORDER BY bench_id`)) as { bench_id: number; hour_ms: number }[];
      const hourMs = Math.floor(timeMs / 3_600_000) * 3_600_000;
      expect(stale).toEqual([
        { bench_id: 1, hour_ms: hourMs },
        { bench_id: 2, hour_ms: hourMs },
      ]);
    });
  });
});
