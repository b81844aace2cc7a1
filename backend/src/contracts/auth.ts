// Wire contracts for sign-in, the session's user, the account and invitations (docs/api.md).
import { z } from 'zod';
import { displayNameSchema, emailSchema, unitSystemSchema, type ClubRoleWire } from './common';

// Long inputs are refused before they reach the (deliberately slow) password hash.
const passwordInput = z.string('Must be text').min(1, 'Must not be empty').max(200, 'At most 200 characters');
export const newPasswordSchema = z
  .string('Must be text')
  .min(10, 'At least 10 characters')
  .max(200, 'At most 200 characters');

export const loginBodySchema = z.object({ email: emailSchema, password: passwordInput });
export type LoginBody = z.infer<typeof loginBodySchema>;

export const changePasswordBodySchema = z.object({ currentPassword: passwordInput, newPassword: newPasswordSchema });
export type ChangePasswordBody = z.infer<typeof changePasswordBodySchema>;

export const updateAccountBodySchema = z
  .object({ displayName: displayNameSchema.optional(), preferredUnits: unitSystemSchema.optional() })
  .strict();
export type UpdateAccountBody = z.infer<typeof updateAccountBodySchema>;

export const invitationTokenParamsSchema = z.object({
  token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, 'Not an invitation token'),
});

export const acceptInvitationBodySchema = z.object({
  password: newPasswordSchema,
  displayName: displayNameSchema.optional(),
});
export type AcceptInvitationBody = z.infer<typeof acceptInvitationBodySchema>;

export interface UserWire {
  id: string;
  email: string;
  displayName: string;
  preferredUnits: 'imperial' | 'metric';
}

export interface MembershipWire {
  club: { id: string; slug: string; name: string };
  roles: ClubRoleWire[];
}

/** `GET /api/auth/me`, `POST /api/auth/login`, `POST /api/invitations/:token/accept`. */
export interface SessionWire {
  user: UserWire;
  memberships: MembershipWire[];
}

export interface CsrfWire {
  token: string;
}

export interface InvitationWire {
  email: string;
  clubName: string;
}
