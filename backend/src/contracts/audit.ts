// Wire contracts of a club's activity log (docs/api.md, "Activity log").
import { z } from 'zod';
import { uuidSchema } from './common';

export const auditQuerySchema = z.object({
  page: z.coerce.number('Must be a number').int('Must be a whole number').min(1, 'At least 1').default(1),
  pageSize: z.coerce
    .number('Must be a number')
    .int('Must be a whole number')
    .min(1, 'At least 1')
    .max(100, 'At most 100')
    .default(25),
  action: z
    .string()
    .regex(/^[a-z][a-z0-9_]*(\.[a-z][a-z0-9_]*)+$/, 'Must look like area.event')
    .max(80)
    .optional(),
  /** Only entries about this car (a submission, record, sheet or journal entry of it). */
  carId: uuidSchema.optional(),
  /** Only entries this person made or that are about them (their membership, their submissions). */
  personId: uuidSchema.optional(),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

/**
 * A thing an entry names, resolved when the log is read: its id, the name to show, and whether the
 * reader can open its page (a deleted draft, a person no longer in the club, a car only its owner
 * opens: false).
 */
export interface AuditRefWire {
  id: string;
  name: string;
  open: boolean;
}

/** What an entry is about, by kind; each absent when the entry names no such thing. */
export interface AuditSubjectsWire {
  /** The person the entry concerns (a member added or removed, the builder of a submission). */
  person?: AuditRefWire & { email: string };
  car?: AuditRefWire;
  sheet?: AuditRefWire;
  /** A cage record; `name` is its number. */
  record?: AuditRefWire;
  /** A rulebook version; `name` reads "<rulebook title>, version N (edition E)". */
  edition?: AuditRefWire;
  submission?: AuditRefWire;
  /** For an invitation: what the outbox did with its e-mail (null: no e-mail was sent). */
  invitationMail?: {
    status: 'pending' | 'sending' | 'sent' | 'failed_permanently';
    sentAt: string | null;
  } | null;
}

export interface AuditEntryWire {
  id: string;
  action: string;
  entityType: string;
  entityId: string | null;
  /** Who did it; null for the system (a job, the seed) or an actor no longer known. */
  actor: { id: string; email: string; displayName: string; open: boolean } | null;
  details: Record<string, unknown>;
  subjects: AuditSubjectsWire;
  createdAt: string;
}

export interface AuditFilterOption {
  id: string;
  name: string;
  /** What tells two of the same name apart: a person's e-mail, a car's owner. */
  hint: string;
}

export interface AuditPageWire {
  entries: AuditEntryWire[];
  page: number;
  pageSize: number;
  total: number;
  /** Every action that occurs in this club's log, for the filter. */
  actions: string[];
  /** The club's cars (those with a build sheet in it), for the car filter, by name. */
  cars: AuditFilterOption[];
  /** The club's members and everyone who appears in its log, for the person filter, by name. */
  people: AuditFilterOption[];
}
