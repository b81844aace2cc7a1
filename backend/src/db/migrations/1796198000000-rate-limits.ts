// The counters behind every limit (sign-in, password change and reset, public look-ups): one row per
// key and window, in the layout rate-limiter-flexible's PostgreSQL store expects (`expire` in ms since
// the epoch). In PostgreSQL so a limit survives a restart and every server process shares it
// (docs/decisions/0009-limits-in-postgresql.md). Not an entity: the schema builder leaves it alone.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class RateLimits1796198000000 implements MigrationInterface {
  name = 'RateLimits1796198000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "rate_limits" ("key" character varying(255) NOT NULL, "points" integer NOT NULL DEFAULT 0, "expire" bigint, CONSTRAINT "PK_rate_limits" PRIMARY KEY ("key"))`);
    await queryRunner.query(`CREATE INDEX "IDX_rate_limits_expire" ON "rate_limits" ("expire")`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX "public"."IDX_rate_limits_expire"`);
    await queryRunner.query(`DROP TABLE "rate_limits"`);
  }
}
