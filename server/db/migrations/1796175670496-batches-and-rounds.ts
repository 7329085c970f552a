import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Issue 6: batches of cuttings with their bench placements, observations with photos, and
 * walk-through rounds with their checked benches. The generator's table rebuilds for foreign keys
 * are folded into the CREATE TABLEs.
 */
export class BatchesAndRounds1796175670496 implements MigrationInterface {
  name = "BatchesAndRounds1796175670496";

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "batch" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "variety" varchar(120) NOT NULL, "wood_source" varchar(200), "stuck_on" varchar(10) NOT NULL, "count_stuck" integer NOT NULL, "thickness_mm" real, "buds_above_medium" integer, "base_treatments" varchar(64) NOT NULL DEFAULT (''), "hormone_product" varchar(200), "wrapping" varchar(16), "notes" text, "bench_id" integer NOT NULL, "outcome" varchar(16), "closed_on" varchar(10), "closed_at_ms" integer, "final_rooted" integer, "final_lost" integer, "close_note" text, "created_at_ms" integer NOT NULL, "created_by_user_id" integer, "created_by_name" varchar(80) NOT NULL, "updated_at_ms" integer NOT NULL, CONSTRAINT "FK_c48b3f864f59a038ec9d9efcb44" FOREIGN KEY ("bench_id") REFERENCES "bench" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`);
    await queryRunner.query(`CREATE INDEX "idx_batch_bench_closed" ON "batch" ("bench_id", "closed_at_ms") `);
    await queryRunner.query(`CREATE INDEX "idx_batch_stuck_on" ON "batch" ("stuck_on") `);
    await queryRunner.query(`CREATE TABLE "batch_placement" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "batch_id" integer NOT NULL, "bench_id" integer NOT NULL, "from_ms" integer NOT NULL, "to_ms" integer, "note" varchar(500), "moved_by_user_id" integer, "moved_by_name" varchar(80), CONSTRAINT "FK_6bc7107f24e52d499ddf58a4463" FOREIGN KEY ("batch_id") REFERENCES "batch" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_e475fddc1b324ed156bad08ccab" FOREIGN KEY ("bench_id") REFERENCES "bench" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`);
    await queryRunner.query(`CREATE INDEX "idx_batch_placement_batch" ON "batch_placement" ("batch_id", "from_ms") `);
    await queryRunner.query(`CREATE INDEX "idx_batch_placement_bench" ON "batch_placement" ("bench_id", "from_ms") `);
    await queryRunner.query(`CREATE TABLE "observation" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "client_id" varchar(36) NOT NULL, "batch_id" integer NOT NULL, "round_id" integer, "observed_on" varchar(10) NOT NULL, "stage" varchar(16) NOT NULL, "rooted_count" integer, "lost_count" integer, "flags" varchar(120) NOT NULL DEFAULT (''), "note" text, "recorded_at_ms" integer NOT NULL, "recorded_by_user_id" integer, "recorded_by_name" varchar(80) NOT NULL, "updated_at_ms" integer NOT NULL, CONSTRAINT "UQ_92b4e8995aad39006b2f8a82e63" UNIQUE ("client_id"), CONSTRAINT "FK_1ee963cc266c799f010ad511650" FOREIGN KEY ("batch_id") REFERENCES "batch" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`);
    await queryRunner.query(`CREATE INDEX "idx_observation_batch_date" ON "observation" ("batch_id", "observed_on") `);
    await queryRunner.query(`CREATE INDEX "idx_observation_round" ON "observation" ("round_id") `);
    await queryRunner.query(`CREATE INDEX "idx_observation_recorded" ON "observation" ("recorded_at_ms") `);
    await queryRunner.query(`CREATE TABLE "observation_photo" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "observation_id" integer NOT NULL, "file_name" varchar(64) NOT NULL, "thumbnail_file_name" varchar(64) NOT NULL, "width" integer NOT NULL, "height" integer NOT NULL, "bytes" integer NOT NULL, "thumbnail_width" integer NOT NULL, "thumbnail_height" integer NOT NULL, "sha256" varchar(64) NOT NULL, "uploaded_at_ms" integer NOT NULL, "uploaded_by_user_id" integer, "uploaded_by_name" varchar(80) NOT NULL, CONSTRAINT "FK_dd82d9e3328b0c322fde8d05a63" FOREIGN KEY ("observation_id") REFERENCES "observation" ("id") ON DELETE CASCADE ON UPDATE NO ACTION)`);
    await queryRunner.query(`CREATE UNIQUE INDEX "idx_observation_photo_sha" ON "observation_photo" ("observation_id", "sha256") `);
    await queryRunner.query(`CREATE TABLE "walk_round" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "site_id" integer NOT NULL, "zone_id" integer, "scope_key" varchar(32) NOT NULL, "status" varchar(16) NOT NULL, "started_at_ms" integer NOT NULL, "started_by_user_id" integer, "started_by_name" varchar(80) NOT NULL, "finished_at_ms" integer, "finished_by_user_id" integer, "finished_by_name" varchar(80), "summary" text)`);
    // At most one round in progress per scope (a zone, or a whole site).
    await queryRunner.query(`CREATE UNIQUE INDEX "idx_walk_round_in_progress" ON "walk_round" ("scope_key") WHERE status = 'in-progress'`);
    await queryRunner.query(`CREATE INDEX "idx_walk_round_started" ON "walk_round" ("site_id", "started_at_ms") `);
    await queryRunner.query(`CREATE TABLE "walk_round_bench" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "round_id" integer NOT NULL, "bench_id" integer NOT NULL, "checked_at_ms" integer NOT NULL, "checked_by_user_id" integer, "checked_by_name" varchar(80) NOT NULL, "note" varchar(1000), "card" text NOT NULL, CONSTRAINT "FK_aaa05cd7f0e0f8981c3f4fee6bb" FOREIGN KEY ("round_id") REFERENCES "walk_round" ("id") ON DELETE CASCADE ON UPDATE NO ACTION, CONSTRAINT "FK_0dcd7c87be945f55b9da97d71c9" FOREIGN KEY ("bench_id") REFERENCES "bench" ("id") ON DELETE RESTRICT ON UPDATE NO ACTION)`);
    await queryRunner.query(`CREATE UNIQUE INDEX "idx_walk_round_bench_unique" ON "walk_round_bench" ("round_id", "bench_id") `);
    await queryRunner.query(`CREATE INDEX "idx_walk_round_bench_bench" ON "walk_round_bench" ("bench_id", "checked_at_ms") `);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX "idx_walk_round_bench_bench"`);
    await queryRunner.query(`DROP INDEX "idx_walk_round_bench_unique"`);
    await queryRunner.query(`DROP TABLE "walk_round_bench"`);
    await queryRunner.query(`DROP INDEX "idx_walk_round_started"`);
    await queryRunner.query(`DROP INDEX "idx_walk_round_in_progress"`);
    await queryRunner.query(`DROP TABLE "walk_round"`);
    await queryRunner.query(`DROP INDEX "idx_observation_photo_sha"`);
    await queryRunner.query(`DROP TABLE "observation_photo"`);
    await queryRunner.query(`DROP INDEX "idx_observation_recorded"`);
    await queryRunner.query(`DROP INDEX "idx_observation_round"`);
    await queryRunner.query(`DROP INDEX "idx_observation_batch_date"`);
    await queryRunner.query(`DROP TABLE "observation"`);
    await queryRunner.query(`DROP INDEX "idx_batch_placement_bench"`);
    await queryRunner.query(`DROP INDEX "idx_batch_placement_batch"`);
    await queryRunner.query(`DROP TABLE "batch_placement"`);
    await queryRunner.query(`DROP INDEX "idx_batch_stuck_on"`);
    await queryRunner.query(`DROP INDEX "idx_batch_bench_closed"`);
    await queryRunner.query(`DROP TABLE "batch"`);
  }
}
