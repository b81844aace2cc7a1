// Wire building blocks shared by the contracts: ids, e-mail, roles, units, and the error shape.
// The front end imports these through @contracts, so both sides validate the same way.
import { z } from 'zod';
import { CLUB_ROLES, rolesListText } from './roles';

export const uuidSchema = z.uuid('Must be an id');

export const emailSchema = z
  .string('Must be text')
  .trim()
  .toLowerCase()
  .max(320, 'At most 320 characters')
  .pipe(z.email('Must be an e-mail address'));

export const clubRoleSchema = z.enum(CLUB_ROLES, `Must be ${rolesListText('or')}`);
export type ClubRoleWire = z.infer<typeof clubRoleSchema>;

export const rolesSchema = z
  .array(clubRoleSchema, 'Must be a list of roles')
  .min(1, 'Give at least one role')
  .refine((roles) => new Set(roles).size === roles.length, 'Each role only once');

export const unitSystemSchema = z.enum(['imperial', 'metric'], 'Must be imperial or metric');

export const displayNameSchema = z
  .string('Must be text')
  .trim()
  .min(1, 'Must not be empty')
  .max(120, 'At most 120 characters');

export interface ApiErrorBody {
  /** `requestId` is the id on the server's log lines about the request (and its X-Request-Id header). */
  error: { code: string; message: string; details?: unknown; requestId?: string };
}

export interface FieldIssueWire {
  path: string;
  message: string;
}
