// mail.enqueue: puts an e-mail into the outbox inside the caller's transaction (pass `manager`), so a
// change and the mail announcing it commit or roll back together. Sending is the dispatcher's job.
import type { DataSource, EntityManager } from 'typeorm';
import { outgoingMailSchema, type OutgoingMail } from '../../contracts/mail';
import { OutboxMessage } from '../../entities';

export interface EnqueueOptions {
  /** The caller's transaction; without it the mail is inserted on its own. */
  manager?: EntityManager;
}

export type MailService = ReturnType<typeof createMailService>;

export function createMailService(ds: DataSource) {
  return {
    /** Checks and stores one mail; returns its outbox id. A bad mail is a bug in the caller: it throws. */
    async enqueue(mail: OutgoingMail, options: EnqueueOptions = {}): Promise<{ id: string }> {
      const parsed = outgoingMailSchema.safeParse(mail);
      if (!parsed.success) {
        const fields = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
        throw new Error(`mail.enqueue refused a mail of kind "${String(mail.kind)}": ${fields}`);
      }
      const m = parsed.data;
      const repo = (options.manager ?? ds.manager).getRepository(OutboxMessage);
      const row = await repo.save(
        repo.create({
          toAddress: m.to,
          subject: m.subject,
          textBody: m.text,
          htmlBody: m.html ?? null,
          kind: m.kind,
          related: m.related,
          status: 'pending',
          attempts: 0,
          lastError: null,
          sentAt: null,
        }),
      );
      return { id: row.id };
    },
  };
}
