// Wire types the front end reads, as docs/api.md describes them. Ids are opaque strings to the client.

export const ROLES = ['builder', 'steward', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export type PreferredUnits = 'imperial' | 'metric';

export interface User {
  id: string;
  email: string;
  displayName: string;
  preferredUnits: PreferredUnits;
}

export interface Club {
  id: string;
  slug: string;
  name: string;
}

export interface Membership {
  club: Club;
  roles: Role[];
}

/** What `/auth/me`, sign-in and accepting an invitation all return. */
export interface SessionPayload {
  user: User;
  memberships: Membership[];
}

export interface ClubMember {
  user: { id: string; email: string; displayName: string };
  roles: Role[];
  invitationPending: boolean;
}
