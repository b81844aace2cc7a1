// The build journal (issue 11): one entry per stage reached on a build sheet, with journal photos
// counted apart from the sheet's. Generated from the entities with TypeORM's schema builder (no drift).
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class BuildJournal1796197266052 implements MigrationInterface {
    name = 'BuildJournal1796197266052';

    public async up(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            CREATE TABLE "journal_entries" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "build_sheet_id" uuid NOT NULL,
                "stage" character varying(30) NOT NULL,
                "happened_on" date NOT NULL,
                "note" text NOT NULL DEFAULT '',
                "created_by" uuid,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "UQ_journal_entries_sheet_stage" UNIQUE ("build_sheet_id", "stage"),
                CONSTRAINT "CHK_journal_entries_stage" CHECK (
                    "stage" IN (
                        'cut_and_bent',
                        'fitted',
                        'tacked',
                        'fully_welded',
                        'finished'
                    )
                ),
                CONSTRAINT "PK_a70368e64230434457c8d007ab3" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE TABLE "journal_photos" (
                "id" uuid NOT NULL DEFAULT gen_random_uuid(),
                "entry_id" uuid NOT NULL,
                "build_sheet_id" uuid NOT NULL,
                "caption" character varying(300) NOT NULL DEFAULT '',
                "storage_key" character varying(200) NOT NULL,
                "thumbnail_key" character varying(200) NOT NULL,
                "width_px" integer NOT NULL,
                "height_px" integer NOT NULL,
                "byte_size" integer NOT NULL,
                "uploaded_by" uuid,
                "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(),
                CONSTRAINT "UQ_82cabe2f1d08d2e9c8819829736" UNIQUE ("storage_key"),
                CONSTRAINT "UQ_9a247460e623f552af4ba248329" UNIQUE ("thumbnail_key"),
                CONSTRAINT "CHK_journal_photos_size" CHECK (
                    "width_px" > 0
                    AND "height_px" > 0
                    AND "byte_size" > 0
                ),
                CONSTRAINT "PK_049cf4bf4a05a8005272709c6e9" PRIMARY KEY ("id")
            )
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_journal_photos_sheet" ON "journal_photos" ("build_sheet_id")
        `);
        await queryRunner.query(`
            CREATE INDEX "IDX_journal_photos_entry" ON "journal_photos" ("entry_id")
        `);
        await queryRunner.query(`
            ALTER TABLE "journal_entries"
            ADD CONSTRAINT "FK_2aff80e30531cce867439fe489e" FOREIGN KEY ("build_sheet_id") REFERENCES "build_sheets"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "journal_entries"
            ADD CONSTRAINT "FK_dee7f9cf07c67fce5f6018ac32f" FOREIGN KEY ("created_by") REFERENCES "users"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "journal_photos"
            ADD CONSTRAINT "FK_3b13f2920edae617a5da93fe9dd" FOREIGN KEY ("entry_id") REFERENCES "journal_entries"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "journal_photos"
            ADD CONSTRAINT "FK_8f1a95ac5a7f05cc1969bb7be14" FOREIGN KEY ("build_sheet_id") REFERENCES "build_sheets"("id") ON DELETE CASCADE ON UPDATE NO ACTION
        `);
        await queryRunner.query(`
            ALTER TABLE "journal_photos"
            ADD CONSTRAINT "FK_b95e91c4ec1a692528e47e2731a" FOREIGN KEY ("uploaded_by") REFERENCES "users"("id") ON DELETE
            SET NULL ON UPDATE NO ACTION
        `);
    }

    public async down(queryRunner: QueryRunner): Promise<void> {
        await queryRunner.query(`
            ALTER TABLE "journal_photos" DROP CONSTRAINT "FK_b95e91c4ec1a692528e47e2731a"
        `);
        await queryRunner.query(`
            ALTER TABLE "journal_photos" DROP CONSTRAINT "FK_8f1a95ac5a7f05cc1969bb7be14"
        `);
        await queryRunner.query(`
            ALTER TABLE "journal_photos" DROP CONSTRAINT "FK_3b13f2920edae617a5da93fe9dd"
        `);
        await queryRunner.query(`
            ALTER TABLE "journal_entries" DROP CONSTRAINT "FK_dee7f9cf07c67fce5f6018ac32f"
        `);
        await queryRunner.query(`
            ALTER TABLE "journal_entries" DROP CONSTRAINT "FK_2aff80e30531cce867439fe489e"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_journal_photos_entry"
        `);
        await queryRunner.query(`
            DROP INDEX "public"."IDX_journal_photos_sheet"
        `);
        await queryRunner.query(`
            DROP TABLE "journal_photos"
        `);
        await queryRunner.query(`
            DROP TABLE "journal_entries"
        `);
    }

}
