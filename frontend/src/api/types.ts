// Wire types the front end reads. They come from the server's own contracts (backend/src/contracts), so
// a change to the wire breaks the front end's type-check instead of the running app.
import type { ClubRoleWire } from '@contracts/common';
import { CLUB_ROLES } from '@contracts/roles';

export type {
  UserWire as User,
  MembershipWire as Membership,
  SessionWire as SessionPayload,
} from '@contracts/auth';
export type { InvitationWire as InvitationSummary } from '@contracts/auth';
export type { MemberWire as ClubMember, AddMemberWire as AddMemberResult } from '@contracts/clubs';

export type Role = ClubRoleWire;
export const ROLES: readonly Role[] = CLUB_ROLES;

export type PreferredUnits = 'imperial' | 'metric';

export interface Club {
  id: string;
  slug: string;
  name: string;
}
