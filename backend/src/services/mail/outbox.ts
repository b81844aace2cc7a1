// mail.enqueue: puts an e-mail into the outbox inside the caller's transaction (pass `manager`), so a
// change and the mail announcing it commit or roll back together. Sending is the dispatcher's job.
import type { DataSource, EntityManager } from 'typeorm';
import { outgoingMailSchema, type OutgoingMail } from '../../contracts/mail';
import { OutboxMessage } from '../../entities';

export interface EnqueueOptions {
  /** The caller's transaction; without it the mail is inserted on its own. */
  manager?: EntityManager;
  /**
   * The same mail enqueued again under this key (a retried job, a repeated request) is stored once:
   * the first row's id comes back and nothing new is sent. At most 200 characters.
   */
  idempotencyKey?: string;
}

export type MailService = ReturnType<typeof createMailService>;

function checked(mail: OutgoingMail, key: string | null): OutgoingMail {
  const parsed = outgoingMailSchema.safeParse(mail);
  if (!parsed.success) {
    const fields = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Error(`mail.enqueue refused a mail of kind "${String(mail.kind)}": ${fields}`);
  }
  if (key !== null && (key.length === 0 || key.length > 200)) throw new Error('mail.enqueue: an idempotency key has 1 to 200 characters');
  return parsed.data;
}

export function createMailService(ds: DataSource) {
  return {
    /**
     * Many mails, each under its own idempotency key, in one INSERT (a re-check page mails up to a
     * few hundred builders; one round trip each would make storing, not checking, the slow part).
     * Returns the outbox id per key: the new row's, or the one already stored under that key.
     */
    async enqueueMany(items: { mail: OutgoingMail; idempotencyKey: string }[], options: { manager?: EntityManager } = {}): Promise<Map<string, string>> {
      const ids = new Map<string, string>();
      if (items.length === 0) return ids;
      const manager = options.manager ?? ds.manager;
      const values: unknown[] = [];
      const tuples = items.map(({ mail, idempotencyKey }, i) => {
        const m = checked(mail, idempotencyKey);
        values.push(m.to, m.subject, m.text, m.html ?? null, m.kind, JSON.stringify(m.related ?? {}), idempotencyKey);
        const b = i * 7;
        return `($${b + 1}, $${b + 2}, $${b + 3}, $${b + 4}, $${b + 5}, $${b + 6}::jsonb, $${b + 7})`;
      });
      const inserted: { id: string; idempotency_key: string }[] = await manager.query(
        `INSERT INTO outbox_messages (to_address, subject, text_body, html_body, kind, related, idempotency_key)
         VALUES ${tuples.join(', ')} ON CONFLICT (idempotency_key) DO NOTHING RETURNING id, idempotency_key`,
        values,
      );
      for (const r of inserted) ids.set(r.idempotency_key, r.id);
      const missing = items.map((i) => i.idempotencyKey).filter((k) => !ids.has(k));
      if (missing.length > 0) {
        const existing: { id: string; idempotency_key: string }[] = await manager.query(
          `SELECT id, idempotency_key FROM outbox_messages WHERE idempotency_key = ANY($1::text[])`,
          [missing],
        );
        for (const r of existing) ids.set(r.idempotency_key, r.id);
      }
      return ids;
    },

    /**
     * Checks and stores one mail; returns its outbox id, and `created: false` when a mail with the same
     * idempotency key was already there (then nothing was stored). A bad mail is a bug in the caller: it throws.
     */
    async enqueue(
      mail: OutgoingMail,
      options: EnqueueOptions = {},
    ): Promise<{ id: string; created: boolean }> {
      const key = options.idempotencyKey ?? null;
      const m = checked(mail, key);
      const manager = options.manager ?? ds.manager;
      const repo = manager.getRepository(OutboxMessage);
      const values = {
        toAddress: m.to,
        subject: m.subject,
        textBody: m.text,
        htmlBody: m.html ?? null,
        kind: m.kind,
        related: m.related,
        status: 'pending' as const,
        attempts: 0,
        lastError: null,
        sentAt: null,
        idempotencyKey: key,
      };
      if (key === null) return { id: (await repo.save(repo.create(values))).id, created: true };
      // ON CONFLICT DO NOTHING: a concurrent or earlier insert under the key wins, and this one is a no-op.
      const inserted = await repo
        .createQueryBuilder()
        .insert()
        .values(values)
        .orIgnore()
        .returning(['id'])
        .execute();
      const id = (inserted.raw as { id: string }[])[0]?.id;
      if (id) return { id, created: true };
      const existing = await repo.findOneOrFail({ where: { idempotencyKey: key }, select: { id: true } });
      return { id: existing.id, created: false };
    },
  };
}
