// The development mailbox: what the local fake SMTP server caught (dev_mailbox), newest first. Only
// reachable while FAKE_SMTP is on; the routes are not mounted otherwise.
import type { DataSource } from 'typeorm';
import type { MailboxMessageWire, MailboxSummaryWire } from '../../contracts/mail';
import { NotFoundError } from '../../errors';

interface Row {
  id: string;
  to_address: string;
  from_address: string;
  subject: string;
  text_body: string | null;
  html_body: string | null;
  received_at: Date;
}

/** Newest first; the page shows this many at most (older ones stay until cleared). */
export const mailboxListLimit = 200;

function summary(r: Row): MailboxSummaryWire {
  return {
    id: r.id,
    to: r.to_address,
    from: r.from_address,
    subject: r.subject,
    receivedAt: r.received_at.toISOString(),
    hasHtml: r.html_body !== null,
  };
}

export interface StoredMail {
  to: string;
  from: string;
  subject: string;
  text: string | null;
  html: string | null;
}

export type MailboxService = ReturnType<typeof createMailboxService>;

export function createMailboxService(ds: DataSource) {
  return {
    async store(mail: StoredMail): Promise<string> {
      const rows: { id: string }[] = await ds.query(
        `INSERT INTO dev_mailbox (to_address, from_address, subject, text_body, html_body) VALUES ($1, $2, $3, $4, $5) RETURNING id`,
        [mail.to, mail.from, mail.subject, mail.text, mail.html],
      );
      return rows[0]!.id;
    },

    async list(): Promise<MailboxSummaryWire[]> {
      const rows: Row[] = await ds.query(
        `SELECT id, to_address, from_address, subject, NULL AS text_body, CASE WHEN html_body IS NULL THEN NULL ELSE '' END AS html_body, received_at
         FROM dev_mailbox ORDER BY received_at DESC, id LIMIT $1`,
        [mailboxListLimit],
      );
      return rows.map(summary);
    },

    async get(id: string): Promise<MailboxMessageWire> {
      const rows: Row[] = await ds.query(`SELECT * FROM dev_mailbox WHERE id = $1`, [id]);
      const r = rows[0];
      if (!r) throw new NotFoundError('No such message in the mailbox.');
      return { ...summary(r), text: r.text_body, html: r.html_body };
    },

    async clear(): Promise<number> {
      const [, count]: [unknown, number] = await ds.query(`DELETE FROM dev_mailbox`);
      return count;
    },
  };
}
