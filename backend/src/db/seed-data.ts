// The invented demo: one club and three people, each holding a different set of roles.
import type { ClubRole } from '../entities';

export const demoPassword = 'cagewright-demo';

// The club's dates (editions taking effect) are read at midnight in its time zone.
export const demoClub = { slug: 'tarnwick-vale', name: 'Tarnwick Vale Motor Club', timeZone: 'Europe/London' } as const;

export const demoPeople: { email: string; displayName: string; roles: ClubRole[] }[] = [
  { email: 'builder@tarnwick.example', displayName: 'Robin Ashcombe', roles: ['builder'] },
  { email: 'steward@tarnwick.example', displayName: 'Imogen Feld', roles: ['steward'] },
  { email: 'admin@tarnwick.example', displayName: 'Dara Quill', roles: ['admin', 'steward'] },
];
