import type { MigrationInterface, QueryRunner } from "typeorm";

/** Issue 11: the lease that lets exactly one server instance run the alert engine and the outbox. */
export class PostgresLeaderLease1796330000000 implements MigrationInterface {
  name = "PostgresLeaderLease1796330000000";

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "leader_lease" ("name" character varying(160) NOT NULL, "holder" character varying(200) NOT NULL, "expires_at_ms" bigint NOT NULL, "term" integer NOT NULL, CONSTRAINT "PK_leader_lease" PRIMARY KEY ("name"))`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE "leader_lease"`);
  }
}
