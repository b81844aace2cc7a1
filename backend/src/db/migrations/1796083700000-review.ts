// Reviews and cage records (issue 6): submissions of saved check runs with their audited events,
// stewards' notes on findings, cage records with the per-club sequence they are numbered from, the
// club's record settings and the stewards' opt-in to mail on new submissions. Generated from the
// entities with TypeORM's schema builder (no drift), then tidied.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Review1796083700000 implements MigrationInterface {
  name = 'Review1796083700000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "submissions" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "club_id" uuid NOT NULL, "car_id" uuid NOT NULL, "build_sheet_id" uuid NOT NULL, "check_run_id" uuid NOT NULL, "builder_id" uuid NOT NULL, "state" character varying(20) NOT NULL, "version" integer NOT NULL DEFAULT '1', "class_id" character varying(60) NOT NULL, "builder_note" text, "assigned_steward_id" uuid, "previous_submission_id" uuid, "resubmitted_as_id" uuid, "waivers" jsonb NOT NULL DEFAULT '[]', "photo_ids" jsonb NOT NULL DEFAULT '[]', "decision_note" text, "decided_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "CHK_submissions_version" CHECK ("version" > 0), CONSTRAINT "CHK_submissions_state" CHECK ("state" IN ('pending', 'in_review', 'approved', 'changes_requested', 'rejected', 'withdrawn')), CONSTRAINT "PK_10b3be95b8b2fb1e482e07d706b" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_submissions_builder" ON "submissions" ("builder_id")`);
    await queryRunner.query(`CREATE INDEX "IDX_submissions_car" ON "submissions" ("car_id")`);
    await queryRunner.query(`CREATE INDEX "IDX_submissions_club_state" ON "submissions" ("club_id", "state")`);
    await queryRunner.query(`CREATE TABLE "submission_events" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "submission_id" uuid NOT NULL, "from_state" character varying(20), "to_state" character varying(20) NOT NULL, "action" character varying(30) NOT NULL, "actor_id" uuid, "note" text, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_9d543c147bfdb64e11af9f09c83" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_submission_events_submission" ON "submission_events" ("submission_id", "created_at")`);
    await queryRunner.query(`CREATE TABLE "finding_annotations" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "submission_id" uuid NOT NULL, "finding_key" character varying(200) NOT NULL, "author_id" uuid, "text" text NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_9d959810f6c1fe8dc5302c0972b" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_finding_annotations_submission" ON "finding_annotations" ("submission_id")`);
    await queryRunner.query(`CREATE TABLE "cage_records" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "club_id" uuid NOT NULL, "number" character varying(40) NOT NULL, "year" integer NOT NULL, "sequence" integer NOT NULL, "submission_id" uuid NOT NULL, "car_id" uuid NOT NULL, "class_id" character varying(60) NOT NULL, "class_name" text NOT NULL, "ruleset_version_id" uuid NOT NULL, "rulebook_title" text NOT NULL, "edition" text NOT NULL, "steward_id" uuid, "verification_code" character varying(40) NOT NULL, "issued_at" TIMESTAMP WITH TIME ZONE NOT NULL, "expires_at" TIMESTAMP WITH TIME ZONE NOT NULL, "revoked_at" TIMESTAMP WITH TIME ZONE, "revoked_reason" text, "revoked_by" uuid, "superseded_by_id" uuid, "superseded_at" TIMESTAMP WITH TIME ZONE, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_cage_records_club_year_sequence" UNIQUE ("club_id", "year", "sequence"), CONSTRAINT "UQ_cage_records_submission" UNIQUE ("submission_id"), CONSTRAINT "UQ_cage_records_code" UNIQUE ("verification_code"), CONSTRAINT "UQ_cage_records_number" UNIQUE ("number"), CONSTRAINT "PK_402895fc3fbae8fb6bfe9267130" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_cage_records_car" ON "cage_records" ("car_id")`);
    await queryRunner.query(`CREATE TABLE "club_record_settings" ("club_id" uuid NOT NULL, "record_prefix" character varying(6) NOT NULL, "validity_months" integer NOT NULL DEFAULT '12', CONSTRAINT "CHK_club_record_settings_validity" CHECK ("validity_months" BETWEEN 1 AND 120), CONSTRAINT "PK_3c6f73e3ccace3d05da8d129c69" PRIMARY KEY ("club_id"))`);
    await queryRunner.query(`CREATE TABLE "cage_record_sequences" ("club_id" uuid NOT NULL, "year" integer NOT NULL, "last_sequence" integer NOT NULL, CONSTRAINT "PK_82302c07e563f6cbc948e4f3c2c" PRIMARY KEY ("club_id", "year"))`);
    await queryRunner.query(`CREATE TABLE "steward_mail_opt_ins" ("user_id" uuid NOT NULL, "club_id" uuid NOT NULL, CONSTRAINT "PK_27d1491e6bfe441019a725a157b" PRIMARY KEY ("user_id", "club_id"))`);
    await queryRunner.query(`ALTER TABLE "submissions" ADD CONSTRAINT "FK_52d034ec423331a4a7e73afa1df" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "submissions" ADD CONSTRAINT "FK_f38dd2d6646baebb2ec10658c53" FOREIGN KEY ("car_id") REFERENCES "cars"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "submissions" ADD CONSTRAINT "FK_f4daa6b4ce11bb3b448a5e391c4" FOREIGN KEY ("build_sheet_id") REFERENCES "build_sheets"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "submissions" ADD CONSTRAINT "FK_35fd59ac3b120aebe6920709703" FOREIGN KEY ("check_run_id") REFERENCES "check_runs"("id") ON DELETE NO ACTION ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "submissions" ADD CONSTRAINT "FK_43ecd9fb84c3c19bf8b6b9b3021" FOREIGN KEY ("builder_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "submissions" ADD CONSTRAINT "FK_d24508c7d2a78305619f396fcc8" FOREIGN KEY ("assigned_steward_id") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "submissions" ADD CONSTRAINT "FK_a41b5afeb296024b2fe3a57684d" FOREIGN KEY ("previous_submission_id") REFERENCES "submissions"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "submissions" ADD CONSTRAINT "FK_1f8dc67062ea09aa0c4c8a12bcc" FOREIGN KEY ("resubmitted_as_id") REFERENCES "submissions"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "submission_events" ADD CONSTRAINT "FK_8c2bb197e4311c469005597a877" FOREIGN KEY ("submission_id") REFERENCES "submissions"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "submission_events" ADD CONSTRAINT "FK_77c102dc160ec42810f26bc4832" FOREIGN KEY ("actor_id") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "finding_annotations" ADD CONSTRAINT "FK_f8b9754d5624c7657f6564f62fa" FOREIGN KEY ("submission_id") REFERENCES "submissions"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "finding_annotations" ADD CONSTRAINT "FK_aa1a97ae19e94f13406bda0c232" FOREIGN KEY ("author_id") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "cage_records" ADD CONSTRAINT "FK_4014fab434f82b2c1194d5951f9" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "cage_records" ADD CONSTRAINT "FK_9cde3831166ad52ae222b0f3a84" FOREIGN KEY ("submission_id") REFERENCES "submissions"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "cage_records" ADD CONSTRAINT "FK_139bf1367334f007da4bb25a422" FOREIGN KEY ("car_id") REFERENCES "cars"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "cage_records" ADD CONSTRAINT "FK_aa7419c57ccc6df8dc601ae5ea3" FOREIGN KEY ("ruleset_version_id") REFERENCES "ruleset_versions"("id") ON DELETE NO ACTION ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "cage_records" ADD CONSTRAINT "FK_7fe6e90d2d1837418711ee74745" FOREIGN KEY ("steward_id") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "club_record_settings" ADD CONSTRAINT "FK_3c6f73e3ccace3d05da8d129c69" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "cage_record_sequences" ADD CONSTRAINT "FK_85b738abc64d1df4e5b5bf5d355" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "steward_mail_opt_ins" ADD CONSTRAINT "FK_0a5a4082817cd821d0d33d4f784" FOREIGN KEY ("user_id") REFERENCES "users"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "steward_mail_opt_ins" ADD CONSTRAINT "FK_e2ef242acdabcca18830f10dbf5" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE "steward_mail_opt_ins"`);
    await queryRunner.query(`DROP TABLE "cage_record_sequences"`);
    await queryRunner.query(`DROP TABLE "club_record_settings"`);
    await queryRunner.query(`DROP TABLE "cage_records"`);
    await queryRunner.query(`DROP TABLE "finding_annotations"`);
    await queryRunner.query(`DROP TABLE "submission_events"`);
    await queryRunner.query(`DROP TABLE "submissions"`);
  }
}
