// Wire contracts of a club's activity log (docs/api.md, "Activity log").
import { z } from 'zod';

export const auditActions = [
  'membership.added',
  'membership.roles_changed',
  'membership.removed',
  'invitation.accepted',
] as const;

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
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export interface AuditEntryWire {
  id: string;
  action: string;
  entityType: string;
  entityId: string | null;
  /** Who did it; null for the system (a job, the seed) or an actor no longer known. */
  actor: { id: string; email: string; displayName: string } | null;
  details: Record<string, unknown>;
  createdAt: string;
}

export interface AuditPageWire {
  entries: AuditEntryWire[];
  page: number;
  pageSize: number;
  total: number;
  /** Every action that occurs in this club's log, for the filter. */
  actions: string[];
}
