// The review queue page: counts by state, filters that ask the server with the right query (and keep
// it in the address), the empty states, and the stewards' mail switch.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import ReviewQueueView from '@/views/ReviewQueueView.vue';
import { http } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import type { Queue } from '@/api/review';
import { changedFilters, filtersFromQuery, DEFAULT_FILTERS } from '@/composables/useReviewQueue';
import { createFetchMock, csrfToken, json } from './fetch-mock';
import { session, tarnwick } from './fixtures';
import { mountAt, settle } from './mount-app';

const me = session([{ club: tarnwick, roles: ['steward'] }]);
const queuePath = `/api/clubs/${tarnwick.id}/submissions`;
const counts = { pending: 2, in_review: 1, approved: 4, changes_requested: 1, rejected: 0, withdrawn: 3 };
const item = (n: number, extra: Partial<Queue['items'][number]> = {}): Queue['items'][number] => ({
  id: `d0000000-0000-4000-8000-00000000000${n}`, state: 'pending', version: 1, car: { id: `c${n}`, name: `Blue Coupé ${n}`, raceNumber: `1${n}` },
  builder: { id: 'b', displayName: 'Robin Ashcombe' }, classId: 'club-saloon', className: 'Club Saloon', verdict: 'pass', reviewVerdict: 'pass', waivedCount: 0,
  assignedSteward: null, isResubmission: false, resubmittedAsId: null, createdAt: new Date(Date.now() - 3 * 86_400_000).toISOString(), updatedAt: new Date().toISOString(), ...extra,
});
const queue = (items: Queue['items']): Queue => ({ items, counts, classes: [{ id: 'club-saloon', name: 'Club Saloon' }, { id: 'open-sprint', name: 'Open Sprint' }] });

let mock: ReturnType<typeof createFetchMock>;
const queueUrls = () => vi.mocked(mock.fetch).mock.calls.map((c) => String(c[0])).filter((u) => u.includes('/submissions'));

beforeEach(() => {
  http.resetCsrfToken();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  mock.on('GET', '/api/auth/csrf', csrfToken('t0k3n'));
  mock.on('GET', `/api/clubs/${tarnwick.id}/review-mail`, json(200, { enabled: false }));
  mock.on('GET', queuePath, json(200, queue([item(1), item(2, { state: 'in_review', assignedSteward: { id: me.user.id, displayName: 'Pat Hollis' }, isResubmission: true })])));
});
afterEach(() => {
  document.body.innerHTML = '';
});

async function openPage(path = `/clubs/${tarnwick.id}/review`) {
  const mounted = await mountAt(path, ReviewQueueView, () => useSessionStore().setSession(me));
  await settle();
  return mounted;
}

describe('queue filters', () => {
  test.each([
    [{}, DEFAULT_FILTERS],
    [{ state: 'approved', age: 'over_7_days', assigned: 'me', sort: 'car', classId: 'open-sprint' }, { state: 'approved', age: 'over_7_days', assigned: 'me', sort: 'car', classId: 'open-sprint' }],
    [{ state: 'sideways', age: 7, sort: ['x'] }, DEFAULT_FILTERS],
  ])('reads %j from the address as %j', (query, expected) => {
    expect(filtersFromQuery(query)).toEqual(expected);
  });

  test('sends only what differs from the defaults', () => {
    expect(changedFilters(DEFAULT_FILTERS)).toEqual({});
    expect(changedFilters({ ...DEFAULT_FILTERS, assigned: 'me', sort: 'newest' })).toEqual({ assigned: 'me', sort: 'newest' });
  });
});

