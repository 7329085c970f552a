import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Issue 7: archiving sites, dew-point margins on zones (and bench overrides), sensor assignment
 * history, the audit trail and managers' window presets. Columns are added in place (ALTER TABLE
 * ADD COLUMN) rather than by rebuilding tables that others reference.
 */
export class LayoutAuditPresets1796173669558 implements MigrationInterface {
  name = "LayoutAuditPresets1796173669558";

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "site" ADD COLUMN "archived_at_ms" integer`);
    await queryRunner.query(`ALTER TABLE "zone" ADD COLUMN "dew_point_margin_c" real NOT NULL DEFAULT (2)`);
    await queryRunner.query(`ALTER TABLE "bench" ADD COLUMN "dew_point_margin_c" real`);
    await queryRunner.query(`CREATE TABLE "sensor_assignment" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "sensor_id" varchar(64) NOT NULL, "bench_id" integer NOT NULL, "from_ms" integer NOT NULL, "to_ms" integer, CONSTRAINT "FK_da7d8f669387b6aa1ab53d034b9" FOREIGN KEY ("sensor_id") REFERENCES "sensor" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_60ec3b78ddd13e83d1714bcb7c5" FOREIGN KEY ("bench_id") REFERENCES "bench" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`);
    await queryRunner.query(`CREATE INDEX "idx_sensor_assignment_sensor" ON "sensor_assignment" ("sensor_id", "from_ms") `);
    await queryRunner.query(`CREATE INDEX "idx_sensor_assignment_bench" ON "sensor_assignment" ("bench_id", "from_ms") `);
    // Sensors already on a bench: their stretch there began when they were registered.
    await queryRunner.query(`INSERT INTO "sensor_assignment" ("sensor_id", "bench_id", "from_ms", "to_ms") SELECT "id", "bench_id", "created_at_ms", NULL FROM "sensor" WHERE "bench_id" IS NOT NULL`);
    await queryRunner.query(`CREATE TABLE "audit_entry" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "at_ms" integer NOT NULL, "actor_user_id" integer, "actor_name" varchar(80) NOT NULL, "actor_role" varchar(16), "entity_type" varchar(32) NOT NULL, "entity_id" varchar(64) NOT NULL, "action" varchar(32) NOT NULL, "subject" varchar(300) NOT NULL, "site_id" integer, "zone_id" integer, "previous_zone_id" integer, "bench_id" integer, "changes" text NOT NULL, "note" text)`);
    await queryRunner.query(`CREATE INDEX "idx_audit_entry_zone" ON "audit_entry" ("zone_id", "id") `);
    await queryRunner.query(`CREATE INDEX "idx_audit_entry_previous_zone" ON "audit_entry" ("previous_zone_id", "id") `);
    await queryRunner.query(`CREATE INDEX "idx_audit_entry_bench" ON "audit_entry" ("bench_id", "id") `);
    await queryRunner.query(`CREATE TABLE "window_preset" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "name" varchar(80) NOT NULL, "description" varchar(500) NOT NULL DEFAULT (''), "windows" text NOT NULL, "dew_point_margin_c" real NOT NULL, "created_at_ms" integer NOT NULL, "updated_at_ms" integer NOT NULL)`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE "window_preset"`);
    await queryRunner.query(`DROP INDEX "idx_audit_entry_bench"`);
    await queryRunner.query(`DROP INDEX "idx_audit_entry_previous_zone"`);
    await queryRunner.query(`DROP INDEX "idx_audit_entry_zone"`);
    await queryRunner.query(`DROP TABLE "audit_entry"`);
    await queryRunner.query(`DROP INDEX "idx_sensor_assignment_bench"`);
    await queryRunner.query(`DROP INDEX "idx_sensor_assignment_sensor"`);
    await queryRunner.query(`DROP TABLE "sensor_assignment"`);
    await queryRunner.query(`ALTER TABLE "bench" DROP COLUMN "dew_point_margin_c"`);
    await queryRunner.query(`ALTER TABLE "zone" DROP COLUMN "dew_point_margin_c"`);
    await queryRunner.query(`ALTER TABLE "site" DROP COLUMN "archived_at_ms"`);
  }
}
