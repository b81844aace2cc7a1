// Helpers of the mail tests: a free loopback port, and the outbox / mailbox rows as plain values.
import { createServer } from 'node:net';
import type { DataSource } from 'typeorm';

/** A port nobody listens on right now (bound and released), so a sender to it gets ECONNREFUSED. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as { port: number };
      s.close(() => resolve(port));
    });
  });
}

export interface OutboxRow {
  id: string;
  to_address: string;
  subject: string;
  status: string;
  attempts: number;
  next_attempt_at: Date;
  last_error: string | null;
  sent_at: Date | null;
}

export async function outboxRows(ds: DataSource): Promise<OutboxRow[]> {
  return ds.query(
    `SELECT id, to_address, subject, status, attempts, next_attempt_at, last_error, sent_at FROM outbox_messages ORDER BY created_at, subject`,
  );
}

export interface MailboxRow {
  to_address: string;
  from_address: string;
  subject: string;
  text_body: string | null;
  html_body: string | null;
}

export async function mailboxRows(ds: DataSource): Promise<MailboxRow[]> {
  return ds.query(
    `SELECT to_address, from_address, subject, text_body, html_body FROM dev_mailbox ORDER BY subject`,
  );
}

export async function clearMailTables(ds: DataSource): Promise<void> {
  await ds.query('DELETE FROM outbox_messages');
  await ds.query('DELETE FROM dev_mailbox');
}
