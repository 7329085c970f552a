import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Issue 9: rollups of the readings per bench and quantity (1 min, 15 min, 1 h: min, max, sum,
 * count), filled from the readings already stored; the readings repository keeps them up to date
 * at ingest. A back-dated sensor move re-files readings to another bench with an UPDATE of
 * reading.bench_id; the trigger marks the hours it touches on both benches stale, and the
 * repository rebuilds them from the readings before serving a series.
 */
export class ReadingRollups1796178460011 implements MigrationInterface {
  name = "ReadingRollups1796178460011";

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "reading_rollup" ("bench_id" integer NOT NULL, "quantity" varchar(32) NOT NULL, "resolution_ms" integer NOT NULL, "start_ms" integer NOT NULL, "min" real NOT NULL, "max" real NOT NULL, "sum" real NOT NULL, "count" integer NOT NULL, PRIMARY KEY ("bench_id", "quantity", "resolution_ms", "start_ms")) WITHOUT ROWID`);
    await queryRunner.query(`CREATE TABLE "reading_rollup_stale" ("bench_id" integer NOT NULL, "quantity" varchar(32) NOT NULL, "hour_ms" integer NOT NULL, PRIMARY KEY ("bench_id", "quantity", "hour_ms")) WITHOUT ROWID`);
    await queryRunner.query(
      `CREATE TRIGGER "reading_rollup_refile" AFTER UPDATE OF "bench_id" ON "reading" WHEN OLD."bench_id" IS NOT NEW."bench_id"
       BEGIN
         INSERT OR IGNORE INTO "reading_rollup_stale" ("bench_id", "quantity", "hour_ms")
           SELECT OLD."bench_id", OLD."quantity", (OLD."time_ms" / 3600000) * 3600000 WHERE OLD."bench_id" IS NOT NULL;
         INSERT OR IGNORE INTO "reading_rollup_stale" ("bench_id", "quantity", "hour_ms")
           SELECT NEW."bench_id", NEW."quantity", (NEW."time_ms" / 3600000) * 3600000 WHERE NEW."bench_id" IS NOT NULL;
       END`,
    );
    await queryRunner.query(
      `INSERT INTO "reading_rollup" SELECT "bench_id", "quantity", 60000, ("time_ms" / 60000) * 60000, MIN("value"), MAX("value"), SUM("value"), COUNT(*)
         FROM "reading" WHERE "bench_id" IS NOT NULL GROUP BY "bench_id", "quantity", "time_ms" / 60000`,
    );
    for (const resolutionMs of [900_000, 3_600_000]) {
      await queryRunner.query(
        `INSERT INTO "reading_rollup" SELECT "bench_id", "quantity", ${resolutionMs}, ("start_ms" / ${resolutionMs}) * ${resolutionMs}, MIN("min"), MAX("max"), SUM("sum"), SUM("count")
           FROM "reading_rollup" WHERE "resolution_ms" = 60000 GROUP BY "bench_id", "quantity", "start_ms" / ${resolutionMs}`,
      );
    }
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TRIGGER "reading_rollup_refile"`);
    await queryRunner.query(`DROP TABLE "reading_rollup_stale"`);
    await queryRunner.query(`DROP TABLE "reading_rollup"`);
  }
}
