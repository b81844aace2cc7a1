// The builder's garage: cars, build sheets with numbered revisions, and photos; and the foreign key
// from check_runs.build_sheet_revision_id to the revisions. Entity tables were
// generated from the entities with TypeORM's schema builder, so the drift test starts from zero
// difference.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Garage1796083400000 implements MigrationInterface {
  name = 'Garage1796083400000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "build_sheets" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "car_id" uuid NOT NULL, "name" character varying(120) NOT NULL, "club_id" uuid NOT NULL, "rulebook_id" uuid NOT NULL, "ruleset_version_id" uuid NOT NULL, "class_id" character varying(60) NOT NULL, "current_revision" integer NOT NULL, "archived_at" TIMESTAMP WITH TIME ZONE, "latest_check_run_id" uuid, "latest_verdict" character varying(20), "latest_checked_revision" integer, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "CHK_build_sheets_current_revision" CHECK ("current_revision" > 0), CONSTRAINT "CHK_build_sheets_latest_verdict" CHECK ("latest_verdict" IS NULL OR "latest_verdict" IN ('pass', 'fail', 'needs_information')), CONSTRAINT "PK_31223fee03074a71e8fa25c608b" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_build_sheets_club" ON "build_sheets"  ("club_id")`);
    await queryRunner.query(`CREATE INDEX "IDX_build_sheets_car" ON "build_sheets"  ("car_id")`);
    await queryRunner.query(`CREATE TYPE "public"."chassis_type" AS ENUM('unibody', 'tube_frame')`);
    await queryRunner.query(`CREATE TABLE "cars" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "owner_id" uuid NOT NULL, "name" character varying(120) NOT NULL, "make" character varying(80), "model" character varying(80), "year" integer, "chassis_type" "public"."chassis_type" NOT NULL, "race_number" character varying(10), "archived_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "CHK_cars_year" CHECK ("year" IS NULL OR "year" BETWEEN 1900 AND 2100), CONSTRAINT "PK_fc218aa84e79b477d55322271b6" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_cars_owner" ON "cars"  ("owner_id")`);
    await queryRunner.query(`CREATE TABLE "build_sheet_revisions" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "build_sheet_id" uuid NOT NULL, "number" integer NOT NULL, "specification" jsonb NOT NULL, "ruleset_version_id" uuid NOT NULL, "class_id" character varying(60) NOT NULL, "created_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_build_sheet_revisions_sheet_number" UNIQUE ("build_sheet_id", "number"), CONSTRAINT "PK_0e8ce989c7794b1a0472c9f121f" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_build_sheet_revisions_ruleset_version" ON "build_sheet_revisions"  ("ruleset_version_id")`);
    await queryRunner.query(`CREATE TYPE "public"."photo_area" AS ENUM('tubes', 'members', 'geometry', 'mounting', 'padding', 'welding', 'general')`);
    await queryRunner.query(`CREATE TABLE "photos" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "build_sheet_id" uuid NOT NULL, "member_id" character varying(40), "area" "public"."photo_area" NOT NULL, "caption" character varying(300) NOT NULL DEFAULT '', "storage_key" character varying(200) NOT NULL, "thumbnail_key" character varying(200) NOT NULL, "width_px" integer NOT NULL, "height_px" integer NOT NULL, "byte_size" integer NOT NULL, "uploaded_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_80f247464fa113f7a81928d07b6" UNIQUE ("storage_key"), CONSTRAINT "UQ_f72a1e8f0bc2b4e6e564e748b9a" UNIQUE ("thumbnail_key"), CONSTRAINT "CHK_photos_size" CHECK ("width_px" > 0 AND "height_px" > 0 AND "byte_size" > 0), CONSTRAINT "PK_5220c45b8e32d49d767b9b3d725" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_photos_build_sheet" ON "photos"  ("build_sheet_id")`);
    await queryRunner.query(`ALTER TABLE "build_sheets" ADD CONSTRAINT "FK_e2e3dd31f63c7d95f75120e3fc9" FOREIGN KEY ("car_id") REFERENCES "cars"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "build_sheets" ADD CONSTRAINT "FK_987fef08b940d1422ea7bf5c731" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "build_sheets" ADD CONSTRAINT "FK_47ea84a688e1391e852693fe4df" FOREIGN KEY ("rulebook_id") REFERENCES "rulebooks"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "build_sheets" ADD CONSTRAINT "FK_1ac362f08f9f25c1aff0ea18865" FOREIGN KEY ("ruleset_version_id") REFERENCES "ruleset_versions"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "build_sheets" ADD CONSTRAINT "FK_42850b861e6d3c5ec148242d366" FOREIGN KEY ("latest_check_run_id") REFERENCES "check_runs"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "cars" ADD CONSTRAINT "FK_5e763d4f04debbd45bdff355f99" FOREIGN KEY ("owner_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "build_sheet_revisions" ADD CONSTRAINT "FK_3a40e78555af2c7704bf4101698" FOREIGN KEY ("build_sheet_id") REFERENCES "build_sheets"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "build_sheet_revisions" ADD CONSTRAINT "FK_1c9b7c3d32e65f895f9ced57858" FOREIGN KEY ("ruleset_version_id") REFERENCES "ruleset_versions"("id") ON DELETE RESTRICT ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "build_sheet_revisions" ADD CONSTRAINT "FK_eb300e1605c1e6b3e47237e9426" FOREIGN KEY ("created_by") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "photos" ADD CONSTRAINT "FK_1a5c34351545408e8919ea7d6e2" FOREIGN KEY ("build_sheet_id") REFERENCES "build_sheets"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "photos" ADD CONSTRAINT "FK_321fd52a2c7d768cf387257e198" FOREIGN KEY ("uploaded_by") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    // A saved check run names the revision it was made from (column added by 1796083300000).
    await queryRunner.query(`ALTER TABLE "check_runs" ADD CONSTRAINT "FK_b04f7c8897b96e6c680ecc43430" FOREIGN KEY ("build_sheet_revision_id") REFERENCES "build_sheet_revisions"("id") ON DELETE NO ACTION ON UPDATE NO ACTION`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "check_runs" DROP CONSTRAINT "FK_b04f7c8897b96e6c680ecc43430"`);
    await queryRunner.query(`ALTER TABLE "photos" DROP CONSTRAINT "FK_321fd52a2c7d768cf387257e198"`);
    await queryRunner.query(`ALTER TABLE "photos" DROP CONSTRAINT "FK_1a5c34351545408e8919ea7d6e2"`);
    await queryRunner.query(`ALTER TABLE "build_sheet_revisions" DROP CONSTRAINT "FK_eb300e1605c1e6b3e47237e9426"`);
    await queryRunner.query(`ALTER TABLE "build_sheet_revisions" DROP CONSTRAINT "FK_1c9b7c3d32e65f895f9ced57858"`);
    await queryRunner.query(`ALTER TABLE "build_sheet_revisions" DROP CONSTRAINT "FK_3a40e78555af2c7704bf4101698"`);
    await queryRunner.query(`ALTER TABLE "cars" DROP CONSTRAINT "FK_5e763d4f04debbd45bdff355f99"`);
    await queryRunner.query(`ALTER TABLE "build_sheets" DROP CONSTRAINT "FK_42850b861e6d3c5ec148242d366"`);
    await queryRunner.query(`ALTER TABLE "build_sheets" DROP CONSTRAINT "FK_1ac362f08f9f25c1aff0ea18865"`);
    await queryRunner.query(`ALTER TABLE "build_sheets" DROP CONSTRAINT "FK_47ea84a688e1391e852693fe4df"`);
    await queryRunner.query(`ALTER TABLE "build_sheets" DROP CONSTRAINT "FK_987fef08b940d1422ea7bf5c731"`);
    await queryRunner.query(`ALTER TABLE "build_sheets" DROP CONSTRAINT "FK_e2e3dd31f63c7d95f75120e3fc9"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_photos_build_sheet"`);
    await queryRunner.query(`DROP TABLE "photos"`);
    await queryRunner.query(`DROP TYPE "public"."photo_area"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_build_sheet_revisions_ruleset_version"`);
    await queryRunner.query(`DROP TABLE "build_sheet_revisions"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_cars_owner"`);
    await queryRunner.query(`DROP TABLE "cars"`);
    await queryRunner.query(`DROP TYPE "public"."chassis_type"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_build_sheets_car"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_build_sheets_club"`);
    await queryRunner.query(`DROP TABLE "build_sheets"`);
  }
}
