// Jobs that finish after a crash (issue 12, §2):
// - outbox_messages.idempotency_key: a mail enqueued twice under one key (a retried job, say) is stored
//   once, so it can never be sent twice;
// - job_progress: `attempts` (how many times a worker started it), `heartbeat_at` (the running worker
//   writes it every few seconds; a stale one means the worker died and the job is handed back to
//   pg-boss to retry) and the `retrying` state (failed an attempt, another is coming).
import type { MigrationInterface, QueryRunner } from 'typeorm';

export class ResumableJobs1796083812000 implements MigrationInterface {
  name = 'ResumableJobs1796083812000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE "outbox_messages" ADD "idempotency_key" character varying(200)`);
    await queryRunner.query(`ALTER TABLE "outbox_messages" ADD CONSTRAINT "UQ_outbox_messages_idempotency_key" UNIQUE ("idempotency_key")`);
    await queryRunner.query(`ALTER TABLE "job_progress" ADD "attempts" integer NOT NULL DEFAULT 0`);
    await queryRunner.query(`ALTER TABLE "job_progress" ADD "heartbeat_at" TIMESTAMP WITH TIME ZONE`);
    await queryRunner.query(`ALTER TABLE "job_progress" DROP CONSTRAINT "CHK_job_progress_state"`);
    await queryRunner.query(`ALTER TABLE "job_progress" ADD CONSTRAINT "CHK_job_progress_state" CHECK ("state" IN ('queued', 'running', 'retrying', 'completed', 'failed'))`);
    await queryRunner.query(`CREATE INDEX "IDX_job_progress_running" ON "job_progress" ("heartbeat_at") WHERE "state" = 'running'`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX "IDX_job_progress_running"`);
    await queryRunner.query(`UPDATE "job_progress" SET "state" = 'queued' WHERE "state" = 'retrying'`);
    await queryRunner.query(`ALTER TABLE "job_progress" DROP CONSTRAINT "CHK_job_progress_state"`);
    await queryRunner.query(`ALTER TABLE "job_progress" ADD CONSTRAINT "CHK_job_progress_state" CHECK ("state" IN ('queued', 'running', 'completed', 'failed'))`);
    await queryRunner.query(`ALTER TABLE "job_progress" DROP COLUMN "heartbeat_at"`);
    await queryRunner.query(`ALTER TABLE "job_progress" DROP COLUMN "attempts"`);
    await queryRunner.query(`ALTER TABLE "outbox_messages" DROP CONSTRAINT "UQ_outbox_messages_idempotency_key"`);
    await queryRunner.query(`ALTER TABLE "outbox_messages" DROP COLUMN "idempotency_key"`);
  }
}
