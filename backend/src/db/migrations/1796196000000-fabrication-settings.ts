// Each builder's fabrication settings, kept once and used by every sheet: bender dies with their
// springback calibration, the trim allowance per end, the stock stick length and the saw's kerf. One
// jsonb document per user, validated by contracts/fabrication.ts before it is written.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class FabricationSettings1796196000000 implements MigrationInterface {
  name = 'FabricationSettings1796196000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "fabrication_settings" ("user_id" uuid NOT NULL REFERENCES "users"("id") ON DELETE CASCADE, "settings" jsonb NOT NULL, "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_fabrication_settings" PRIMARY KEY ("user_id"))`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE "fabrication_settings"`);
  }
}
