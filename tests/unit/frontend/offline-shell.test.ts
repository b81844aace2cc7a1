// With no signal the app stays with whoever was signed in on this device and says it is offline; only
// a real 401 from the server sends a person to sign-in. The banner goes once the server answers.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import { mount } from '@vue/test-utils';
import { nextTick, defineComponent } from 'vue';
import { createPinia, setActivePinia } from 'pinia';
import { createMemoryHistory, createRouter, type RouteRecordRaw } from 'vue-router';
import ConnectionBanner from '@/components/common/ConnectionBanner.vue';
import { routes } from '@/router/routes';
import { sessionGuard } from '@/router/guards';
import { http, RETRY_DELAYS_MS } from '@/api/http';
import { reportReachable, reportUnreachable, setProbe } from '@/api/connection';
import { keepSession } from '@/api/kept';
import { useSessionStore } from '@/stores/session';
import { apiError, createFetchMock } from './fetch-mock';
import { session, tarnwick } from './fixtures';

const Blank = defineComponent({ render: () => null });
const stub = (records: readonly RouteRecordRaw[]): RouteRecordRaw[] =>
  records.map((r) => ({ ...r, component: Blank, children: r.children ? stub(r.children) : undefined })) as RouteRecordRaw[];
const me = session([{ club: tarnwick, roles: ['builder'] }]);
let mock: ReturnType<typeof createFetchMock>;

beforeEach(() => {
  localStorage.clear();
  reportReachable();
  setProbe(null);
  http.resetCsrfToken();
  setActivePinia(createPinia());
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  vi.useFakeTimers();
});
afterEach(() => vi.useRealTimers());

async function land(path: string) {
  const router = createRouter({ history: createMemoryHistory(), routes: stub(routes) });
  router.beforeEach(sessionGuard);
  let done = false;
  const going = router.push(path).finally(() => (done = true));
  // Each session probe is tried again after its pauses; a redirect to sign-in probes once more.
  for (let i = 0; i < 4 && !done; i += 1) await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS.reduce((a, b) => a + b, 0) + 100);
  await going;
  return router.currentRoute.value;
}

describe('opening a page with no signal', () => {
  beforeEach(() =>
    mock.on('GET', '/api/auth/me', () => {
      throw new TypeError('Failed to fetch');
    }),
  );

  test('stays on the page as whoever was signed in here last, never the sign-in page', async () => {
    keepSession(me);
    const to = await land('/build-sheets/s1');
    expect(to.name).toBe('build-sheet');
    expect(useSessionStore().user?.id).toBe(me.user.id);
  });

  test('with nobody kept on this device, goes to sign-in as before', async () => {
    expect((await land('/garage')).name).toBe('sign-in');
  });

  test('a gateway 503 counts as no signal too', async () => {
    mock.on('GET', '/api/auth/me', apiError(503, 'database_unavailable', 'Down.'));
    keepSession(me);
    expect((await land('/garage')).name).toBe('garage');
  });
});

test('a real 401 goes to sign-in and forgets who was kept', async () => {
  keepSession(me);
  mock.on('GET', '/api/auth/me', apiError(401, 'unauthenticated', 'Please sign in.'));
  expect((await land('/garage')).name).toBe('sign-in');
  expect(localStorage.getItem('cagewright.kept.session')).toBeNull();
});

test('the banner shows while the server cannot be reached and goes when it answers', async () => {
  const router = createRouter({ history: createMemoryHistory(), routes: stub(routes) });
  await router.push('/garage');
  const w = mount(ConnectionBanner, { global: { plugins: [router] } });
  expect(w.find('[data-test="offline-banner"]').exists()).toBe(false);
  reportUnreachable();
  await nextTick();
  expect(w.get('[data-test="offline-banner"]').text()).toContain('Your changes are kept on this device');
  reportReachable();
  await nextTick();
  expect(w.find('[data-test="offline-banner"]').exists()).toBe(false);
});
