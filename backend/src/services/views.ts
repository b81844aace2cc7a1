// Entity → wire shape mappers, so every route answers with the same fields.
import type { MemberWire } from '../contracts/clubs';
import type { MembershipWire, UserWire } from '../contracts/auth';
import type { Membership, User } from '../entities';

export function userView(u: User): UserWire {
  return { id: u.id, email: u.email, displayName: u.displayName, preferredUnits: u.preferredUnits };
}

export function membershipView(m: Membership): MembershipWire {
  if (!m.club) throw new Error('membershipView needs the club relation loaded');
  return { club: { id: m.club.id, slug: m.club.slug, name: m.club.name }, roles: [...m.roles] };
}

export function memberView(m: Membership): MemberWire {
  if (!m.user) throw new Error('memberView needs the user relation loaded');
  return {
    user: { id: m.user.id, email: m.user.email, displayName: m.user.displayName },
    roles: [...m.roles],
    invitationPending: m.user.passwordHash === null,
  };
}
