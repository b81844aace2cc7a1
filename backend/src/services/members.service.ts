// A club's members, for its admins: list, add (by e-mail, inviting people without an account: the link
// is e-mailed through the outbox and also returned for the admin to copy),
// change roles, remove, and the invitation accept path. The club row is locked while a change runs,
// so two admins cannot both remove the last admin at once. Every change is written to the activity log
// in the same transaction.
import { createHash, randomBytes } from 'node:crypto';
import { IsNull, type DataSource, type EntityManager } from 'typeorm';
import type { AddMemberBody } from '../contracts/clubs';
import type { AddMemberWire, MemberWire } from '../contracts/clubs';
import type { InvitationWire } from '../contracts/auth';
import { Club, Invitation, Membership, User, type ClubRole } from '../entities';
import { ConflictError, NotFoundError } from '../errors';
import type { AuditService } from './audit.service';
import { mailInvitation } from './invitation-mail';
import type { MailService } from './mail';
import { hashPassword } from './passwords';
import { memberView } from './views';

export const invitationLifetimeMs = 14 * 24 * 60 * 60 * 1000;

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export type MemberService = ReturnType<typeof createMemberService>;

export function createMemberService(ds: DataSource, options: { publicUrl: string; audit: AuditService; mail: MailService; now?: () => Date }) {
  const now = options.now ?? (() => new Date());
  const { audit } = options;

  async function lockClub(tx: EntityManager, clubId: string): Promise<Club> {
    const club = await tx.getRepository(Club).findOne({ where: { id: clubId }, lock: { mode: 'pessimistic_write' } });
    if (!club) throw new NotFoundError('Club not found.');
    return club;
  }

  async function findMember(tx: EntityManager, clubId: string, userId: string): Promise<Membership> {
    const m = await tx.getRepository(Membership).findOne({ where: { clubId, userId }, relations: { user: true } });
    if (!m) throw new NotFoundError('Member not found.');
    return m;
  }

  /** Refuses a change that would leave the club without an active (signed-up) admin. */
  async function keepAnAdmin(tx: EntityManager, member: Membership, rolesAfter: ClubRole[]): Promise<void> {
    const losesAdmin = member.roles.includes('admin') && !rolesAfter.includes('admin');
    if (!losesAdmin || member.user?.passwordHash === null) return;
    const others: { n: number }[] = await tx.query(
      `SELECT count(*)::int AS n FROM memberships m JOIN users u ON u.id = m.user_id
       WHERE m.club_id = $1 AND m.user_id <> $2 AND 'admin' = ANY(m.roles) AND u.password_hash IS NOT NULL`,
      [member.clubId, member.userId],
    );
    if ((others[0]?.n ?? 0) === 0) {
      throw new ConflictError('A club needs at least one admin. Give someone else the admin role first.');
    }
  }

  async function usableInvitation(tx: EntityManager, token: string, lock: boolean): Promise<{ invitation: Invitation; user: User }> {
    const invitation = await tx.getRepository(Invitation).findOne({
      where: { tokenHash: hashToken(token) },
      ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}),
    });
    const user = invitation ? await tx.getRepository(User).findOneBy({ email: invitation.email }) : null;
    if (!invitation || !user || invitation.acceptedAt !== null || invitation.expiresAt <= now() || user.passwordHash !== null) {
      throw new NotFoundError('This invitation link is not valid any more. Ask the club admin for a new one.');
    }
    return { invitation, user };
  }

  return {

    async list(clubId: string): Promise<MemberWire[]> {
      const rows = await ds.getRepository(Membership).find({
        where: { clubId },
        relations: { user: true },
        order: { user: { displayName: 'ASC', email: 'ASC' } },
      });
      return rows.map(memberView);
    },

    async add(clubId: string, invitedById: string, body: AddMemberBody): Promise<AddMemberWire> {
      return ds.transaction(async (tx) => {
        const club = await lockClub(tx, clubId);
        const users = tx.getRepository(User);
        let user = await users.findOneBy({ email: body.email });
        if (user && (await tx.getRepository(Membership).existsBy({ clubId, userId: user.id }))) {
          throw new ConflictError('This person is already a member of the club.');
        }
        // Someone without an account gets a placeholder user (no password) until they accept.
        user ??= await users.save(users.create({ email: body.email, displayName: body.email.split('@')[0]!, passwordHash: null }));
        const membership = await tx.getRepository(Membership).save({ clubId, userId: user.id, roles: body.roles });
        membership.user = user;
        const invited = user.passwordHash === null;
        if (!invited) {
          await audit.record(
            { clubId, actorId: invitedById, action: 'membership.added', entity: { type: 'membership', id: user.id }, details: { email: user.email, roles: body.roles, invited } },
            { manager: tx },
          );
          return { member: memberView(membership) };
        }

        const token = randomBytes(32).toString('base64url');
        const expiresAt = new Date(now().getTime() + invitationLifetimeMs);
        await tx.getRepository(Invitation).save({
          tokenHash: hashToken(token),
          email: user.email,
          clubId,
          roles: body.roles,
          invitedById: invitedById,
          expiresAt,
          acceptedAt: null,
        });
        const invitationUrl = `${options.publicUrl}/invitations/${token}`;
        const inviter = await tx.getRepository(User).findOneBy({ id: invitedById });
        const mailId = await mailInvitation(options.mail, tx, {
          to: user.email, clubId, clubName: club.name, inviterName: inviter?.displayName ?? `An admin of ${club.name}`, roles: body.roles, url: invitationUrl, expiresAt, timeZone: club.timeZone,
        });
        // The log reads the outbox row (mailId) to say "e-mailed" once it went out, "invited" until then.
        await audit.record(
          { clubId, actorId: invitedById, action: 'membership.added', entity: { type: 'membership', id: user.id }, details: { email: user.email, roles: body.roles, invited, mailId } },
          { manager: tx },
        );
        return { member: memberView(membership), invitationUrl, invitationMailed: true };
      });
    },

    async updateRoles(clubId: string, userId: string, roles: ClubRole[], actorId: string | null = null): Promise<MemberWire> {
      return ds.transaction(async (tx) => {
        await lockClub(tx, clubId);
        const member = await findMember(tx, clubId, userId);
        await keepAnAdmin(tx, member, roles);
        const before = member.roles;
        member.roles = roles;
        await audit.record(
          {
            clubId,
            actorId,
            action: 'membership.roles_changed',
            entity: { type: 'membership', id: userId },
            details: { email: member.user?.email, before, after: roles },
          },
          { manager: tx },
        );
        await tx.getRepository(Membership).update({ id: member.id }, { roles });
        // Keep a pending invitation in step with the membership it belongs to.
        if (member.user) {
          await tx.getRepository(Invitation).update({ clubId, email: member.user.email, acceptedAt: IsNull() }, { roles });
        }
        return memberView(member);
      });
    },

    async remove(clubId: string, userId: string, actorId: string | null = null): Promise<void> {
      await ds.transaction(async (tx) => {
        await lockClub(tx, clubId);
        const member = await findMember(tx, clubId, userId);
        await keepAnAdmin(tx, member, []);
        await audit.record(
          {
            clubId,
            actorId,
            action: 'membership.removed',
            entity: { type: 'membership', id: userId },
            details: { email: member.user?.email, roles: member.roles },
          },
          { manager: tx },
        );
        await tx.getRepository(Membership).delete({ id: member.id });
        if (member.user) await tx.getRepository(Invitation).delete({ clubId, email: member.user.email, acceptedAt: IsNull() });
      });
    },

    async getInvitation(token: string): Promise<InvitationWire> {
      const { invitation } = await usableInvitation(ds.manager, token, false);
      const club = await ds.getRepository(Club).findOneByOrFail({ id: invitation.clubId });
      return { email: invitation.email, clubName: club.name };
    },

    /** Sets the invited person's password (and name); returns their user id for signing in. */
    async acceptInvitation(token: string, password: string, displayName?: string): Promise<string> {
      const passwordHash = await hashPassword(password);
      return ds.transaction(async (tx) => {
        const { invitation, user } = await usableInvitation(tx, token, true);
        await tx.getRepository(User).update({ id: user.id }, { passwordHash, ...(displayName ? { displayName } : {}) });
        await tx.getRepository(Invitation).update({ id: invitation.id }, { acceptedAt: now() });
        await audit.record(
          {
            clubId: invitation.clubId,
            actorId: user.id,
            action: 'invitation.accepted',
            entity: { type: 'invitation', id: invitation.id },
            details: { email: user.email, roles: invitation.roles },
          },
          { manager: tx },
        );
        return user.id;
      });
    },
  };
}
