// One e-mail waiting to go out, or gone. Services insert rows inside their own transaction (so a decision
// and the mail announcing it commit together); the dispatcher (services/mail/dispatcher.ts) sends them.
import { Check, Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, Unique } from 'typeorm';

export const outboxStatuses = ['pending', 'sending', 'sent', 'failed_permanently'] as const;
export type OutboxStatus = (typeof outboxStatuses)[number];

@Entity({ name: 'outbox_messages' })
@Check('CHK_outbox_messages_status', `"status" IN ('pending', 'sending', 'sent', 'failed_permanently')`)
@Index('IDX_outbox_messages_due', ['status', 'nextAttemptAt'])
@Unique('UQ_outbox_messages_idempotency_key', ['idempotencyKey'])
export class OutboxMessage {
  @PrimaryGeneratedColumn('uuid')
  id!: string;

  @Column({ name: 'to_address', type: 'varchar', length: 320 })
  toAddress!: string;

  @Column({ type: 'varchar', length: 300 })
  subject!: string;

  @Column({ name: 'text_body', type: 'text' })
  textBody!: string;

  @Column({ name: 'html_body', type: 'text', nullable: true })
  htmlBody!: string | null;

  /** What the mail is about, e.g. `verdict.changed`; for logs and later filtering. */
  @Column({ type: 'varchar', length: 80 })
  kind!: string;

  /** Ids of the things the mail concerns (`{ clubId, buildSheetId }`), never used to authorise. */
  @Column({ type: 'jsonb', default: () => "'{}'" })
  related!: Record<string, string>;

  @Column({ type: 'varchar', length: 20, default: 'pending' })
  status!: OutboxStatus;

  @Column({ type: 'int', default: 0 })
  attempts!: number;

  /** When the next try is due; while `sending`, when the claim lapses (a crashed sender's rows return). */
  @Column({ name: 'next_attempt_at', type: 'timestamptz', default: () => 'now()' })
  nextAttemptAt!: Date;

  @Column({ name: 'last_error', type: 'text', nullable: true })
  lastError!: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt!: Date;

  @Column({ name: 'sent_at', type: 'timestamptz', nullable: true })
  sentAt!: Date | null;

  /** Set by callers that may enqueue the same mail again (a retried job): one row per key, ever. */
  @Column({ name: 'idempotency_key', type: 'varchar', length: 200, nullable: true })
  idempotencyKey!: string | null;
}
