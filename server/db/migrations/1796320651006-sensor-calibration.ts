import type { MigrationInterface, QueryRunner } from "typeorm";

/** Each sensor's calibration (offset and gain per quantity), as JSON in stored units. */
export class SensorCalibration1796320651006 implements MigrationInterface {
  name = "SensorCalibration1796320651006";

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "sensor" ADD COLUMN "calibration" text NOT NULL DEFAULT ('{}')`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "sensor" DROP COLUMN "calibration"`);
  }
}
