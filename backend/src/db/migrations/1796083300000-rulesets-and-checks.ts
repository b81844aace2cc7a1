// Rulebooks, their numbered ruleset versions and saved check runs (issue 3). Tables, keys and
// indexes were generated from the entities with TypeORM's schema builder (the drift test starts
// from zero difference); the triggers are ours and are what makes the records trustworthy:
//  - a ruleset version that left the draft state keeps its content forever and moves only
//    published → superseded | retired, superseded → retired; only drafts may be deleted;
//  - a check run is never updated or deleted.
// Both raise SQLSTATE CW001 (entities: immutableRowSqlState). TRUNCATE is not a row change and
// stays possible for test resets.
import type { MigrationInterface, QueryRunner } from 'typeorm';

const rulesetVersionGuard = `
CREATE FUNCTION "ruleset_versions_guard"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD."status" <> 'draft' THEN
      RAISE EXCEPTION 'Ruleset version % is %: only a draft can be deleted', OLD."id", OLD."status" USING ERRCODE = 'CW001';
    END IF;
    RETURN OLD;
  END IF;

  IF OLD."status" = 'draft' THEN
    IF NEW."status" NOT IN ('draft', 'published') THEN
      RAISE EXCEPTION 'A draft ruleset version can only be published, not moved to %', NEW."status" USING ERRCODE = 'CW001';
    END IF;
    -- Every content change of a draft moves its lock version on, even when the writer forgot to.
    IF NEW."lock_version" = OLD."lock_version" AND (NEW."document" IS DISTINCT FROM OLD."document"
        OR NEW."edition" IS DISTINCT FROM OLD."edition" OR NEW."effective_date" IS DISTINCT FROM OLD."effective_date") THEN
      NEW."lock_version" := OLD."lock_version" + 1;
    END IF;
    RETURN NEW;
  END IF;

  IF NEW."document" IS DISTINCT FROM OLD."document" OR NEW."edition" IS DISTINCT FROM OLD."edition"
      OR NEW."effective_date" IS DISTINCT FROM OLD."effective_date" OR NEW."version_number" IS DISTINCT FROM OLD."version_number"
      OR NEW."rulebook_id" IS DISTINCT FROM OLD."rulebook_id" OR NEW."published_at" IS DISTINCT FROM OLD."published_at" THEN
    RAISE EXCEPTION 'Ruleset version % is %: its content cannot change', OLD."id", OLD."status" USING ERRCODE = 'CW001';
  END IF;
  IF NEW."status" <> OLD."status" AND NOT (
      (OLD."status" = 'published' AND NEW."status" IN ('superseded', 'retired'))
      OR (OLD."status" = 'superseded' AND NEW."status" = 'retired')) THEN
    RAISE EXCEPTION 'Ruleset version % cannot move from % to %', OLD."id", OLD."status", NEW."status" USING ERRCODE = 'CW001';
  END IF;
  RETURN NEW;
END
$$`;

const checkRunGuard = `
CREATE FUNCTION "check_runs_guard"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'Check run % is a saved record and cannot be changed or deleted', OLD."id" USING ERRCODE = 'CW001';
END
$$`;

