// Editions published ahead of their date (issue 13): a ruleset version may be "scheduled", and the
// club names the time zone its dates are read in.
//  - ruleset_versions.status gains 'scheduled'. The guard trigger now allows draft → published |
//    scheduled, scheduled → published | superseded | retired, published → superseded | retired and
//    superseded → retired; a scheduled version's content is frozen like a published one's.
//  - clubs.time_zone: an IANA zone name ("Europe/London"), 'UTC' for the clubs that exist.
// Raises SQLSTATE CW001 like the trigger it replaces (entities: immutableRowSqlState).
import type { MigrationInterface, QueryRunner } from 'typeorm';

const guard = (moves: string) => `
CREATE OR REPLACE FUNCTION "ruleset_versions_guard"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD."status" <> 'draft' THEN
      RAISE EXCEPTION 'Ruleset version % is %: only a draft can be deleted', OLD."id", OLD."status" USING ERRCODE = 'CW001';
    END IF;
    RETURN OLD;
  END IF;

  IF OLD."status" = 'draft' THEN
    IF NEW."status" NOT IN ('draft', ${moves === 'scheduled' ? `'published', 'scheduled'` : `'published'`}) THEN
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
      ${moves === 'scheduled' ? `(OLD."status" = 'scheduled' AND NEW."status" IN ('published', 'superseded', 'retired')) OR ` : ''}(OLD."status" = 'published' AND NEW."status" IN ('superseded', 'retired'))
      OR (OLD."status" = 'superseded' AND NEW."status" = 'retired')) THEN
    RAISE EXCEPTION 'Ruleset version % cannot move from % to %', OLD."id", OLD."status", NEW."status" USING ERRCODE = 'CW001';
  END IF;
  RETURN NEW;
END
$$`;

export class EditionSchedule1796300100000 implements MigrationInterface {
  name = 'EditionSchedule1796300100000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "clubs" ADD "time_zone" character varying(64) NOT NULL DEFAULT 'UTC'`);
    await queryRunner.query(`ALTER TABLE "ruleset_versions" DROP CONSTRAINT "CHK_ruleset_versions_status"`);
    await queryRunner.query(`ALTER TABLE "ruleset_versions" ADD CONSTRAINT "CHK_ruleset_versions_status" CHECK ("status" IN ('draft', 'scheduled', 'published', 'superseded', 'retired'))`);
    await queryRunner.query(guard('scheduled'));
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    const scheduled: { n: string }[] = await queryRunner.query(`SELECT count(*) AS n FROM "ruleset_versions" WHERE "status" = 'scheduled'`);
    if (Number(scheduled[0]?.n ?? 0) > 0) {
      throw new Error('Scheduled ruleset versions exist: retire them, or let them come into force, before reverting this migration.');
    }
    await queryRunner.query(guard('published'));
    await queryRunner.query(`ALTER TABLE "ruleset_versions" DROP CONSTRAINT "CHK_ruleset_versions_status"`);
    await queryRunner.query(`ALTER TABLE "ruleset_versions" ADD CONSTRAINT "CHK_ruleset_versions_status" CHECK ("status" IN ('draft', 'published', 'superseded', 'retired'))`);
    await queryRunner.query(`ALTER TABLE "clubs" DROP COLUMN "time_zone"`);
  }
}
