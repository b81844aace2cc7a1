// The guards only shape navigation: signed-out visitors go to sign-in with a return path, role-gated
// pages send people without the role home, and public pages stay open.
import { beforeEach, describe, expect, test, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory, createRouter, type RouteRecordRaw } from 'vue-router';
import { defineComponent } from 'vue';
import { routes } from '@/router/routes';
import { safeRedirect, sessionGuard } from '@/router/guards';
import { http } from '@/api/http';
import { apiError, createFetchMock, json } from './fetch-mock';
import { elmbury, session, tarnwick } from './fixtures';

const Blank = defineComponent({ render: () => null });
const stub = (records: readonly RouteRecordRaw[]): RouteRecordRaw[] =>
  records.map((r) => ({
    ...r,
    component: Blank,
    children: r.children ? stub(r.children) : undefined,
  })) as RouteRecordRaw[];

let mock: ReturnType<typeof createFetchMock>;

beforeEach(() => {
  http.resetCsrfToken();
  setActivePinia(createPinia());
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
});

async function land(path: string) {
  const router = createRouter({ history: createMemoryHistory(), routes: stub(routes) });
  router.beforeEach(sessionGuard);
  await router.push(path);
  return router.currentRoute.value;
}

describe('signed out', () => {
  beforeEach(() => mock.on('GET', '/api/auth/me', apiError(401, 'unauthenticated', 'Please sign in.')));

  test('a shell page sends the visitor to sign-in with the way back', async () => {
    const to = await land('/account');
    expect(to.name).toBe('sign-in');
    expect(to.query.redirect).toBe('/account');
  });

  test.each(['/sign-in', '/invitations/abcdefghijklmnopqrstuvwxyz', '/no/such/page'])(
    '%s stays open',
    async (path) => {
      expect((await land(path)).fullPath).toBe(path);
    },
  );
});

describe('signed in', () => {
  beforeEach(() =>
    mock.on(
      'GET',
      '/api/auth/me',
      json(
        200,
        session([
          { club: tarnwick, roles: ['builder'] },
          { club: elmbury, roles: ['admin'] },
        ]),
      ),
    ),
  );

  test('the members page of a club where the user is admin opens', async () => {
    expect((await land(`/clubs/${elmbury.id}/members`)).name).toBe('club-members');
  });

  test('the members page of a club where the user is only a builder sends them home', async () => {
    expect((await land(`/clubs/${tarnwick.id}/members`)).name).toBe('home');
  });

  test('the sign-in page forwards a signed-in user to the overview', async () => {
    expect((await land('/sign-in')).name).toBe('home');
  });
});

test.each([
  ['/account', '/account'],
  ['//evil.example/x', null],
  ['https://evil.example', null],
  [undefined, null],
])('safeRedirect(%j) → %j', (input, expected) => {
  expect(safeRedirect(input)).toBe(expected);
});
