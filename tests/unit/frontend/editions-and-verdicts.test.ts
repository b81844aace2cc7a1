// Issue 13 on screen, component by component: the publish dialog offers a date the server accepts
// (the club's today, or the first date after a scheduled edition) and refuses one it would refuse,
// with the reason, before anything is sent; the review queue reads an approval with a waiver as
// "Approved with 1 waiver" and never beside a red verdict; the build sheet's banner says which edition
// is newer, from when, what the sheet gets under it, and moves the sheet there in one confirmed step.
/* eslint-disable vue/one-component-per-file -- test hosts around the components under test */
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { defineComponent, h } from 'vue';
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import RulebookPublishDialog from '@/components/rulebook/RulebookPublishDialog.vue';
import ReviewQueueList from '@/components/review/ReviewQueueList.vue';
import SheetEditionBanner from '@/components/sheet/SheetEditionBanner.vue';
import { http, RETRY_DELAYS_MS } from '@/api/http';
import { reportReachable } from '@/api/connection';
import type { QueueItem } from '@/api/review';
import type { SheetEditions } from '@/api/garage';
import type { AuditEntry } from '@/api/audit';
import { auditSentence } from '@/components/audit/auditText';
import { createFetchMock, csrfToken, json } from './fetch-mock';
import { mountAt, settle } from './mount-app';
import { sheetDetail, sheetId, versionId } from './garage-fixtures';

// Every mounted tree is unmounted before the page is emptied, so no dialog of one test outlives it.
const mounted: { unmount(): void }[] = [];
afterEach(() => {
  while (mounted.length) mounted.pop()!.unmount();
  document.body.innerHTML = '';
  vi.unstubAllGlobals();
});

describe('the publish dialog', () => {
  const inForce = { state: 'published' as const, effectiveDate: '2026-11-01', versionNumber: 1, edition: '2027' };
  const scheduled = { state: 'scheduled' as const, effectiveDate: '2027-03-01', versionNumber: 2, edition: '2028' };

  function open(siblings: (typeof inForce | typeof scheduled)[], today = '2026-12-02') {
    const wrapper = mount(RulebookPublishDialog, {
      attachTo: document.body,
      props: { visible: true, edition: '2029', problemCount: 0, publishing: false, error: null, job: null, published: false, siblings, today, timeZone: 'Europe/London' },
      global: { plugins: [[PrimeVue, { theme: 'none' }]] },
    });
    mounted.push(wrapper);
    const dateInput = () => document.querySelector<HTMLInputElement>('input[aria-label="Takes effect on"]')!;
    const publishButton = () => [...document.querySelectorAll('button')].find((b) => /Put in force|Schedule it/.test(b.textContent ?? ''))!;
    return { wrapper, dateInput, publishButton };
  }
  const tick = async (box = document.querySelector<HTMLInputElement>('.rb-publish__confirm input')!) => {
    box.click();
    await settle();
  };

  test('offers the club’s today when the edition in force is older, and says it comes into force today', async () => {
    const { dateInput, publishButton, wrapper } = open([inForce]);
    await settle();
    expect(dateInput().value).toBe('2026-12-02');
    expect(document.body.textContent).toContain('Dates are the club\'s, in Europe/London: today there is 2 Dec 2026.');
    expect(document.body.textContent).toContain('becomes the rulebook in force today');
    await tick();
    expect(publishButton().textContent).toContain('Put in force');
    publishButton().click();
    expect(wrapper.emitted('publish')).toEqual([['2026-12-02']]);
  });

  test('offers the scheduled edition’s date when it is later than today, and says the edition in force stays', async () => {
    const { dateInput, publishButton } = open([inForce, scheduled]);
    await settle();
    expect(dateInput().value).toBe('2027-03-01');
    expect(document.querySelector('[data-test="publish-scheduled"]')!.textContent).toContain('comes into force on 1 Mar 2027. Until then edition 2027 stays in force.');
    await tick();
    expect(publishButton().textContent).toContain('Schedule it');
    expect(publishButton().disabled).toBe(false);
  });

  test('refuses a date before the scheduled edition with the server’s reason, and sends nothing', async () => {
    const { dateInput, publishButton, wrapper } = open([inForce, scheduled]);
    await settle();
    await tick();
    dateInput().value = '2027-01-15';
    dateInput().dispatchEvent(new Event('input'));
    await settle();
    const hint = document.querySelector('[data-test="publish-date-hint"]')!;
    expect(hint.textContent).toBe('The effective date 15 Jan 2027 is before 1 Mar 2027, when the scheduled version 2 takes effect. Choose 1 Mar 2027 or later.');
    expect(dateInput().getAttribute('aria-invalid')).toBe('true');
    expect(dateInput().getAttribute('aria-describedby')).toBe(hint.id);
    expect(publishButton().disabled).toBe(true);
    publishButton().click();
    expect(wrapper.emitted('publish')).toBeUndefined();
  });
});

