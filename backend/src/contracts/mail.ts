// Wire and call contracts for outgoing mail and the development mailbox (docs/mail-and-jobs.md).
import { z } from 'zod';
import { emailSchema, uuidSchema } from './common';

/** What a service hands to `mail.enqueue`. Checked before insert, so a bad mail fails at its cause. */
export const outgoingMailSchema = z.object({
  to: emailSchema,
  subject: z.string().trim().min(1, 'Must not be empty').max(300, 'At most 300 characters'),
  text: z.string().min(1, 'Must not be empty').max(200_000, 'At most 200,000 characters'),
  html: z.string().max(400_000, 'At most 400,000 characters').optional(),
  /** `<area>.<event>`, lower case: `verdict.changed`, `review.decided`. */
  kind: z
    .string()
    .regex(/^[a-z][a-z0-9_]*(\.[a-z][a-z0-9_]*)+$/, 'Must look like area.event')
    .max(80),
  related: z.record(z.string(), z.string().max(200)).default({}),
});
export type OutgoingMail = z.input<typeof outgoingMailSchema>;

export const mailboxParamsSchema = z.object({ id: uuidSchema });

export interface MailboxSummaryWire {
  id: string;
  to: string;
  from: string;
  subject: string;
  receivedAt: string;
  hasHtml: boolean;
}

export interface MailboxMessageWire extends MailboxSummaryWire {
  text: string | null;
  html: string | null;
}

export interface MailboxListWire {
  messages: MailboxSummaryWire[];
}

export interface MetaWire {
  /** True while the server runs the local fake SMTP server (FAKE_SMTP): the Mailbox page exists. */
  mailboxEnabled: boolean;
  version: string;
}
