// Tube stock lists (issue 11): the club's list and each builder's own sizes, and when a club's list was
// started from the common sizes. Generated from the entities with TypeORM's schema builder (no drift).
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class TubeStock1796195189144 implements MigrationInterface {
    name = 'TubeStock1796195189144';

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            CREATE TABLE "stock_tubes" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "club_id" uuid,
                "owner_id" uuid,
                "label" character varying(120) NOT NULL,
                "od_mm" double precision NOT NULL,
                "wall_mm" double precision NOT NULL,
                "material" character varying(20) NOT NULL,
                "process" character varying(20) NOT NULL,
                "grade" character varying(60),
                "yield_mpa" double precision,
                "yield_source" character varying(200),
                "common" boolean NOT NULL DEFAULT false,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "CHK_stock_tubes_yield" CHECK (
                    "yield_mpa" IS NULL
                    OR "yield_mpa" > 0
                ),
                CONSTRAINT "CHK_stock_tubes_process" CHECK (
                    "process" IN ('dom', 'erw', 'seamless', 'cds', 'other')
                ),
                CONSTRAINT "CHK_stock_tubes_material" CHECK (
                    "material" IN ('mild_steel', 'chromoly_4130', 'other')
                ),
                CONSTRAINT "CHK_stock_tubes_size" CHECK (
                    "od_mm" > 0
                    AND "wall_mm" > 0
                    AND "wall_mm" * 2 < "od_mm"
                ),
                CONSTRAINT "CHK_stock_tubes_one_list" CHECK (("club_id" IS NULL) <> ("owner_id" IS NULL)),
                CONSTRAINT "PK_3f571961ca9351d9719a33a4e66" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_stock_tubes_owner" ON "stock_tubes" ("owner_id")
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_stock_tubes_club" ON "stock_tubes" ("club_id")
        `);
        await queryRunner.query(`
            CREATE TABLE "club_stock_seeds" (
                "club_id" uuid NOT NULL,
                "seeded_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "PK_c7d462f3d8d075524a7a38d2076" PRIMARY KEY ("club_id")
            )
        `);
        await queryRunner.query(`
            ALTER TABLE "stock_tubes"
            ADD CONSTRAINT "FK_e4a053368ddad9d73ae503c4092" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "stock_tubes"
            ADD CONSTRAINT "FK_6a829ec015727fffb338f47af5e" FOREIGN KEY ("owner_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "club_stock_seeds"
            ADD CONSTRAINT "FK_c7d462f3d8d075524a7a38d2076" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            ALTER TABLE "club_stock_seeds" DROP CONSTRAINT "FK_c7d462f3d8d075524a7a38d2076"
        `);
        await queryRunner.query(`
            ALTER TABLE "stock_tubes" DROP CONSTRAINT "FK_6a829ec015727fffb338f47af5e"
        `);
        await queryRunner.query(`
            ALTER TABLE "stock_tubes" DROP CONSTRAINT "FK_e4a053368ddad9d73ae503c4092"
        `);
        await queryRunner.query(`
            DROP TABLE "club_stock_seeds"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_stock_tubes_club"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_stock_tubes_owner"
        `);
        await queryRunner.query(`
            DROP TABLE "stock_tubes"
        `);
    }

}