describe('the review queue', () => {
  const item = (extra: Partial<QueueItem>): QueueItem => ({
    id: 'd0000000-0000-4000-8000-000000000001', state: 'approved', version: 4, car: { id: 'c1', name: 'Blue Coupé', raceNumber: '12' },
    builder: { id: 'b', displayName: 'Robin Ashcombe' }, classId: 'club-saloon', className: 'Club Saloon', verdict: 'fail', reviewVerdict: 'pass_with_waivers',
    waivedCount: 1, assignedSteward: null, isResubmission: false, resubmittedAsId: null, createdAt: new Date().toISOString(), updatedAt: new Date().toISOString(), ...extra,
  });
  const render = async (items: QueueItem[]) => {
    mounted.push((await mountAt('/', defineComponent({ render: () => h(ReviewQueueList, { items }) }))).wrapper);
    await settle();
    return [...document.querySelectorAll('.ql__item')].map((li) => [...li.querySelectorAll('.ql__tags > *')].map((e) => e.textContent!.trim()).join(' | '));
  };

  test('reads an approval with a waiver as one, with no red verdict beside it', async () => {
    const [row] = await render([item({})]);
    expect(row).toBe('Approved with 1 waiver');
    expect(document.querySelector('.verdict--fail')).toBeNull();
  });

  test('shows the verdict with waivers counted while in review, and an answered request as resubmitted', async () => {
    const rows = await render([
      item({ state: 'in_review' }),
      item({ id: 'd0000000-0000-4000-8000-000000000002', state: 'in_review', reviewVerdict: 'fail', waivedCount: 0 }),
      item({ id: 'd0000000-0000-4000-8000-000000000003', state: 'changes_requested', reviewVerdict: 'fail', waivedCount: 0, resubmittedAsId: 'd0000000-0000-4000-8000-000000000004' }),
    ]);
    expect(rows).toEqual(['In review | Meets the rules with 1 waiver', 'In review | Pre-check not met', 'Changes made and resubmitted | Pre-check not met']);
  });
});

