// Wire contracts for a club's members (docs/api.md, "Clubs and members").
import { z } from 'zod';
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
