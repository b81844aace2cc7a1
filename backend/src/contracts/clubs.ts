// Wire contracts for a club's members and settings (docs/api.md, "Clubs and members").
import { z } from 'zod';
import { isTimeZone } from '../domain/dates';
import { emailSchema, rolesSchema, uuidSchema, type ClubRoleWire } from './common';

export const clubParamsSchema = z.object({ clubId: uuidSchema });
export const memberParamsSchema = z.object({ clubId: uuidSchema, userId: uuidSchema });

export const addMemberBodySchema = z.object({ email: emailSchema, roles: rolesSchema });
export type AddMemberBody = z.infer<typeof addMemberBodySchema>;

export const updateMemberBodySchema = z.object({ roles: rolesSchema });
export type UpdateMemberBody = z.infer<typeof updateMemberBodySchema>;

export interface MemberWire {
  user: { id: string; email: string; displayName: string };
  roles: ClubRoleWire[];
  /** True while the person has not yet accepted the invitation (no password set). */
  invitationPending: boolean;
}

export interface MembersListWire {
  members: MemberWire[];
}

export interface AddMemberWire {
  member: MemberWire;
  /** Present when an invitation was created; the admin may pass the link on as well. */
  invitationUrl?: string;
  /** True when the invitation was also queued as an e-mail to the person (the outbox sends it). */
  invitationMailed?: boolean;
}

// ---------------------------------------------------------------- club settings

/** The zone the club's dates are read in: an IANA name Intl knows ("Europe/London", "UTC"). */
export const clubSettingsBodySchema = z
  .object({
    timeZone: z
      .string('Must be a time zone name')
      .trim()
      .refine(isTimeZone, 'Not a time zone name this server knows; choose one from the list (for example Europe/London or UTC)'),
  })
  .strict();
export type ClubSettingsBody = z.infer<typeof clubSettingsBodySchema>;

export interface ClubSettingsWire {
  timeZone: string;
  /** The club's calendar date now, YYYY-MM-DD, in its time zone. */
  today: string;
}
