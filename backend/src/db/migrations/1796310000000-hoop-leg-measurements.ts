// A hoop's measured legs for its leg trim (issue 11), per build sheet and member: uncut legs, pad
// heights, lean and top. Generated from the entity with TypeORM's schema builder (no drift).
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class HoopLegMeasurements1796310000000 implements MigrationInterface {
    name = 'HoopLegMeasurements1796310000000';

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            CREATE TABLE "hoop_leg_measurements" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "build_sheet_id" uuid NOT NULL,
                "member_id" character varying(60) NOT NULL,
                "legs" jsonb NOT NULL,
                "lean_deg" double precision NOT NULL,
                "top_height_mm" double precision,
                "updated_by" uuid,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "UQ_hoop_leg_measurements_sheet_member" UNIQUE ("build_sheet_id", "member_id"),
                CONSTRAINT "PK_302519598d29cd7b90ff70439d5" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            ALTER TABLE "hoop_leg_measurements"
            ADD CONSTRAINT "FK_e43058d1405eb0fe433fc54f4fb" FOREIGN KEY ("build_sheet_id") REFERENCES "build_sheets"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "hoop_leg_measurements"
            ADD CONSTRAINT "FK_2322371d3f0141c3be07737a220" FOREIGN KEY ("updated_by") REFERENCES "users"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            ALTER TABLE "hoop_leg_measurements" DROP CONSTRAINT "FK_2322371d3f0141c3be07737a220"
        `);
        await queryRunner.query(`
            ALTER TABLE "hoop_leg_measurements" DROP CONSTRAINT "FK_e43058d1405eb0fe433fc54f4fb"
        `);
        await queryRunner.query(`
            DROP TABLE "hoop_leg_measurements"
        `);
    }
}
