import type { MigrationInterface, QueryRunner } from "typeorm";

/** Issue 11: the lease that lets exactly one server instance run the alert engine and the outbox. */
export class LeaderLease1796330000000 implements MigrationInterface {
  name = "LeaderLease1796330000000";

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "leader_lease" ("name" varchar(160) PRIMARY KEY NOT NULL, "holder" varchar(200) NOT NULL, "expires_at_ms" integer NOT NULL, "term" integer NOT NULL)`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE "leader_lease"`);
  }
}
