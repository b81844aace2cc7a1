// Accounts: checking credentials, the signed-in view (user + memberships), profile and password.
import type { DataSource } from 'typeorm';
import type { SessionWire, UpdateAccountBody, UserWire } from '../contracts/auth';
import { Membership, User } from '../entities';
import { UnauthenticatedError, ValidationError } from '../errors';
import { hashPassword, needsRehash, verifyAgainstDummy, verifyPassword } from './passwords';
import { membershipView, userView } from './views';

export type AccountService = ReturnType<typeof createAccountService>;

/** Signed-in sessions one user may hold at once (phone, laptop, the garage PC…); signing in again ends the oldest. */
export const maxSessionsPerUser = 10;

export function createAccountService(ds: DataSource) {
  const users = ds.getRepository(User);
  const memberships = ds.getRepository(Membership);

  async function requireUser(userId: string): Promise<User> {
    const user = await users.findOneBy({ id: userId });
    if (!user) throw new UnauthenticatedError();
    return user;
  }

  return {
    findById(userId: string): Promise<User | null> {
      return users.findOneBy({ id: userId });
    },

    /**
     * The user for this e-mail and password, or null. Unknown e-mails and accounts still waiting for
     * their invitation cost one hash too, so timing does not tell them apart from a wrong password.
     */
    async verifyCredentials(email: string, password: string): Promise<User | null> {
      const user = await users.findOneBy({ email: email.trim().toLowerCase() });
      if (!user || user.passwordHash === null) return verifyAgainstDummy(password).then(() => null);
      if (!(await verifyPassword(password, user.passwordHash))) return null;
      if (needsRehash(user.passwordHash)) {
        await users.update({ id: user.id }, { passwordHash: await hashPassword(password) });
      }
      return user;
    },

    async sessionView(userId: string): Promise<SessionWire> {
      const user = await requireUser(userId);
      const rows = await memberships.find({ where: { userId }, relations: { club: true }, order: { club: { name: 'ASC' } } });
      return { user: userView(user), memberships: rows.map(membershipView) };
    },

    async updateAccount(userId: string, patch: UpdateAccountBody): Promise<UserWire> {
      const user = await requireUser(userId);
      if (patch.displayName !== undefined) user.displayName = patch.displayName;
      if (patch.preferredUnits !== undefined) user.preferredUnits = patch.preferredUnits;
      await users.save(user);
      return userView(user);
    },

    /**
     * Keeps the session rows bounded: after a sign-in, the user's sessions beyond the newest
     * `maxSessionsPerUser` (by last use) end. `currentSessionId` is the new one, not stored yet.
     * `expire` moves with every use but only to the second; the cookie's expiry in `sess` (milliseconds,
     * rewritten at each save) breaks the ties.
     */
    async endOldestSessions(userId: string, currentSessionId: string, max = maxSessionsPerUser): Promise<void> {
      await ds.query(
        `DELETE FROM "session" WHERE sid IN (
           SELECT sid FROM "session" WHERE sess->'passport'->>'user' = $1 AND sid <> $2
           ORDER BY expire DESC, sess->'cookie'->>'expires' DESC OFFSET $3)`,
        [userId, currentSessionId, Math.max(0, max - 1)],
      );
    },

    /** Changes the password and signs the user out everywhere else (all other sessions end). */
    async changePassword(userId: string, currentPassword: string, newPassword: string, keepSessionId: string): Promise<void> {
      const user = await requireUser(userId);
      if (user.passwordHash === null || !(await verifyPassword(currentPassword, user.passwordHash))) {
        throw new ValidationError([{ path: 'currentPassword', message: 'The current password is wrong' }]);
      }
      const passwordHash = await hashPassword(newPassword);
      await ds.transaction(async (tx) => {
        await tx.getRepository(User).update({ id: user.id }, { passwordHash });
        await tx.query(`DELETE FROM "session" WHERE sess->'passport'->>'user' = $1 AND sid <> $2`, [user.id, keepSessionId]);
      });
    },
  };
}
