// The shared plumbing of mail, jobs and the activity log:
// - outbox_messages (entity): e-mails committed with the change they announce, sent by the dispatcher;
// - audit_entries (entity): the append-only activity log, guarded by a trigger that refuses UPDATE and
//   DELETE (TRUNCATE, an owner's maintenance act, stays possible; the tests reset with it);
// - dev_mailbox (plain table): what the local fake SMTP server caught; unused in production;
// - job_progress (plain table): progress of pg-boss jobs, with the club that owns each job.
// pg-boss keeps its own tables in the `pgboss` schema and creates them itself at start.
// Entity tables were generated from the entities with TypeORM's schema builder (no drift).
import type { MigrationInterface, QueryRunner } from 'typeorm';

/** SQLSTATE the append-only trigger raises (CW001 is the frozen-row code of the ruleset migration). */
export const appendOnlySqlState = 'CW002';

export class OutboxAndAudit1796083500000 implements MigrationInterface {
  name = 'OutboxAndAudit1796083500000';

  public async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE TABLE "outbox_messages" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "to_address" character varying(320) NOT NULL, "subject" character varying(300) NOT NULL, "text_body" text NOT NULL, "html_body" text, "kind" character varying(80) NOT NULL, "related" jsonb NOT NULL DEFAULT '{}', "status" character varying(20) NOT NULL DEFAULT 'pending', "attempts" integer NOT NULL DEFAULT '0', "next_attempt_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "last_error" text, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "sent_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "CHK_outbox_messages_status" CHECK ("status" IN ('pending', 'sending', 'sent', 'failed_permanently')), CONSTRAINT "PK_0171348f527c64b137e4d4f5b66" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_outbox_messages_due" ON "outbox_messages"  ("status", "next_attempt_at") `);
    await queryRunner.query(`CREATE TABLE "audit_entries" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "club_id" uuid, "actor_id" uuid, "action" character varying(80) NOT NULL, "entity_type" character varying(80) NOT NULL, "entity_id" character varying(80), "details" jsonb NOT NULL DEFAULT '{}', "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_6b1623bcad4d04530b76548d619" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_audit_entries_club_created" ON "audit_entries"  ("club_id", "created_at") `);
    await queryRunner.query(`CREATE FUNCTION "audit_entries_append_only"() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'audit_entries is append-only: % refused', TG_OP USING ERRCODE = '${appendOnlySqlState}';
      END $$`);
    await queryRunner.query(`CREATE TRIGGER "TRG_audit_entries_append_only" BEFORE UPDATE OR DELETE ON "audit_entries" FOR EACH ROW EXECUTE FUNCTION "audit_entries_append_only"()`);

    await queryRunner.query(`CREATE TABLE "dev_mailbox" ("id" uuid NOT NULL DEFAULT gen_random_uuid(), "to_address" text NOT NULL, "from_address" text NOT NULL, "subject" text NOT NULL, "text_body" text, "html_body" text, "received_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), CONSTRAINT "PK_dev_mailbox" PRIMARY KEY ("id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_dev_mailbox_received" ON "dev_mailbox" ("received_at")`);
    await queryRunner.query(`CREATE TABLE "job_progress" ("job_id" uuid NOT NULL, "queue" character varying(80) NOT NULL, "club_id" uuid, "requested_by" uuid, "state" character varying(20) NOT NULL DEFAULT 'queued', "total" integer, "done" integer NOT NULL DEFAULT 0, "failed" integer NOT NULL DEFAULT 0, "error" text, "created_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "updated_at" TIMESTAMP WITH TIME ZONE NOT NULL DEFAULT now(), "finished_at" TIMESTAMP WITH TIME ZONE, CONSTRAINT "CHK_job_progress_state" CHECK ("state" IN ('queued', 'running', 'completed', 'failed')), CONSTRAINT "CHK_job_progress_counts" CHECK ("done" >= 0 AND "failed" >= 0 AND ("total" IS NULL OR "total" >= 0)), CONSTRAINT "PK_job_progress" PRIMARY KEY ("job_id"))`);
    await queryRunner.query(`CREATE INDEX "IDX_job_progress_club" ON "job_progress" ("club_id", "created_at")`);
  }

  public async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE "job_progress"`);
    await queryRunner.query(`DROP TABLE "dev_mailbox"`);
    await queryRunner.query(`DROP TRIGGER "TRG_audit_entries_append_only" ON "audit_entries"`);
    await queryRunner.query(`DROP FUNCTION "audit_entries_append_only"()`);
    await queryRunner.query(`DROP INDEX "public"."IDX_audit_entries_club_created"`);
    await queryRunner.query(`DROP TABLE "audit_entries"`);
    await queryRunner.query(`DROP INDEX "public"."IDX_outbox_messages_due"`);
    await queryRunner.query(`DROP TABLE "outbox_messages"`);
  }
}
