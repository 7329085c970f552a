import type { MigrationInterface, QueryRunner } from "typeorm";

/** Alerts with their evaluation state and notices, the duty rota, and the e-mail outbox. */
export class AlertsAndOutbox1796173343319 implements MigrationInterface {
    name = 'AlertsAndOutbox1796173343319'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "alert" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "bench_id" integer NOT NULL, "zone_id" integer NOT NULL, "kind" varchar(24) NOT NULL, "quantity" varchar(32), "direction" varchar(8), "sensor_id" varchar(64), "phase" varchar(16) NOT NULL, "since_ms" integer NOT NULL, "raised_at_ms" integer, "acknowledged_at_ms" integer, "acknowledged_by_user_id" integer, "acknowledged_by_name" varchar(80), "acknowledge_note" varchar(500), "cleared_at_ms" integer, "worst_value" real, "last_value" real, "last_notified_ms" integer, "escalated_at_ms" integer, "updated_at_ms" integer NOT NULL)`);
        await queryRunner.query(`CREATE INDEX "idx_alert_phase" ON "alert" ("phase") `);
        await queryRunner.query(`CREATE INDEX "idx_alert_bench_since" ON "alert" ("bench_id", "since_ms") `);
        await queryRunner.query(`CREATE TABLE "alert_tracker" ("key" varchar(120) PRIMARY KEY NOT NULL, "alert_id" integer, "state" text NOT NULL)`);
        await queryRunner.query(`CREATE TABLE "alert_notice" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "alert_id" integer NOT NULL, "zone_id" integer NOT NULL, "type" varchar(16) NOT NULL, "created_at_ms" integer NOT NULL, "queued_at_ms" integer)`);
        await queryRunner.query(`CREATE INDEX "idx_alert_notice_waiting" ON "alert_notice" ("queued_at_ms", "zone_id") `);
        await queryRunner.query(`CREATE TABLE "duty_shift" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "zone_id" integer, "user_id" integer NOT NULL, "weekdays" integer NOT NULL, "start_minute" integer NOT NULL, "end_minute" integer NOT NULL, "is_fallback" boolean NOT NULL DEFAULT (0))`);
        await queryRunner.query(`CREATE TABLE "outbox" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "message_id" varchar(200) NOT NULL, "to_address" varchar(254) NOT NULL, "subject" varchar(300) NOT NULL, "text" text NOT NULL, "html" text, "created_at_ms" integer NOT NULL, "attempts" integer NOT NULL DEFAULT (0), "next_attempt_ms" integer NOT NULL, "sent_at_ms" integer, "last_error" varchar(500), CONSTRAINT "UQ_2f36ee5236f2793f3e7bd554589" UNIQUE ("message_id"))`);
        await queryRunner.query(`CREATE INDEX "idx_outbox_due" ON "outbox" ("sent_at_ms", "next_attempt_ms") `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`DROP INDEX "idx_outbox_due"`);
        await queryRunner.query(`DROP TABLE "outbox"`);
        await queryRunner.query(`DROP TABLE "duty_shift"`);
        await queryRunner.query(`DROP INDEX "idx_alert_notice_waiting"`);
        await queryRunner.query(`DROP TABLE "alert_notice"`);
        await queryRunner.query(`DROP TABLE "alert_tracker"`);
        await queryRunner.query(`DROP INDEX "idx_alert_bench_since"`);
        await queryRunner.query(`DROP INDEX "idx_alert_phase"`);
        await queryRunner.query(`DROP TABLE "alert"`);
    }

}