describe('ReviewQueueView', () => {
  test('lists submissions with their state, car, race number and claim, and counts by state', async () => {
    await openPage();
    const text = document.body.textContent ?? '';
    expect(text).toContain('Blue Coupé 1');
    expect(text).toContain('No. 11');
    expect(text).toContain('Claimed by Pat Hollis');
    expect(text).toContain('Resubmission');
    expect(text).toMatch(/Open\s*3/);
    expect(text).toMatch(/Withdrawn\s*3/);
    expect(queueUrls()).toEqual([queuePath]);
  });

  test('each filter asks the server again with its query and keeps it in the address', async () => {
    const { router } = await openPage();
    const chips = [...document.querySelectorAll<HTMLButtonElement>('.qf__chip')];
    chips.find((b) => b.textContent?.includes('Approved'))!.click();
    await settle();
    const cls = document.querySelector<HTMLSelectElement>('[data-test="filter-class"]')!;
    cls.value = 'open-sprint';
    cls.dispatchEvent(new Event('change'));
    await settle();
    const mine = document.querySelector<HTMLInputElement>('[data-test="filter-mine"]')!;
    mine.click();
    await settle();
    const sort = document.querySelector<HTMLSelectElement>('[data-test="filter-sort"]')!;
    sort.value = 'newest';
    sort.dispatchEvent(new Event('change'));
    await settle();
    expect(queueUrls()).toEqual([
      queuePath,
      `${queuePath}?state=approved`,
      `${queuePath}?state=approved&classId=open-sprint`,
      `${queuePath}?state=approved&classId=open-sprint&assigned=me`,
      `${queuePath}?state=approved&classId=open-sprint&assigned=me&sort=newest`,
    ]);
    expect(router.currentRoute.value.query).toEqual({ state: 'approved', classId: 'open-sprint', assigned: 'me', sort: 'newest' });
  });

  test('starts from the filters in the address', async () => {
    await openPage(`/clubs/${tarnwick.id}/review?age=over_14_days&assigned=me`);
    expect(queueUrls()).toEqual([`${queuePath}?age=over_14_days&assigned=me`]);
    expect(document.querySelector<HTMLSelectElement>('[data-test="filter-age"]')!.value).toBe('over_14_days');
  });

  test('an empty queue says what will appear there; an empty filter says to change it', async () => {
    mock.on('GET', queuePath, json(200, queue([])));
    await openPage();
    expect(document.body.textContent).toContain('No submission is waiting');
    document.querySelector<HTMLInputElement>('[data-test="filter-mine"]')!.click();
    await settle();
    expect(document.body.textContent).toContain('No submission matches these filters');
  });

  test('the mail switch sends the steward’s choice', async () => {
    mock.on('PUT', `/api/clubs/${tarnwick.id}/review-mail`, json(200, { enabled: true }));
    await openPage();
    document.querySelector<HTMLInputElement>('[data-test="review-mail"]')!.click();
    await settle();
    const put = mock.calls.find((c) => c.method === 'PUT');
    expect(put?.body).toEqual({ enabled: true });
    expect(put?.headers['x-csrf-token']).toBe('t0k3n');
  });
});

describe('looking a check run up by the code on its report (issue 9 §5)', () => {
  const runId = 'e0000000-0000-4000-8000-000000000001';
  const typeCode = async (code: string) => {
    const input = document.querySelector<HTMLInputElement>('#review-code')!;
    input.value = code;
    input.dispatchEvent(new Event('input'));
    document.querySelector<HTMLFormElement>('form[aria-label="Look up a check run"]')!.requestSubmit();
    await settle();
  };

  test('opens the kept run the code names', async () => {
    mock.on('GET', /\/api\/check-runs\/by-code\//, json(200, { checkRun: { id: runId } }));
    const { router } = await openPage();
    await typeCode('7k2q mx9d 4hbt 0zrs 5wnc 8epa');
    expect(mock.calls.find((c) => c.path.startsWith('/api/check-runs/by-code/'))!.path).toBe(`/api/check-runs/by-code/${encodeURIComponent('7k2q mx9d 4hbt 0zrs 5wnc 8epa')}`);
    expect(router.currentRoute.value.fullPath).toBe(`/check-runs/${runId}`);
  });

  test('an unknown code is said at the field, and the page stays', async () => {
    mock.on('GET', /\/api\/check-runs\/by-code\//, json(404, { error: { code: 'not_found', message: 'No check run you may see has this code.' } }));
    const { router } = await openPage();
    await typeCode('nothing');
    expect(document.querySelector('#review-code-msg')!.textContent).toBe('No check run of this club has this code. Check the code, or ask the builder for the report.');
    expect(router.currentRoute.value.name).toBe('review-queue');
  });
});
