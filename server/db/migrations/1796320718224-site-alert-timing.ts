import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Each site's alert timing, set by a manager on the duty rota page: how long a raised alert may go
 * unacknowledged before the managers are mailed, and how often the person on duty is reminded
 * (seconds). Null, as every existing site starts, is the server's default (ALERT_ESCALATE_AFTER,
 * ALERT_RENOTIFY_EVERY).
 */
export class SiteAlertTiming1796320718224 implements MigrationInterface {
  name = "SiteAlertTiming1796320718224";

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "site" ADD COLUMN "escalate_after_s" integer`);
    await queryRunner.query(`ALTER TABLE "site" ADD COLUMN "renotify_every_s" integer`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "site" DROP COLUMN "renotify_every_s"`);
    await queryRunner.query(`ALTER TABLE "site" DROP COLUMN "escalate_after_s"`);
  }
}
