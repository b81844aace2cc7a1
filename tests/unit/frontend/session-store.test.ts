// The session store: roles per club, "any club" role checks, and the current club choice.
import { beforeEach, describe, expect, test, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { CURRENT_CLUB_KEY, useSessionStore } from '@/stores/session';
import { http } from '@/api/http';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';
import { elmbury, session, tarnwick } from './fixtures';

const twoClubs = session([
  { club: tarnwick, roles: ['builder', 'admin'] },
  { club: elmbury, roles: ['steward'] },
]);

beforeEach(() => {
  localStorage.clear();
  http.resetCsrfToken();
  setActivePinia(createPinia());
});

describe('roles', () => {
  test('rolesIn gives the roles held in that club only, and none for an unknown club', () => {
    const store = useSessionStore();
    store.setSession(twoClubs);
    expect(store.rolesIn(tarnwick.id)).toEqual(['builder', 'admin']);
    expect(store.rolesIn(elmbury.id)).toEqual(['steward']);
    expect(store.rolesIn('no-such-club')).toEqual([]);
  });

  test.each([
    ['builder', true],
    ['steward', true],
    ['admin', true],
  ] as const)('hasRole(%s) looks across all clubs → %s', (role, expected) => {
    const store = useSessionStore();
    store.setSession(twoClubs);
    expect(store.hasRole(role)).toBe(expected);
  });

  test('hasRole is false for a role held nowhere, and for everything when signed out', () => {
    const store = useSessionStore();
    store.setSession(session([{ club: tarnwick, roles: ['builder'] }]));
    expect(store.hasRole('admin')).toBe(false);
    store.clear();
    expect(store.hasRole('builder')).toBe(false);
    expect(store.isSignedIn).toBe(false);
  });
});

describe('current club', () => {
  test('defaults to the first club and its roles', () => {
    const store = useSessionStore();
    store.setSession(twoClubs);
    expect(store.currentClub).toEqual(tarnwick);
    expect(store.currentRoles).toEqual(['builder', 'admin']);
    expect(store.hasRoleInCurrentClub('steward')).toBe(false);
  });

  test('a selection switches the current roles and is kept in localStorage for the next visit', () => {
    const store = useSessionStore();
    store.setSession(twoClubs);
    store.selectClub(elmbury.id);
    expect(store.currentRoles).toEqual(['steward']);
    expect(localStorage.getItem(CURRENT_CLUB_KEY)).toBe(elmbury.id);

    setActivePinia(createPinia());
    const nextVisit = useSessionStore();
    nextVisit.setSession(twoClubs);
    expect(nextVisit.currentClub).toEqual(elmbury);
  });

  test('a club the user does not belong to cannot be selected, and a stale stored one falls back', () => {
    localStorage.setItem(CURRENT_CLUB_KEY, 'a-club-they-left');
    const store = useSessionStore();
    store.setSession(twoClubs);
    expect(store.currentClub).toEqual(tarnwick);
    store.selectClub('another-stranger-club');
    expect(store.currentClub).toEqual(tarnwick);
    expect(localStorage.getItem(CURRENT_CLUB_KEY)).toBe('a-club-they-left');
  });

  test('no club at all gives no current club and no roles', () => {
    const store = useSessionStore();
    store.setSession(session([]));
    expect(store.currentClub).toBeNull();
    expect(store.currentRoles).toEqual([]);
  });
});

describe('loading and signing in', () => {
  test('ensureLoaded asks /auth/me once; a 401 there means signed out', async () => {
    const mock = createFetchMock();
    vi.stubGlobal('fetch', mock.fetch);
    mock.on('GET', '/api/auth/me', apiError(401, 'unauthenticated', 'Please sign in.'));
    const store = useSessionStore();

    await store.ensureLoaded();
    await store.ensureLoaded();

    expect(store.isSignedIn).toBe(false);
    expect(mock.calls.filter((c) => c.path === '/api/auth/me')).toHaveLength(1);
  });

  test('signIn sends the credentials and stores the user, memberships and preferred units', async () => {
    const mock = createFetchMock();
    vi.stubGlobal('fetch', mock.fetch);
    mock.on('GET', '/api/auth/csrf', csrfToken('t'));
    mock.on(
      'POST',
      '/api/auth/login',
      json(200, session([{ club: tarnwick, roles: ['builder'] }], { preferredUnits: 'imperial' })),
    );
    const store = useSessionStore();

    await store.signIn('pat@tarnwick.example', 'a long password');

    expect(mock.calls.find((c) => c.path === '/api/auth/login')?.body).toEqual({
      email: 'pat@tarnwick.example',
      password: 'a long password',
    });
    expect(store.user?.displayName).toBe('Pat Hollis');
    expect(store.preferredUnits).toBe('imperial');
    expect(store.rolesIn(tarnwick.id)).toEqual(['builder']);
  });
});
