// Password reset by e-mail (docs/api.md, "Authentication and account"): a single-use link sent through
// the outbox, valid for an hour. Only the token's SHA-256 is stored. Asking gives the caller nothing to
// tell an address with an account from one without (the route answers the same either way); setting the
// new password voids the user's other open links and ends their sessions.
import { randomBytes } from 'node:crypto';
import { IsNull, type DataSource, type EntityManager } from 'typeorm';
import type { PasswordResetWire } from '../contracts/auth';
import { PasswordReset, User } from '../entities';
import { NotFoundError } from '../errors';
import { renderMail, type MailService } from './mail';
import { hashToken } from './members.service';
import { hashPassword } from './passwords';

export const passwordResetLifetimeMs = 60 * 60 * 1000;

const unusable = () => new NotFoundError('This link has expired or was already used. Ask for a new one.');

export type PasswordResetService = ReturnType<typeof createPasswordResetService>;

export function createPasswordResetService(ds: DataSource, options: { mail: MailService; publicUrl: string; now?: () => Date }) {
  const now = options.now ?? (() => new Date());

  async function usable(tx: EntityManager, token: string, lock: boolean): Promise<{ reset: PasswordReset; user: User }> {
    const reset = await tx.getRepository(PasswordReset).findOne({
      where: { tokenHash: hashToken(token) },
      ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}),
    });
    if (!reset || reset.usedAt !== null || reset.expiresAt <= now()) throw unusable();
    const user = await tx.getRepository(User).findOneBy({ id: reset.userId });
    if (!user || user.passwordHash === null) throw unusable();
    return { reset, user };
  }

  return {
    /**
     * Mails a reset link to the account with this (normalised) address, if there is one that can sign in.
     * An account still waiting for its invitation gets nothing: its invitation link sets the password.
     */
    async request(email: string): Promise<void> {
      const user = await ds.getRepository(User).findOneBy({ email });
      if (!user || user.passwordHash === null) return;
      const token = randomBytes(32).toString('base64url');
      const mail = renderMail({
        subject: 'Choose a new Cagewright password',
        greeting: `Hello ${user.displayName},`,
        paragraphs: [
          `Someone asked for a new password for the Cagewright account of ${user.email}. If that was you, choose one with the link below. The link works once, within an hour.`,
          'If it was not you, ignore this mail: your password stays as it is.',
        ],
        action: { label: 'Choose a new password', url: `${options.publicUrl}/reset-password/${token}` },
        reason: 'You get this mail because a new password was asked for this address on Cagewright.',
      });
      await ds.transaction(async (tx) => {
        // Links dead for a day go as new ones come, so the table stays small.
        await tx.query(`DELETE FROM "password_resets" WHERE "expires_at" < $1`, [new Date(now().getTime() - 24 * 3600 * 1000)]);
        await tx.getRepository(PasswordReset).insert({
          tokenHash: hashToken(token),
          userId: user.id,
          expiresAt: new Date(now().getTime() + passwordResetLifetimeMs),
          usedAt: null,
        });
        await options.mail.enqueue({ to: user.email, kind: 'account.password_reset', related: { userId: user.id }, ...mail }, { manager: tx });
      });
    },

    /** The address a usable link belongs to; 404 for every link that cannot be used. */
    async lookup(token: string): Promise<PasswordResetWire> {
      const { user } = await usable(ds.manager, token, false);
      return { email: user.email };
    },

    /** Sets the new password, voids every open link of the user and ends their sessions (but `keepSessionId`). */
    async complete(token: string, password: string, keepSessionId: string): Promise<void> {
      await usable(ds.manager, token, false); // a dead link costs no hash
      const passwordHash = await hashPassword(password);
      await ds.transaction(async (tx) => {
        // Locked and checked again: two uses of one link at once, and only one wins.
        const { user } = await usable(tx, token, true);
        await tx.getRepository(User).update({ id: user.id }, { passwordHash });
        await tx.getRepository(PasswordReset).update({ userId: user.id, usedAt: IsNull() }, { usedAt: now() });
        await tx.query(`DELETE FROM "session" WHERE sess->'passport'->>'user' = $1 AND sid <> $2`, [user.id, keepSessionId]);
      });
    },
  };
}
