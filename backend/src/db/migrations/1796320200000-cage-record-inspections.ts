// Track inspections on cage records (issue 13, section 3): who, when, seal number and wall readings,
// several per record; and the mark the expiry reminder sets so a builder is mailed once. Generated
// from the entities with TypeORM's schema builder (no drift).
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class CageRecordInspections1796320200000 implements MigrationInterface {
    name = 'CageRecordInspections1796320200000';

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            CREATE TABLE "cage_record_inspections" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "record_id" uuid NOT NULL,
                "steward_id" uuid,
                "inspected_at" TIMESTAMP WITH TIME ZONE NOT NULL,
                "seal_number" character varying(40) NOT NULL,
                "readings" jsonb NOT NULL DEFAULT '[]',
                "note" text,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "PK_f8274636573db0955106ec58771" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_cage_record_inspections_record" ON "cage_record_inspections" ("record_id", "inspected_at")
        `);
        await queryRunner.query(`
            ALTER TABLE "cage_records"
            ADD "expiry_reminded_at" TIMESTAMP WITH TIME ZONE
        `);
        await queryRunner.query(`
            ALTER TABLE "cage_record_inspections"
            ADD CONSTRAINT "FK_a4ea636c87130965f169c5e1cb5" FOREIGN KEY ("record_id") REFERENCES "cage_records"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "cage_record_inspections"
            ADD CONSTRAINT "FK_2da80c85838b76dd6e1c4bd4cd8" FOREIGN KEY ("steward_id") REFERENCES "users"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            ALTER TABLE "cage_record_inspections" DROP CONSTRAINT "FK_2da80c85838b76dd6e1c4bd4cd8"
        `);
        await queryRunner.query(`
            ALTER TABLE "cage_record_inspections" DROP CONSTRAINT "FK_a4ea636c87130965f169c5e1cb5"
        `);
        await queryRunner.query(`
            ALTER TABLE "cage_records" DROP COLUMN "expiry_reminded_at"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_cage_record_inspections_record"
        `);
        await queryRunner.query(`
            DROP TABLE "cage_record_inspections"
        `);
    }

}
