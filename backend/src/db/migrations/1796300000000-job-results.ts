// Work off the request path (issue 12, §7): the impact preview is a background job, and a job's outcome
// is kept with its progress (`job_progress.result`, JSON: the impact summary, or a re-check's counts),
// so whichever server answers GET /api/jobs/:id can show it.
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class JobResults1796300000000 implements MigrationInterface {
  name = 'JobResults1796300000000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "job_progress" ADD "result" jsonb`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "job_progress" DROP COLUMN "result"`);
  }
}
