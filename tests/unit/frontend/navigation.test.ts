// The main menu follows the roles held in the current club.
import { describe, expect, test } from 'vitest';
import { navEntries, visibleNavLinks, type NavEntry } from '@/layout/navigation';
import type { Role } from '@/api/types';

const clubId = 'club-1';
const labels = (roles: Role[], club: string | null = clubId) =>
  visibleNavLinks(navEntries, club, roles).map((l) => l.label);

describe('the app menu', () => {
  test.each<[Role[], string[]]>([
    [[], ['Overview', 'Bench tools', 'Account']],
    [['builder'], ['Overview', 'Garage', 'Tube stock', 'Bench tools', 'Account']],
    [['steward'], ['Overview', 'Review queue', 'Cage records', 'Bench tools', 'Account']],
    [['admin'], ['Overview', 'Tube stock', 'Cage records', 'Members', 'Rulebooks', 'Activity log', 'Bench tools', 'Account']],
    [
      ['builder', 'steward', 'admin'],
      ['Overview', 'Garage', 'Tube stock', 'Review queue', 'Cage records', 'Members', 'Rulebooks', 'Activity log', 'Bench tools', 'Account'],
    ],
  ])('roles %j in the current club show %j', (roles, expected) => {
    expect(labels(roles)).toEqual(expected);
  });

  test('a club-scoped entry links to the current club', () => {
    const members = visibleNavLinks(navEntries, clubId, ['admin']).find((l) => l.label === 'Members');
    expect(members?.to).toEqual({ name: 'club-members', params: { clubId } });
  });

  test('without a current club, club-scoped entries are hidden even if roles are passed', () => {
    expect(labels(['admin'], null)).toEqual(['Overview', 'Bench tools', 'Account']);
  });
});

describe('the filter itself', () => {
  // A menu that a later page would add, to show that one line with its roles is all an entry needs.
  const withLater: NavEntry[] = [
    ...navEntries,
    { label: 'Steward page', icon: 'pi pi-check', route: 'home', roles: ['steward', 'admin'] },
  ];

  test.each<[Role[], boolean]>([
    [['builder'], false],
    [['steward'], true],
    [['admin'], true],
  ])('an entry for steward or admin with roles %j is shown: %s', (roles, shown) => {
    const visible = visibleNavLinks(withLater, clubId, roles).map((l) => l.label);
    expect(visible.includes('Steward page')).toBe(shown);
  });
});
