// Wire contracts for sign-in, the session's user, the account, password reset and invitations (docs/api.md).
import { z } from 'zod';
import { displayNameSchema, emailSchema, unitSystemSchema, type ClubRoleWire } from './common';
import { passwordMaxLength, passwordMinLength } from './password-rules';

export { passwordMaxLength, passwordMinLength } from './password-rules';

// Long inputs are refused before they reach the (deliberately slow) password hash.
const passwordInput = z.string('Must be text').min(1, 'Must not be empty').max(passwordMaxLength, `At most ${passwordMaxLength} characters`);
export const newPasswordSchema = z
  .string('Must be text')
  .min(passwordMinLength, `At least ${passwordMinLength} characters`)
  .max(passwordMaxLength, `At most ${passwordMaxLength} characters`);

export const loginBodySchema = z.object({ email: emailSchema, password: passwordInput });
export type LoginBody = z.infer<typeof loginBodySchema>;

export const changePasswordBodySchema = z.object({ currentPassword: passwordInput, newPassword: newPasswordSchema });
export type ChangePasswordBody = z.infer<typeof changePasswordBodySchema>;

export const updateAccountBodySchema = z
  .object({ displayName: displayNameSchema.optional(), preferredUnits: unitSystemSchema.optional() })
  .strict();
export type UpdateAccountBody = z.infer<typeof updateAccountBodySchema>;

export const passwordResetRequestBodySchema = z.object({ email: emailSchema });
export type PasswordResetRequestBody = z.infer<typeof passwordResetRequestBodySchema>;

export const passwordResetTokenParamsSchema = z.object({
  token: z.string().regex(/^[A-Za-z0-9_-]{43}$/, 'Not a reset token'),
});

export const passwordResetBodySchema = z.object({ password: newPasswordSchema });
export type PasswordResetBody = z.infer<typeof passwordResetBodySchema>;

/** `POST /api/auth/password-reset`: the same answer whether or not the address has an account. */
export interface PasswordResetRequestedWire {
  message: string;
}

/** `GET /api/auth/password-reset/:token`. */
export interface PasswordResetWire {
  email: string;
}

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
