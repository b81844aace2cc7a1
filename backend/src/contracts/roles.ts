// The club roles, in one place: the database checks (entities), the wire schema (contracts/common.ts),
// the access policy and review workflow (domain), the invitation mail and every screen read these.
// Plain data, no zod: the domain and a small page can import it.

/** Every club role, in the order screens list them. */
export const CLUB_ROLES = ['builder', 'steward', 'admin'] as const;
export type ClubRole = (typeof CLUB_ROLES)[number];

/** How a role is named: `label` on screen ("Steward"), `noun` inside a sentence ("as steward"). */
export const ROLE_WORDS: Readonly<Record<ClubRole, { label: string; noun: string }>> = {
  builder: { label: 'Builder', noun: 'builder' },
  steward: { label: 'Steward', noun: 'steward' },
  admin: { label: 'Admin', noun: 'admin' },
};

/** "builder, steward or admin": the roles as a sentence lists them. */
export function rolesListText(joiner: 'and' | 'or', roles: readonly string[] = CLUB_ROLES): string {
  const words = roles.map((r) => (r in ROLE_WORDS ? ROLE_WORDS[r as ClubRole].noun : r));
  return words.length <= 1 ? (words[0] ?? '') : `${words.slice(0, -1).join(', ')} ${joiner} ${words[words.length - 1]}`;
}

/** The SQL array literal of the roles, for CHECK constraints: ARRAY['builder', 'steward', 'admin']. */
export const CLUB_ROLES_SQL = `ARRAY[${CLUB_ROLES.map((r) => `'${r}'`).join(', ')}]`;
