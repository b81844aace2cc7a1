// Results of re-checking build sheets after a ruleset version is published (services/publish/):
// one row per sheet and publish job, with the verdict before (what the builder last saw) and after
// (the new edition). A plain table, append-only by use: it records what the job found, and the
// sheets' own check runs stay untouched (a saved check run is the builder's record).
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class RulesetRechecks1796083600000 implements MigrationInterface {
  name = 'RulesetRechecks1796083600000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "ruleset_recheck_results" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "job_id" uuid NOT NULL, "ruleset_version_id" uuid NOT NULL REFERENCES "ruleset_versions"("id") ON DELETE CASCADE, "build_sheet_id" uuid NOT NULL REFERENCES "build_sheets"("id") ON DELETE CASCADE, "revision_number" integer NOT NULL, "class_id" character varying(60) NOT NULL, "verdict_before" character varying(20), "verdict_after" character varying(20) NOT NULL, "mail_id" uuid, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "UQ_ruleset_recheck_job_sheet" UNIQUE ("job_id", "build_sheet_id"), CONSTRAINT "PK_ruleset_recheck_results" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_ruleset_recheck_sheet" ON "ruleset_recheck_results" ("build_sheet_id", "created_at")`);
    await queryRunner.query(`CREATE INDEX "IDX_ruleset_recheck_version" ON "ruleset_recheck_results" ("ruleset_version_id")`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE "ruleset_recheck_results"`);
  }
}
