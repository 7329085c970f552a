import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * The whole schema on PostgreSQL, generated from the same entities as the SQLite migrations up to
 * 1796320718224-site-alert-timing (epoch-millisecond columns as bigint, reals as double precision:
 * data-source.ts), plus the trigger that marks rollup hours stale when readings are re-filed to
 * another bench, as on SQLite. Later schema changes get a migration in each set.
 */
export class PostgresBaseline1796329492887 implements MigrationInterface {
  name = "PostgresBaseline1796329492887";

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "app_meta" ("key" character varying(64) NOT NULL, "value" text NOT NULL, CONSTRAINT "PK_2517812d17c14a0ecd40dd79d63" PRIMARY KEY ("key"))`);
    await queryRunner.query(`CREATE TABLE "site" ("id" SERIAL NOT NULL, "name" character varying(120) NOT NULL, "time_zone" character varying(64) NOT NULL DEFAULT 'UTC', "created_at_ms" bigint NOT NULL, "archived_at_ms" bigint, "escalate_after_s" integer, "renotify_every_s" integer, CONSTRAINT "PK_635c0eeabda8862d5b0237b42b4" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "zone" ("id" SERIAL NOT NULL, "site_id" integer NOT NULL, "name" character varying(120) NOT NULL, "position" integer NOT NULL DEFAULT '0', "archived_at_ms" bigint, "dew_point_margin_c" double precision NOT NULL DEFAULT '2', CONSTRAINT "PK_bd3989e5a3c3fb5ed546dfaf832" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "bench" ("id" SERIAL NOT NULL, "zone_id" integer NOT NULL, "name" character varying(120) NOT NULL, "position" integer NOT NULL DEFAULT '0', "archived_at_ms" bigint, "dew_point_margin_c" double precision, CONSTRAINT "PK_d85f5b7330f3df907380f748fd9" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "sensor" ("id" character varying(64) NOT NULL, "kind" character varying(16) NOT NULL, "secret_hash" character varying(64) NOT NULL, "bench_id" integer, "disabled_at_ms" bigint, "created_at_ms" bigint NOT NULL, "calibration" text NOT NULL DEFAULT '{}', CONSTRAINT "PK_ccc38b9aa8b3e198b6503d5eee9" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "zone_window" ("zone_id" integer NOT NULL, "quantity" character varying(32) NOT NULL, "min_value" double precision NOT NULL, "max_value" double precision NOT NULL, "delay_s" integer NOT NULL, "hysteresis" double precision NOT NULL, CONSTRAINT "PK_654cc2c28f43d0ff1248cb560eb" PRIMARY KEY ("zone_id", "quantity"))`);
    await queryRunner.query(`CREATE TABLE "bench_window" ("bench_id" integer NOT NULL, "quantity" character varying(32) NOT NULL, "min_value" double precision NOT NULL, "max_value" double precision NOT NULL, "delay_s" integer NOT NULL, "hysteresis" double precision NOT NULL, CONSTRAINT "PK_8d8c2afacb0d6862a9e063e281c" PRIMARY KEY ("bench_id", "quantity"))`);
    await queryRunner.query(`CREATE TABLE "reading" ("sensor_id" character varying(64) NOT NULL, "quantity" character varying(32) NOT NULL, "time_ms" bigint NOT NULL, "value" double precision NOT NULL, "bench_id" integer, CONSTRAINT "PK_9ef0978587b75c86c27a7993353" PRIMARY KEY ("sensor_id", "quantity", "time_ms"))`);
    await queryRunner.query(`CREATE INDEX "idx_reading_bench_quantity_time" ON "reading"  ("bench_id", "quantity", "time_ms") `);
    await queryRunner.query(`CREATE TABLE "latest_reading" ("sensor_id" character varying(64) NOT NULL, "quantity" character varying(32) NOT NULL, "time_ms" bigint NOT NULL, "value" double precision NOT NULL, "bench_id" integer, CONSTRAINT "PK_4422252aff4524f6563da13bd8e" PRIMARY KEY ("sensor_id", "quantity"))`);
    await queryRunner.query(`CREATE INDEX "idx_latest_reading_bench" ON "latest_reading"  ("bench_id") `);
    await queryRunner.query(`CREATE TABLE "user" ("id" SERIAL NOT NULL, "name" character varying(80) NOT NULL, "email" character varying(254) NOT NULL, "role" character varying(16) NOT NULL, "temperature_unit" character varying(1) NOT NULL DEFAULT 'F', "disabled" boolean NOT NULL DEFAULT false, "password_hash" character varying(100), "password_version" integer NOT NULL DEFAULT '0', "created_at_ms" bigint NOT NULL, "last_sign_in_ms" bigint, CONSTRAINT "UQ_e12875dfb3b1d92d7d7c5377e22" UNIQUE ("email"), CONSTRAINT "PK_cace4a159ff9f2512dd42373760" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "sign_in_failure" ("key" character varying(300) NOT NULL, "window_start_ms" bigint NOT NULL, "failures" integer NOT NULL, CONSTRAINT "PK_a75120052a7a4ce2ec7152681d2" PRIMARY KEY ("key"))`);
    await queryRunner.query(`CREATE TABLE "caught_mail" ("id" SERIAL NOT NULL, "received_at_ms" bigint NOT NULL, "from_address" character varying(320) NOT NULL, "to_addresses" text NOT NULL, "subject" character varying(500) NOT NULL, "text" text NOT NULL, "raw" text NOT NULL, CONSTRAINT "PK_34e75a576d5230ae1850e33e0bd" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "alert" ("id" SERIAL NOT NULL, "bench_id" integer NOT NULL, "zone_id" integer NOT NULL, "kind" character varying(24) NOT NULL, "quantity" character varying(32), "direction" character varying(8), "sensor_id" character varying(64), "phase" character varying(16) NOT NULL, "since_ms" bigint NOT NULL, "raised_at_ms" bigint, "acknowledged_at_ms" bigint, "acknowledged_by_user_id" integer, "acknowledged_by_name" character varying(80), "acknowledge_note" character varying(500), "cleared_at_ms" bigint, "worst_value" double precision, "last_value" double precision, "last_notified_ms" bigint, "escalated_at_ms" bigint, "updated_at_ms" bigint NOT NULL, CONSTRAINT "PK_ad91cad659a3536465d564a4b2f" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "idx_alert_phase" ON "alert"  ("phase") `);
    await queryRunner.query(`CREATE INDEX "idx_alert_bench_since" ON "alert"  ("bench_id", "since_ms") `);
    await queryRunner.query(`CREATE TABLE "alert_tracker" ("key" character varying(120) NOT NULL, "alert_id" integer, "state" text NOT NULL, CONSTRAINT "PK_2961fd8aafbe01c13f3757aeed0" PRIMARY KEY ("key"))`);
    await queryRunner.query(`CREATE TABLE "alert_notice" ("id" SERIAL NOT NULL, "alert_id" integer NOT NULL, "zone_id" integer NOT NULL, "type" character varying(16) NOT NULL, "created_at_ms" bigint NOT NULL, "queued_at_ms" bigint, CONSTRAINT "PK_ec5d03a9ab044a0012fa51f1040" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "idx_alert_notice_waiting" ON "alert_notice"  ("queued_at_ms", "zone_id") `);
    await queryRunner.query(`CREATE TABLE "duty_shift" ("id" SERIAL NOT NULL, "zone_id" integer, "user_id" integer NOT NULL, "weekdays" integer NOT NULL, "start_minute" integer NOT NULL, "end_minute" integer NOT NULL, "is_fallback" boolean NOT NULL DEFAULT false, CONSTRAINT "PK_2b04e4cb539c6b5d3e195c4bf8c" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "outbox" ("id" SERIAL NOT NULL, "message_id" character varying(200) NOT NULL, "to_address" character varying(254) NOT NULL, "subject" character varying(300) NOT NULL, "text" text NOT NULL, "html" text, "created_at_ms" bigint NOT NULL, "attempts" integer NOT NULL DEFAULT '0', "next_attempt_ms" bigint NOT NULL, "sent_at_ms" bigint, "last_error" character varying(500), CONSTRAINT "UQ_2f36ee5236f2793f3e7bd554589" UNIQUE ("message_id"), CONSTRAINT "PK_340ab539f309f03bdaa14aa7649" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "idx_outbox_due" ON "outbox"  ("sent_at_ms", "next_attempt_ms") `);
    await queryRunner.query(`CREATE TABLE "sensor_assignment" ("id" SERIAL NOT NULL, "sensor_id" character varying(64) NOT NULL, "bench_id" integer NOT NULL, "from_ms" bigint NOT NULL, "to_ms" bigint, CONSTRAINT "PK_1e917ac3d8b638eed49f8752435" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "idx_sensor_assignment_sensor" ON "sensor_assignment"  ("sensor_id", "from_ms") `);
    await queryRunner.query(`CREATE INDEX "idx_sensor_assignment_bench" ON "sensor_assignment"  ("bench_id", "from_ms") `);
    await queryRunner.query(`CREATE TABLE "audit_entry" ("id" SERIAL NOT NULL, "at_ms" bigint NOT NULL, "actor_user_id" integer, "actor_name" character varying(80) NOT NULL, "actor_role" character varying(16), "entity_type" character varying(32) NOT NULL, "entity_id" character varying(64) NOT NULL, "action" character varying(32) NOT NULL, "subject" character varying(300) NOT NULL, "site_id" integer, "zone_id" integer, "previous_zone_id" integer, "bench_id" integer, "changes" text NOT NULL, "note" text, CONSTRAINT "PK_58a130a4b9da189f46ba2a01801" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "idx_audit_entry_zone" ON "audit_entry"  ("zone_id", "id") `);
    await queryRunner.query(`CREATE INDEX "idx_audit_entry_previous_zone" ON "audit_entry"  ("previous_zone_id", "id") `);
    await queryRunner.query(`CREATE INDEX "idx_audit_entry_bench" ON "audit_entry"  ("bench_id", "id") `);
    await queryRunner.query(`CREATE TABLE "window_preset" ("id" SERIAL NOT NULL, "name" character varying(80) NOT NULL, "description" character varying(500) NOT NULL DEFAULT '', "windows" text NOT NULL, "dew_point_margin_c" double precision NOT NULL, "created_at_ms" bigint NOT NULL, "updated_at_ms" bigint NOT NULL, CONSTRAINT "PK_e4021d5b4d332f2de26acebafc0" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "batch" ("id" SERIAL NOT NULL, "variety" character varying(120) NOT NULL, "wood_source" character varying(200), "stuck_on" character varying(10) NOT NULL, "count_stuck" integer NOT NULL, "thickness_mm" double precision, "buds_above_medium" integer, "base_treatments" character varying(64) NOT NULL DEFAULT '', "hormone_product" character varying(200), "wrapping" character varying(16), "notes" text, "bench_id" integer NOT NULL, "outcome" character varying(16), "closed_on" character varying(10), "closed_at_ms" bigint, "final_rooted" integer, "final_lost" integer, "close_note" text, "created_at_ms" bigint NOT NULL, "created_by_user_id" integer, "created_by_name" character varying(80) NOT NULL, "updated_at_ms" bigint NOT NULL, CONSTRAINT "PK_57da3b830b57bec1fd329dcaf43" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "idx_batch_bench_closed" ON "batch"  ("bench_id", "closed_at_ms") `);
    await queryRunner.query(`CREATE INDEX "idx_batch_stuck_on" ON "batch"  ("stuck_on") `);
    await queryRunner.query(`CREATE TABLE "batch_placement" ("id" SERIAL NOT NULL, "batch_id" integer NOT NULL, "bench_id" integer NOT NULL, "from_ms" bigint NOT NULL, "to_ms" bigint, "note" character varying(500), "moved_by_user_id" integer, "moved_by_name" character varying(80), CONSTRAINT "PK_c54fbf8b5d78608430d679029d1" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "idx_batch_placement_batch" ON "batch_placement"  ("batch_id", "from_ms") `);
    await queryRunner.query(`CREATE INDEX "idx_batch_placement_bench" ON "batch_placement"  ("bench_id", "from_ms") `);
    await queryRunner.query(`CREATE TABLE "observation" ("id" SERIAL NOT NULL, "client_id" character varying(36) NOT NULL, "batch_id" integer NOT NULL, "round_id" integer, "observed_on" character varying(10) NOT NULL, "stage" character varying(16) NOT NULL, "rooted_count" integer, "lost_count" integer, "flags" character varying(120) NOT NULL DEFAULT '', "note" text, "recorded_at_ms" bigint NOT NULL, "recorded_by_user_id" integer, "recorded_by_name" character varying(80) NOT NULL, "updated_at_ms" bigint NOT NULL, CONSTRAINT "UQ_92b4e8995aad39006b2f8a82e63" UNIQUE ("client_id"), CONSTRAINT "PK_77a736edc631a400b788ce302cb" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "idx_observation_batch_date" ON "observation"  ("batch_id", "observed_on") `);
    await queryRunner.query(`CREATE INDEX "idx_observation_round" ON "observation"  ("round_id") `);
    await queryRunner.query(`CREATE INDEX "idx_observation_recorded" ON "observation"  ("recorded_at_ms") `);
    await queryRunner.query(`CREATE TABLE "observation_photo" ("id" SERIAL NOT NULL, "observation_id" integer NOT NULL, "file_name" character varying(64) NOT NULL, "thumbnail_file_name" character varying(64) NOT NULL, "width" integer NOT NULL, "height" integer NOT NULL, "bytes" integer NOT NULL, "thumbnail_width" integer NOT NULL, "thumbnail_height" integer NOT NULL, "sha256" character varying(64) NOT NULL, "uploaded_at_ms" bigint NOT NULL, "uploaded_by_user_id" integer, "uploaded_by_name" character varying(80) NOT NULL, CONSTRAINT "PK_60d0abb72154f984166f69a3010" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE UNIQUE INDEX "idx_observation_photo_sha" ON "observation_photo"  ("observation_id", "sha256") `);
    await queryRunner.query(`CREATE TABLE "walk_round" ("id" SERIAL NOT NULL, "site_id" integer NOT NULL, "zone_id" integer, "scope_key" character varying(32) NOT NULL, "status" character varying(16) NOT NULL, "started_at_ms" bigint NOT NULL, "started_by_user_id" integer, "started_by_name" character varying(80) NOT NULL, "finished_at_ms" bigint, "finished_by_user_id" integer, "finished_by_name" character varying(80), "summary" text, CONSTRAINT "PK_6fca7beab27bcafbe2f4f168127" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE UNIQUE INDEX "idx_walk_round_in_progress" ON "walk_round"  ("scope_key") WHERE status = 'in-progress'`);
    await queryRunner.query(`CREATE INDEX "idx_walk_round_started" ON "walk_round"  ("site_id", "started_at_ms") `);
    await queryRunner.query(`CREATE TABLE "walk_round_bench" ("id" SERIAL NOT NULL, "round_id" integer NOT NULL, "bench_id" integer NOT NULL, "checked_at_ms" bigint NOT NULL, "checked_by_user_id" integer, "checked_by_name" character varying(80) NOT NULL, "note" character varying(1000), "card" text NOT NULL, CONSTRAINT "PK_8c35ceeb6c0d0b5b39bb5725015" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE UNIQUE INDEX "idx_walk_round_bench_unique" ON "walk_round_bench"  ("round_id", "bench_id") `);
    await queryRunner.query(`CREATE INDEX "idx_walk_round_bench_bench" ON "walk_round_bench"  ("bench_id", "checked_at_ms") `);
    await queryRunner.query(`CREATE TABLE "reading_rollup" ("bench_id" integer NOT NULL, "quantity" character varying(32) NOT NULL, "resolution_ms" bigint NOT NULL, "start_ms" bigint NOT NULL, "min" double precision NOT NULL, "max" double precision NOT NULL, "sum" double precision NOT NULL, "count" integer NOT NULL, CONSTRAINT "PK_e7e9be36ce0d3b145d5cc763837" PRIMARY KEY ("bench_id", "quantity", "resolution_ms", "start_ms"))`);
    await queryRunner.query(`CREATE TABLE "reading_rollup_stale" ("bench_id" integer NOT NULL, "quantity" character varying(32) NOT NULL, "hour_ms" bigint NOT NULL, CONSTRAINT "PK_05926c3f942e142354a76d1460a" PRIMARY KEY ("bench_id", "quantity", "hour_ms"))`);
    await queryRunner.query(`ALTER TABLE "zone" ADD CONSTRAINT "FK_62b778e7f9ae03e6b9dfd05b157" FOREIGN KEY ("site_id") REFERENCES "site"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "bench" ADD CONSTRAINT "FK_470e0d64eaf09d67975f4c29de0" FOREIGN KEY ("zone_id") REFERENCES "zone"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "sensor" ADD CONSTRAINT "FK_c519d1c155ada34ef92bdae9188" FOREIGN KEY ("bench_id") REFERENCES "bench"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "zone_window" ADD CONSTRAINT "FK_1d00c413ba7895e96cdbe73e621" FOREIGN KEY ("zone_id") REFERENCES "zone"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "bench_window" ADD CONSTRAINT "FK_1fd7279b5d795d036c1e24c35a0" FOREIGN KEY ("bench_id") REFERENCES "bench"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "sensor_assignment" ADD CONSTRAINT "FK_da7d8f669387b6aa1ab53d034b9" FOREIGN KEY ("sensor_id") REFERENCES "sensor"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "sensor_assignment" ADD CONSTRAINT "FK_60ec3b78ddd13e83d1714bcb7c5" FOREIGN KEY ("bench_id") REFERENCES "bench"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "batch" ADD CONSTRAINT "FK_c48b3f864f59a038ec9d9efcb44" FOREIGN KEY ("bench_id") REFERENCES "bench"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "batch_placement" ADD CONSTRAINT "FK_6bc7107f24e52d499ddf58a4463" FOREIGN KEY ("batch_id") REFERENCES "batch"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "batch_placement" ADD CONSTRAINT "FK_e475fddc1b324ed156bad08ccab" FOREIGN KEY ("bench_id") REFERENCES "bench"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "observation" ADD CONSTRAINT "FK_1ee963cc266c799f010ad511650" FOREIGN KEY ("batch_id") REFERENCES "batch"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "observation_photo" ADD CONSTRAINT "FK_dd82d9e3328b0c322fde8d05a63" FOREIGN KEY ("observation_id") REFERENCES "observation"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "walk_round_bench" ADD CONSTRAINT "FK_aaa05cd7f0e0f8981c3f4fee6bb" FOREIGN KEY ("round_id") REFERENCES "walk_round"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "walk_round_bench" ADD CONSTRAINT "FK_0dcd7c87be945f55b9da97d71c9" FOREIGN KEY ("bench_id") REFERENCES "bench"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`CREATE FUNCTION "reading_rollup_refile"() RETURNS trigger LANGUAGE plpgsql AS $$
          BEGIN
      IF OLD."bench_id" IS NOT NULL THEN
              INSERT INTO "reading_rollup_stale" ("bench_id", "quantity", "hour_ms") VALUES (OLD."bench_id", OLD."quantity", (OLD."time_ms" / 3600000) * 3600000) ON CONFLICT DO NOTHING;
      END IF;
      IF NEW."bench_id" IS NOT NULL THEN
              INSERT INTO "reading_rollup_stale" ("bench_id", "quantity", "hour_ms") VALUES (NEW."bench_id", NEW."quantity", (NEW."time_ms" / 3600000) * 3600000) ON CONFLICT DO NOTHING;
      END IF;
      RETURN NULL;
          END $$`);
    await queryRunner.query(`CREATE TRIGGER "reading_rollup_refile" AFTER UPDATE OF "bench_id" ON "reading" FOR EACH ROW WHEN (OLD."bench_id" IS DISTINCT FROM NEW."bench_id") EXECUTE FUNCTION "reading_rollup_refile"()`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TRIGGER "reading_rollup_refile" ON "reading"`);
    await queryRunner.query(`DROP FUNCTION "reading_rollup_refile"()`);
    await queryRunner.query(`ALTER TABLE "walk_round_bench" DROP CONSTRAINT "FK_0dcd7c87be945f55b9da97d71c9"`);
    await queryRunner.query(`ALTER TABLE "walk_round_bench" DROP CONSTRAINT "FK_aaa05cd7f0e0f8981c3f4fee6bb"`);
    await queryRunner.query(`ALTER TABLE "observation_photo" DROP CONSTRAINT "FK_dd82d9e3328b0c322fde8d05a63"`);
    await queryRunner.query(`ALTER TABLE "observation" DROP CONSTRAINT "FK_1ee963cc266c799f010ad511650"`);
    await queryRunner.query(`ALTER TABLE "batch_placement" DROP CONSTRAINT "FK_e475fddc1b324ed156bad08ccab"`);
    await queryRunner.query(`ALTER TABLE "batch_placement" DROP CONSTRAINT "FK_6bc7107f24e52d499ddf58a4463"`);
    await queryRunner.query(`ALTER TABLE "batch" DROP CONSTRAINT "FK_c48b3f864f59a038ec9d9efcb44"`);
    await queryRunner.query(`ALTER TABLE "sensor_assignment" DROP CONSTRAINT "FK_60ec3b78ddd13e83d1714bcb7c5"`);
    await queryRunner.query(`ALTER TABLE "sensor_assignment" DROP CONSTRAINT "FK_da7d8f669387b6aa1ab53d034b9"`);
    await queryRunner.query(`ALTER TABLE "bench_window" DROP CONSTRAINT "FK_1fd7279b5d795d036c1e24c35a0"`);
    await queryRunner.query(`ALTER TABLE "zone_window" DROP CONSTRAINT "FK_1d00c413ba7895e96cdbe73e621"`);
    await queryRunner.query(`ALTER TABLE "sensor" DROP CONSTRAINT "FK_c519d1c155ada34ef92bdae9188"`);
    await queryRunner.query(`ALTER TABLE "bench" DROP CONSTRAINT "FK_470e0d64eaf09d67975f4c29de0"`);
    await queryRunner.query(`ALTER TABLE "zone" DROP CONSTRAINT "FK_62b778e7f9ae03e6b9dfd05b157"`);
    await queryRunner.query(`DROP TABLE "reading_rollup_stale"`);
    await queryRunner.query(`DROP TABLE "reading_rollup"`);
    await queryRunner.query(`DROP INDEX "public"."idx_walk_round_bench_bench"`);
    await queryRunner.query(`DROP INDEX "public"."idx_walk_round_bench_unique"`);
    await queryRunner.query(`DROP TABLE "walk_round_bench"`);
    await queryRunner.query(`DROP INDEX "public"."idx_walk_round_started"`);
    await queryRunner.query(`DROP INDEX "public"."idx_walk_round_in_progress"`);
    await queryRunner.query(`DROP TABLE "walk_round"`);
    await queryRunner.query(`DROP INDEX "public"."idx_observation_photo_sha"`);
    await queryRunner.query(`DROP TABLE "observation_photo"`);
    await queryRunner.query(`DROP INDEX "public"."idx_observation_recorded"`);
    await queryRunner.query(`DROP INDEX "public"."idx_observation_round"`);
    await queryRunner.query(`DROP INDEX "public"."idx_observation_batch_date"`);
    await queryRunner.query(`DROP TABLE "observation"`);
    await queryRunner.query(`DROP INDEX "public"."idx_batch_placement_bench"`);
    await queryRunner.query(`DROP INDEX "public"."idx_batch_placement_batch"`);
    await queryRunner.query(`DROP TABLE "batch_placement"`);
    await queryRunner.query(`DROP INDEX "public"."idx_batch_stuck_on"`);
    await queryRunner.query(`DROP INDEX "public"."idx_batch_bench_closed"`);
    await queryRunner.query(`DROP TABLE "batch"`);
    await queryRunner.query(`DROP TABLE "window_preset"`);
    await queryRunner.query(`DROP INDEX "public"."idx_audit_entry_bench"`);
    await queryRunner.query(`DROP INDEX "public"."idx_audit_entry_previous_zone"`);
    await queryRunner.query(`DROP INDEX "public"."idx_audit_entry_zone"`);
    await queryRunner.query(`DROP TABLE "audit_entry"`);
    await queryRunner.query(`DROP INDEX "public"."idx_sensor_assignment_bench"`);
    await queryRunner.query(`DROP INDEX "public"."idx_sensor_assignment_sensor"`);
    await queryRunner.query(`DROP TABLE "sensor_assignment"`);
    await queryRunner.query(`DROP INDEX "public"."idx_outbox_due"`);
    await queryRunner.query(`DROP TABLE "outbox"`);
    await queryRunner.query(`DROP TABLE "duty_shift"`);
    await queryRunner.query(`DROP INDEX "public"."idx_alert_notice_waiting"`);
    await queryRunner.query(`DROP TABLE "alert_notice"`);
    await queryRunner.query(`DROP TABLE "alert_tracker"`);
    await queryRunner.query(`DROP INDEX "public"."idx_alert_bench_since"`);
    await queryRunner.query(`DROP INDEX "public"."idx_alert_phase"`);
    await queryRunner.query(`DROP TABLE "alert"`);
    await queryRunner.query(`DROP TABLE "caught_mail"`);
    await queryRunner.query(`DROP TABLE "sign_in_failure"`);
    await queryRunner.query(`DROP TABLE "user"`);
    await queryRunner.query(`DROP INDEX "public"."idx_latest_reading_bench"`);
    await queryRunner.query(`DROP TABLE "latest_reading"`);
    await queryRunner.query(`DROP INDEX "public"."idx_reading_bench_quantity_time"`);
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