export class RulesetsAndChecks1796083300000 implements MigrationInterface {
  name = 'RulesetsAndChecks1796083300000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "rulebooks" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "club_id" uuid NOT NULL, "slug" character varying(80) NOT NULL, "title" character varying(200) NOT NULL, "publisher" character varying(200) NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_rulebooks_club_slug" UNIQUE ("club_id", "slug"), CONSTRAINT "PK_fa3e304f0551c690453361874e2" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE TABLE "ruleset_versions" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "rulebook_id" uuid NOT NULL, "version_number" integer NOT NULL, "status" character varying(20) NOT NULL DEFAULT 'draft', "edition" text NOT NULL, "effective_date" date NOT NULL, "document" jsonb NOT NULL, "created_by" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "published_at" TIMESTAMP WITH TIME ZONE, "published_by" uuid, "lock_version" integer NOT NULL DEFAULT '1', CONSTRAINT "UQ_ruleset_versions_rulebook_number" UNIQUE ("rulebook_id", "version_number"), CONSTRAINT "CHK_ruleset_versions_number" CHECK ("version_number" > 0), CONSTRAINT "CHK_ruleset_versions_published_at" CHECK ("status" = 'draft' OR "published_at" IS NOT NULL), CONSTRAINT "CHK_ruleset_versions_status" CHECK ("status" IN ('draft', 'published', 'superseded', 'retired')), CONSTRAINT "PK_fc54cdf4ba1c92b20edefd29fed" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE UNIQUE INDEX "UQ_ruleset_versions_one_published" ON "ruleset_versions"  ("rulebook_id") WHERE "status" = 'published'`);
    await queryRunner.query(`CREATE TABLE "check_runs" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "ruleset_version_id" uuid NOT NULL, "class_id" text NOT NULL, "specification" jsonb NOT NULL, "report" jsonb NOT NULL, "overall_verdict" character varying(20) NOT NULL, "created_by" uuid NOT NULL, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "build_sheet_revision_id" uuid, "verification_code" text NOT NULL, CONSTRAINT "UQ_ad7fb59764f1958a5fc359aa34f" UNIQUE ("verification_code"), CONSTRAINT "CHK_check_runs_verdict" CHECK ("overall_verdict" IN ('pass', 'fail', 'needs_information')), CONSTRAINT "PK_1fe9c7649e3b0dbff66e03e1bd8" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_check_runs_build_sheet_revision" ON "check_runs"  ("build_sheet_revision_id") `);
    await queryRunner.query(`CREATE INDEX "IDX_check_runs_ruleset_version" ON "check_runs"  ("ruleset_version_id") `);
    await queryRunner.query(`CREATE INDEX "IDX_check_runs_created_by" ON "check_runs"  ("created_by") `);
    await queryRunner.query(`ALTER TABLE "rulebooks" ADD CONSTRAINT "FK_2bd9647a2275402d677e979fdab" FOREIGN KEY ("club_id") REFERENCES "clubs"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "ruleset_versions" ADD CONSTRAINT "FK_24178c6e7d4ec2b38849abca0bf" FOREIGN KEY ("rulebook_id") REFERENCES "rulebooks"("id") ON DELETE CASCADE ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "ruleset_versions" ADD CONSTRAINT "FK_a4d4eb757ca5412d56b13877734" FOREIGN KEY ("created_by") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "ruleset_versions" ADD CONSTRAINT "FK_866f28b48610e2ca920bc6f3059" FOREIGN KEY ("published_by") REFERENCES "users"("id") ON DELETE SET NULL ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "check_runs" ADD CONSTRAINT "FK_9ef7947607a3e7ae840a9c584f7" FOREIGN KEY ("ruleset_version_id") REFERENCES "ruleset_versions"("id") ON DELETE NO ACTION ON UPDATE NO ACTION`);
    await queryRunner.query(`ALTER TABLE "check_runs" ADD CONSTRAINT "FK_41b5a59a83abef4b08e9baa9c03" FOREIGN KEY ("created_by") REFERENCES "users"("id") ON DELETE NO ACTION ON UPDATE NO ACTION`);

    await queryRunner.query(rulesetVersionGuard);
    await queryRunner.query(`CREATE TRIGGER "ruleset_versions_guard" BEFORE UPDATE OR DELETE ON "ruleset_versions" FOR EACH ROW EXECUTE FUNCTION "ruleset_versions_guard"()`);
    await queryRunner.query(checkRunGuard);
    await queryRunner.query(`CREATE TRIGGER "check_runs_guard" BEFORE UPDATE OR DELETE ON "check_runs" FOR EACH ROW EXECUTE FUNCTION "check_runs_guard"()`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TRIGGER "check_runs_guard" ON "check_runs"`);
    await queryRunner.query(`DROP FUNCTION "check_runs_guard"()`);
    await queryRunner.query(`DROP TRIGGER "ruleset_versions_guard" ON "ruleset_versions"`);
    await queryRunner.query(`DROP FUNCTION "ruleset_versions_guard"()`);
    await queryRunner.query(`ALTER TABLE "check_runs" DROP CONSTRAINT "FK_41b5a59a83abef4b08e9baa9c03"`);
    await queryRunner.query(`ALTER TABLE "check_runs" DROP CONSTRAINT "FK_9ef7947607a3e7ae840a9c584f7"`);
    await queryRunner.query(`ALTER TABLE "ruleset_versions" DROP CONSTRAINT "FK_866f28b48610e2ca920bc6f3059"`);
    await queryRunner.query(`ALTER TABLE "ruleset_versions" DROP CONSTRAINT "FK_a4d4eb757ca5412d56b13877734"`);
    await queryRunner.query(`ALTER TABLE "ruleset_versions" DROP CONSTRAINT "FK_24178c6e7d4ec2b38849abca0bf"`);
    await queryRunner.query(`ALTER TABLE "rulebooks" DROP CONSTRAINT "FK_2bd9647a2275402d677e979fdab"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_check_runs_created_by"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_check_runs_ruleset_version"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_check_runs_build_sheet_revision"`);
    await queryRunner.query(`DROP TABLE "check_runs"`);
    await queryRunner.query(`DROP INDEX "public"."UQ_ruleset_versions_one_published"`);
    await queryRunner.query(`DROP TABLE "ruleset_versions"`);
    await queryRunner.query(`DROP TABLE "rulebooks"`);
  }
}
