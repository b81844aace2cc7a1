// The development mailbox (admins, only while the server runs its fake SMTP server) and the server's
// meta answer that says whether it does.
import { http } from './http';
import type { MailboxListWire, MailboxMessageWire, MailboxSummaryWire, MetaWire } from '@contracts/mail';

export type MailboxSummary = MailboxSummaryWire;
export type MailboxMessage = MailboxMessageWire;
export type ServerMeta = MetaWire;

export function fetchMeta(): Promise<ServerMeta> {
  return http.get<ServerMeta>('/meta', { allowUnauthenticated: true });
}

export async function listMailbox(): Promise<MailboxSummary[]> {
  const { messages } = await http.get<MailboxListWire>('/dev/mailbox');
  return messages;
}

export async function getMailboxMessage(id: string): Promise<MailboxMessage> {
  const { message } = await http.get<{ message: MailboxMessage }>(`/dev/mailbox/${encodeURIComponent(id)}`);
  return message;
}

export function clearMailbox(): Promise<void> {
  return http.delete('/dev/mailbox');
}