describe('the newer-edition banner on a build sheet', () => {
  const newerId = '7e57e57e-0000-4000-8000-000000000002';
  const editions: SheetEditions = {
    pinned: { versionId, versionNumber: 1, edition: '2027', status: 'published', effectiveDate: '2026-11-01' },
    inForce: null,
    rulebookTitle: 'Tarnwick Vale MC Cage Regulations',
    newer: {
      versionId: newerId, versionNumber: 2, edition: '2028', status: 'scheduled', effectiveDate: '2027-01-01', verdictNow: 'pass', verdictUnder: 'fail',
      classExists: true, className: 'Club Saloon (full cage)', changes: ['Club Saloon tube table: wall 0.095 → 0.120 in'],
      newFindings: [{ requirementId: 'tv-saloon-tubes', title: 'Club Saloon tube sizes', section: 'C4.2.2', subject: 'main hoop mh', verdict: 'fail' }],
    },
  };
  let mock: ReturnType<typeof createFetchMock>;
  beforeEach(() => {
    http.resetCsrfToken();
    mock = createFetchMock();
    vi.stubGlobal('fetch', mock.fetch);
    mock.on('GET', '/api/auth/csrf', csrfToken('t0k3n'));
    mock.on('GET', `/api/build-sheets/${sheetId}/editions`, json(200, { editions }));
  });

  async function render(props: { dirty?: boolean; canEdit?: boolean } = {}) {
    const moved: unknown[] = [];
    const Host = defineComponent({
      render: () => h(SheetEditionBanner, { sheetId, versionId, revision: 3, dirty: props.dirty ?? false, canEdit: props.canEdit ?? true, onMoved: (d: unknown) => moved.push(d) }),
    });
    mounted.push((await mountAt('/', Host)).wrapper);
    await settle();
    return { moved };
  }

  test('says which edition is newer, from when, and what the sheet gets under it', async () => {
    await render();
    const banner = document.querySelector('[data-test="edition-banner"]')!;
    const text = banner.textContent!.replace(/\s+/g, ' ');
    expect(banner.querySelector('h2')!.textContent!.trim()).toBe('Edition 2028 is scheduled: in force from 1 Jan 2027');
    expect(text).toContain('Tarnwick Vale MC Cage Regulations, edition 2028, applies from 1 Jan 2027. It is not in force yet.');
    expect(text).toContain('This build sheet is checked against edition 2027 and stays on it until you move it.');
    expect(text).toContain('Under edition 2027 it meets the rules; from 1 Jan 2027, under edition 2028, it does not meet the rules.');
    expect(text).toContain('Would not meet: Club Saloon tube sizes, main hoop mh (§ C4.2.2)');
  });

  test('moves the sheet after a confirmation, naming the revision it starts from', async () => {
    mock.on('POST', `/api/build-sheets/${sheetId}/move-edition`, json(200, sheetDetail(4)));
    const { moved } = await render();
    document.querySelector<HTMLButtonElement>('[data-test="move-edition"]')!.click();
    await settle();
    expect(mock.calls.some((c) => c.method === 'POST')).toBe(false);
    const accept = [...document.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Move to edition 2028')!;
    expect(document.body.textContent).toContain('The sheet is saved as revision 4, checked against edition 2028 (in force from 1 Jan 2027). Revision 3 and its checks keep edition 2027.');
    accept.click();
    await settle();
    const post = mock.calls.find((c) => c.method === 'POST')!;
    expect(post).toMatchObject({ path: `/api/build-sheets/${sheetId}/move-edition`, body: { baseRevision: 3, rulesetVersionId: newerId } });
    expect(moved).toHaveLength(1);
  });

  test('asks for unsaved changes to be saved first, and offers no move to a reader', async () => {
    await render({ dirty: true });
    expect(document.querySelector<HTMLButtonElement>('[data-test="move-edition"]')!.disabled).toBe(true);
    expect(document.body.textContent).toContain('Save your changes first');
    while (mounted.length) mounted.pop()!.unmount();
    document.body.innerHTML = '';
    await render({ canEdit: false });
    expect(document.querySelector('[data-test="edition-banner"]')).not.toBeNull();
    expect(document.querySelector('[data-test="move-edition"]')).toBeNull();
  });

  test('with no signal it says so quietly, and looks again once the server answers', async () => {
    vi.useFakeTimers();
    try {
      mock.on('GET', `/api/build-sheets/${sheetId}/editions`, () => {
        throw new TypeError('Failed to fetch');
      });
      const Host = defineComponent({ render: () => h(SheetEditionBanner, { sheetId, versionId, revision: 3, dirty: false, canEdit: true }) });
      const rendering = mountAt('/', Host);
      // The GET's own retries (api/http.ts) run out first.
      await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS.reduce((a, b) => a + b, 0) + 100);
      mounted.push((await rendering).wrapper);
      await vi.advanceTimersByTimeAsync(0);
      expect(document.querySelector('[data-test="edition-no-signal"]')!.textContent).toContain('looked up once the server can be reached');
      expect(document.querySelector('.edition-banner__error')).toBeNull();
      // The signal is back.
      mock.on('GET', `/api/build-sheets/${sheetId}/editions`, json(200, { editions }));
      reportReachable();
      for (let i = 0; i < 5; i += 1) await vi.advanceTimersByTimeAsync(0);
      expect(document.querySelector('[data-test="edition-no-signal"]')).toBeNull();
      expect(document.querySelector('[data-test="edition-banner"]')).not.toBeNull();
    } finally {
      vi.useRealTimers();
      reportReachable();
    }
  });

  test('shows nothing when the sheet is on the newest edition', async () => {
    mock.on('GET', `/api/build-sheets/${sheetId}/editions`, json(200, { editions: { ...editions, newer: null } }));
    await render();
    expect(document.querySelector('[data-test="edition-banner"]')).toBeNull();
  });
});

describe('the activity log in words', () => {
  const edition = { id: '7e57e57e-0000-4000-8000-000000000002', name: 'Tarnwick cage rules, version 2 (edition 2028)', open: true };
  const entry = (action: string, details: Record<string, unknown>, actor: AuditEntry['actor']): AuditEntry => ({
    id: 'e0000000-0000-4000-8000-000000000099', action, entityType: 'ruleset_version', entityId: edition.id, actor, details, subjects: { edition }, createdAt: '2026-12-02T10:00:00.000Z',
  });
  const admin = { id: 'a0000000-0000-4000-8000-00000000000a', email: 'admin@tarnwick.example', displayName: 'Dara Quill', open: true };
  const words = (e: AuditEntry) => auditSentence(e, 'c0000000-0000-4000-8000-000000000001').map((p) => p.text).join('');

  test.each([
    [entry('ruleset.scheduled', { effectiveDate: '2027-01-01' }, admin), `Dara Quill scheduled ${edition.name} to come into force on 2027-01-01.`],
    [entry('ruleset.in_force', { effectiveDate: '2027-01-01', supersededVersions: [1] }, null), `On its date, ${edition.name} came into force, replacing version 1.`],
    [entry('club.settings_changed', { timeZone: { from: 'UTC', to: 'Europe/London' } }, admin), "Dara Quill changed the club's time zone from UTC to Europe/London."],
  ])('%#: %s', (e, sentence) => {
    expect(words(e)).toBe(sentence);
  });
});
