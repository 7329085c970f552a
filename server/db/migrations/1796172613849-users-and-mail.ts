import type { MigrationInterface, QueryRunner } from "typeorm";

/** Users, sign-in throttling, the local mail sink, and a disabled flag on sensors. */
export class UsersAndMail1796172613849 implements MigrationInterface {
    name = 'UsersAndMail1796172613849'

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`CREATE TABLE "user" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "name" varchar(80) NOT NULL, "email" varchar(254) NOT NULL, "role" varchar(16) NOT NULL, "temperature_unit" varchar(1) NOT NULL DEFAULT ('F'), "disabled" boolean NOT NULL DEFAULT (0), "password_hash" varchar(100), "password_version" integer NOT NULL DEFAULT (0), "created_at_ms" integer NOT NULL, "last_sign_in_ms" integer, CONSTRAINT "UQ_e12875dfb3b1d92d7d7c5377e22" UNIQUE ("email"))`);
        await queryRunner.query(`CREATE TABLE "sign_in_failure" ("key" varchar(300) PRIMARY KEY NOT NULL, "window_start_ms" integer NOT NULL, "failures" integer NOT NULL)`);
        await queryRunner.query(`CREATE TABLE "caught_mail" ("id" integer PRIMARY KEY AUTOINCREMENT NOT NULL, "received_at_ms" integer NOT NULL, "from_address" varchar(320) NOT NULL, "to_addresses" text NOT NULL, "subject" varchar(500) NOT NULL, "text" text NOT NULL, "raw" text NOT NULL)`);
        await queryRunner.query(`CREATE TABLE "temporary_sensor" ("id" varchar(64) PRIMARY KEY NOT NULL, "kind" varchar(16) NOT NULL, "secret_hash" varchar(64) NOT NULL, "bench_id" integer, "created_at_ms" integer NOT NULL, "disabled_at_ms" integer, CONSTRAINT "FK_c519d1c155ada34ef92bdae9188" FOREIGN KEY ("bench_id") REFERENCES "bench" ("id") ON DELETE SET NULL ON UPDATE NO ACTION)`);
        await queryRunner.query(`INSERT INTO "temporary_sensor"("id", "kind", "secret_hash", "bench_id", "created_at_ms") SELECT "id", "kind", "secret_hash", "bench_id", "created_at_ms" FROM "sensor"`);
        await queryRunner.query(`DROP TABLE "sensor"`);
        await queryRunner.query(`ALTER TABLE "temporary_sensor" RENAME TO "sensor"`);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`ALTER TABLE "sensor" RENAME TO "temporary_sensor"`);
        await queryRunner.query(`CREATE TABLE "sensor" ("id" varchar(64) PRIMARY KEY NOT NULL, "kind" varchar(16) NOT NULL, "secret_hash" varchar(64) NOT NULL, "bench_id" integer, "created_at_ms" integer NOT NULL, CONSTRAINT "FK_c519d1c155ada34ef92bdae9188" FOREIGN KEY ("bench_id") REFERENCES "bench" ("id") ON DELETE SET NULL ON UPDATE NO ACTION)`);
        await queryRunner.query(`INSERT INTO "sensor"("id", "kind", "secret_hash", "bench_id", "created_at_ms") SELECT "id", "kind", "secret_hash", "bench_id", "created_at_ms" FROM "temporary_sensor"`);
        await queryRunner.query(`DROP TABLE "temporary_sensor"`);
        await queryRunner.query(`DROP TABLE "caught_mail"`);
        await queryRunner.query(`DROP TABLE "sign_in_failure"`);
        await queryRunner.query(`DROP TABLE "user"`);
    }

}
