// The invented demo: one club and three people, each holding a different set of roles.
import type { ClubRole } from '../entities';

export const demoPassword = 'cagewright-demo';

export const demoClub = { slug: 'tarnwick-vale', name: 'Tarnwick Vale Motor Club' } as const;

export const demoPeople: { email: string; displayName: string; roles: ClubRole[] }[] = [
  { email: 'builder@tarnwick.example', displayName: 'Robin Ashcombe', roles: ['builder'] },
  { email: 'steward@tarnwick.example', displayName: 'Imogen Feld', roles: ['steward'] },
  { email: 'admin@tarnwick.example', displayName: 'Dara Quill', roles: ['admin', 'steward'] },
];
