// Invented people and clubs for front-end tests, shaped like the API's session answer.
import type { ClubMember, Membership, SessionPayload } from '@/api/types';

export const tarnwick = {
  id: '5c1f2d9e-0000-4000-8000-000000000001',
  slug: 'tarnwick',
  name: 'Tarnwick Motor Club',
};
export const elmbury = {
  id: '5c1f2d9e-0000-4000-8000-000000000002',
  slug: 'elmbury',
  name: 'Elmbury Speed Society',
};

export function session(
  memberships: Membership[],
  overrides: Partial<SessionPayload['user']> = {},
): SessionPayload {
  return {
    user: {
      id: 'a0000000-0000-4000-8000-00000000000a',
      email: 'pat@tarnwick.example',
      displayName: 'Pat Hollis',
      preferredUnits: 'metric',
      ...overrides,
    },
    memberships,
  };
}

export function member(
  id: string,
  email: string,
  displayName: string,
  roles: ClubMember['roles'],
  invitationPending = false,
): ClubMember {
  return { user: { id, email, displayName }, roles, invitationPending };
}
