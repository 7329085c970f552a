import type { MigrationInterface, QueryRunner } from "typeorm";

/** The first schema: nursery layout, windows, sensors and readings. */
export class Initial1796172181320 implements MigrationInterface {
  name = "Initial1796172181320";

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "app_meta" ("key" varchar(64) PRIMARY KEY NOT NULL, "value" text NOT NULL)`);
    await queryRunner.query(`CREATE TABLE "site" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "name" varchar(120) NOT NULL, "time_zone" varchar(64) NOT NULL DEFAULT ('UTC'), "created_at_ms" integer NOT NULL)`);
    await queryRunner.query(`CREATE TABLE "zone" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "site_id" integer NOT NULL, "name" varchar(120) NOT NULL, "position" integer NOT NULL DEFAULT (0), "archived_at_ms" integer, CONSTRAINT "FK_62b778e7f9ae03e6b9dfd05b157" FOREIGN KEY ("site_id") REFERENCES "site" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`);
    await queryRunner.query(`CREATE TABLE "bench" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "zone_id" integer NOT NULL, "name" varchar(120) NOT NULL, "position" integer NOT NULL DEFAULT (0), "archived_at_ms" integer, CONSTRAINT "FK_470e0d64eaf09d67975f4c29de0" FOREIGN KEY ("zone_id") REFERENCES "zone" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`);
    await queryRunner.query(`CREATE TABLE "sensor" ("id" varchar(64) PRIMARY KEY NOT NULL, "kind" varchar(16) NOT NULL, "secret_hash" varchar(64) NOT NULL, "bench_id" integer, "created_at_ms" integer NOT NULL, CONSTRAINT "FK_c519d1c155ada34ef92bdae9188" FOREIGN KEY ("bench_id") REFERENCES "bench" ("id") ON DELETE SET NULL ON UPDATE NO ACTION)`);
    await queryRunner.query(`CREATE TABLE "zone_window" ("zone_id" integer NOT NULL, "quantity" varchar(32) NOT NULL, "min_value" real NOT NULL, "max_value" real NOT NULL, "delay_s" integer NOT NULL, "hysteresis" real NOT NULL, CONSTRAINT "FK_1d00c413ba7895e96cdbe73e621" FOREIGN KEY ("zone_id") REFERENCES "zone" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, PRIMARY KEY ("zone_id", "quantity"))`);
    await queryRunner.query(`CREATE TABLE "bench_window" ("bench_id" integer NOT NULL, "quantity" varchar(32) NOT NULL, "min_value" real NOT NULL, "max_value" real NOT NULL, "delay_s" integer NOT NULL, "hysteresis" real NOT NULL, CONSTRAINT "FK_1fd7279b5d795d036c1e24c35a0" FOREIGN KEY ("bench_id") REFERENCES "bench" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, PRIMARY KEY ("bench_id", "quantity"))`);
    await queryRunner.query(`CREATE TABLE "reading" ("sensor_id" varchar(64) NOT NULL, "quantity" varchar(32) NOT NULL, "time_ms" integer NOT NULL, "value" real NOT NULL, "bench_id" integer, PRIMARY KEY ("sensor_id", "quantity", "time_ms")) WITHOUT ROWID`);
    await queryRunner.query(`CREATE INDEX "idx_reading_bench_quantity_time" ON "reading" ("bench_id", "quantity", "time_ms")`);
    await queryRunner.query(`CREATE TABLE "latest_reading" ("sensor_id" varchar(64) NOT NULL, "quantity" varchar(32) NOT NULL, "time_ms" integer NOT NULL, "value" real NOT NULL, "bench_id" integer, PRIMARY KEY ("sensor_id", "quantity"))`);
    await queryRunner.query(`CREATE INDEX "idx_latest_reading_bench" ON "latest_reading" ("bench_id")`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX "idx_latest_reading_bench"`);
    await queryRunner.query(`DROP INDEX "idx_reading_bench_quantity_time"`);
    await queryRunner.query(`DROP TABLE "latest_reading"`);
    await queryRunner.query(`DROP TABLE "reading"`);
    await queryRunner.query(`DROP TABLE "bench_window"`);
    await queryRunner.query(`DROP TABLE "zone_window"`);
    await queryRunner.query(`DROP TABLE "sensor"`);
    await queryRunner.query(`DROP TABLE "bench"`);
    await queryRunner.query(`DROP TABLE "zone"`);
    await queryRunner.query(`DROP TABLE "site"`);
    await queryRunner.query(`DROP TABLE "app_meta"`);
  }
}
