// The activity log page: every action reads as a sentence with links to what it names (a person → the
// members page, a car → its page for its owner or its log otherwise, a sheet, record, edition → theirs),
// unknown actions still read sensibly, the filters (kind, car, person) ask the server with the right
// query and follow the address, and an empty log or an empty filter says so.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import { ref } from 'vue';
import AuditLogView from '@/views/AuditLogView.vue';
import { http, RETRY_DELAYS_MS } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import { actionLabel, auditSentence, auditSentenceText } from '@/components/audit/auditText';
import type { AuditEntry } from '@/api/audit';
import type { AuditSubjectsWire } from '@contracts/audit';
import { useAuditLog } from '@/composables/useAuditLog';
import { createFetchMock, json } from './fetch-mock';
import { session, tarnwick } from './fixtures';
import { mountAt, settle } from './mount-app';

const me = session([{ club: tarnwick, roles: ['admin'] }]);
const auditPath = `/api/clubs/${tarnwick.id}/audit`;
const ids = {
  robin: 'b0000000-0000-4000-8000-00000000000b',
  car: 'c0000000-0000-4000-8000-00000000000c',
  sheet: 'd0000000-0000-4000-8000-00000000000d',
  record: 'e0000000-0000-4000-8000-00000000000e',
  version: 'f0000000-0000-4000-8000-00000000000f',
  submission: 'a0000000-0000-4000-8000-00000000000a',
};
const robin = { id: ids.robin, name: 'Robin Ashcombe', email: 'robin@tarnwick.example', open: true };
const car = { id: ids.car, name: 'Grey Saloon', open: false };
const sheet = { id: ids.sheet, name: 'Full cage 2027', open: true };
const record = { id: ids.record, name: 'TV-2026-0007', open: true };
const edition = { id: ids.version, name: 'Tarnwick cage rules, version 3 (edition 2027)', open: true };
const submission = { id: ids.submission, name: 'submission', open: true };

let n = 0;
function entry(
  action: string,
  details: Record<string, unknown>,
  subjects: AuditSubjectsWire = {},
  actor: AuditEntry['actor'] = { id: me.user.id, email: me.user.email, displayName: 'Sam Reyes', open: true },
): AuditEntry {
  n += 1;
  return {
    id: `e0000000-0000-4000-8000-${String(n).padStart(12, '0')}`,
    action,
    entityType: 'x',
    entityId: null,
    actor,
    details,
    subjects,
    createdAt: '2026-11-30T10:00:00.000Z',
  };
}
const changed = entry(
  'membership.roles_changed',
  { email: robin.email, before: ['builder'], after: ['builder', 'steward'] },
  { person: robin },
);
const approved = entry(
  'submission.approve',
  { from: 'in_review', to: 'approved' },
  { car, sheet, record, submission },
);

let mock: ReturnType<typeof createFetchMock>;
const queries = () => mock.calls.filter((c) => c.path === auditPath);
const page = (entries: AuditEntry[], extra: Record<string, unknown> = {}) =>
  json(200, {
    entries,
    page: 1,
    pageSize: 25,
    total: entries.length,
    actions: [...new Set(entries.map((e) => e.action))],
    cars: [],
    people: [],
    ...extra,
  });

beforeEach(() => {
  http.resetCsrfToken();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
});
afterEach(() => {
  document.body.innerHTML = '';
});

async function openPage(path = `/clubs/${tarnwick.id}/activity`) {
  const mounted = await mountAt(path, AuditLogView, () => useSessionStore().setSession(me));
  await settle();
  return mounted;
}

describe('auditSentence', () => {
  const S = (action: string, details: Record<string, unknown>, subjects: AuditSubjectsWire = {}) =>
    auditSentenceText(entry(action, details, subjects), tarnwick.id);

  test.each([
    [
      'membership.added',
      { email: robin.email, roles: ['builder'], invited: false },
      { person: robin },
      'Sam Reyes added Robin Ashcombe as Builder.',
    ],
    [
      'membership.added',
      { email: 'wyn@tarnwick.example', roles: ['builder', 'steward'], invited: true },
      {
        person: { ...robin, name: 'wyn' },
        invitationMail: { status: 'sent', sentAt: '2026-11-30T10:01:00.000Z' },
      },
      'Sam Reyes e-mailed an invitation to wyn to join as Builder and Steward.',
    ],
    [
      'membership.added',
      { email: 'wyn@tarnwick.example', roles: ['builder'], invited: true },
      { person: { ...robin, name: 'wyn' }, invitationMail: { status: 'pending', sentAt: null } },
      'Sam Reyes invited wyn as Builder; the invitation e-mail is waiting in the outbox.',
    ],
    [
      'membership.added',
      { email: 'wyn@tarnwick.example', roles: ['builder'], invited: true },
      { invitationMail: { status: 'failed_permanently', sentAt: null } },
      'Sam Reyes invited wyn@tarnwick.example as Builder; the invitation e-mail could not be delivered, so pass the link on another way.',
    ],
    // Written before invitations were mailed: no outbox row to read.
    [
      'membership.added',
      { email: 'wyn@tarnwick.example', roles: ['builder'], invited: true },
      {},
      'Sam Reyes invited wyn@tarnwick.example as Builder.',
    ],
    [
      'membership.roles_changed',
      changed.details,
      { person: robin },
      'Sam Reyes changed the roles of Robin Ashcombe from Builder to Builder and Steward.',
    ],
    [
      'membership.removed',
      { email: robin.email, roles: ['steward'] },
      { person: { ...robin, open: false } },
      'Sam Reyes removed Robin Ashcombe (Steward) from the club.',
    ],
    [
      'invitation.accepted',
      { email: robin.email, roles: ['steward'] },
      {},
      'Sam Reyes accepted the invitation and joined as Steward.',
    ],
    [
      'ruleset.rulebook_created',
      { fromFile: true },
      { edition },
      `Sam Reyes created a new rulebook, ${edition.name}, from a ruleset file.`,
    ],
    [
      'ruleset.draft_started',
      { copiedFrom: 2 },
      { edition },
      `Sam Reyes started a draft, ${edition.name}, copied from version 2.`,
    ],
    ['ruleset.draft_saved', {}, { edition }, `Sam Reyes saved the draft ${edition.name}.`],
    [
      'ruleset.imported',
      { requirementCount: 12 },
      { edition },
      `Sam Reyes imported a ruleset file into ${edition.name} (12 requirements).`,
    ],
    [
      'ruleset.draft_deleted',
      {},
      { edition: { ...edition, open: false } },
      `Sam Reyes deleted the draft ${edition.name}.`,
    ],
    [
      'ruleset.published',
      { effectiveDate: '2027-01-01', supersededVersion: 2 },
      { edition },
      `Sam Reyes put ${edition.name} in force from 2027-01-01, replacing version 2.`,
    ],
    ['ruleset.retired', {}, { edition }, `Sam Reyes withdrew ${edition.name}.`],
    [
      'cage_record.issued',
      { number: record.name },
      { record, car },
      'Sam Reyes issued cage record TV-2026-0007 for Grey Saloon.',
    ],
    [
      'cage_record.revoked',
      { number: record.name, reason: 'Cracked weld at the main hoop foot.' },
      { record, car },
      'Sam Reyes revoked cage record TV-2026-0007 of Grey Saloon: Cracked weld at the main hoop foot.',
    ],
    [
      'club.record_settings_changed',
      {
        before: { recordPrefix: 'TV', validityMonths: 12 },
        after: { recordPrefix: 'TVM', validityMonths: 12 },
      },
      {},
      'Sam Reyes changed the cage record settings: number prefix TV → TVM.',
    ],
    [
      'submission.submit',
      {},
      { car, sheet, submission },
      'Sam Reyes sent Grey Saloon for review, build sheet Full cage 2027.',
    ],
    [
      'submission.resubmit',
      { from: null },
      { car, sheet, submission },
      'Sam Reyes resubmitted Grey Saloon for review after the changes asked, build sheet Full cage 2027.',
    ],
    [
      'submission.resubmit',
      { from: 'changes_requested' },
      { car, submission },
      'Sam Reyes answered the changes asked on Grey Saloon with a resubmission.',
    ],
    [
      'submission.resubmit',
      { from: null, returnedToId: 'u-imogen', returnedToName: 'Imogen Feld' },
      { car, sheet, submission },
      'Sam Reyes resubmitted Grey Saloon for review after the changes asked, build sheet Full cage 2027; it went back to Imogen Feld, who asked for them.',
    ],
    [
      'submission.release',
      { from: 'changes_requested', to: 'changes_requested', note: 'Away for two events' },
      { car, submission },
      'Sam Reyes let any steward take the resubmission of Grey Saloon: Away for two events.',
    ],
    ['car.transfer_offered', { otherName: 'Robin Ashcombe' }, { car, person: robin }, 'Sam Reyes offered Grey Saloon to Robin Ashcombe.'],
    [
      'car.transfer_accepted',
      { otherName: 'Robin Ashcombe' },
      { car, person: robin },
      'Sam Reyes took over Grey Saloon from Robin Ashcombe, with its build sheets and cage records.',
    ],
    ['car.transfer_declined', {}, { car, person: robin }, 'Sam Reyes declined the offer of Grey Saloon from Robin Ashcombe.'],
    ['car.transfer_withdrawn', {}, { car, person: robin }, 'Sam Reyes withdrew the offer of Grey Saloon to Robin Ashcombe.'],
    [
      'car.transferred',
      { fromUserId: 'u-lee', fromName: 'Lee Marr', otherName: 'Robin Ashcombe' },
      { car, person: robin },
      'Sam Reyes moved Grey Saloon from Lee Marr to Robin Ashcombe.',
    ],
    ['submission.claim', {}, { car, submission }, 'Sam Reyes took up the review of Grey Saloon.'],
    [
      'submission.release',
      {},
      { car, submission },
      'Sam Reyes put the review of Grey Saloon back in the queue.',
    ],
    [
      'submission.waive',
      { note: 'Waived tv-door@member:db1: Period cage, bar fitted 1994.' },
      { car, submission },
      'Sam Reyes waived a finding on Grey Saloon: Period cage, bar fitted 1994.',
    ],
    ['submission.remove_waiver', {}, { car, submission }, 'Sam Reyes removed a waiver on Grey Saloon.'],
    [
      'submission.approve',
      {},
      { car, record, submission },
      'Sam Reyes approved Grey Saloon, record TV-2026-0007.',
    ],
    [
      'submission.request_changes',
      { note: 'Door bar wall under the table.' },
      { car, submission },
      'Sam Reyes asked for changes on Grey Saloon: Door bar wall under the table.',
    ],
    [
      'submission.reject',
      { note: 'Not this cage design' },
      { car, submission },
      'Sam Reyes rejected Grey Saloon: Not this cage design.',
    ],
    ['submission.withdraw', {}, { car, submission }, 'Sam Reyes withdrew Grey Saloon from review.'],
    [
      'submission.annotated',
      {},
      { car, submission },
      'Sam Reyes added a note to a finding of Grey Saloon in its submission.',
    ],
    [
      'tube_stock.added',
      { label: '1.500 × 0.095 in DOM' },
      {},
      'Sam Reyes added 1.500 × 0.095 in DOM to the tube stock.',
    ],
    [
      'tube_stock.changed',
      { before: { label: 'A' }, after: { label: 'B' } },
      {},
      'Sam Reyes changed A to B in the tube stock.',
    ],
    ['tube_stock.removed', { label: 'A' }, {}, 'Sam Reyes removed A from the tube stock.'],
    ['tube_stock.common_added', { added: 1 }, {}, 'Sam Reyes added 1 common size back to the tube stock.'],
    [
      'journal.stage_recorded',
      { stage: 'tacked', happenedOn: '2026-05-01' },
      { sheet, car },
      expect.stringMatching(
        /^Sam Reyes recorded the .+ stage of Full cage 2027 \(Grey Saloon\), on 2026-05-01\.$/,
      ),
    ],
    [
      'journal.photos_added',
      { stage: 'tacked', count: 3 },
      { sheet },
      expect.stringMatching(/^Sam Reyes added 3 photos at the .+ stage of Full cage 2027\.$/),
    ],
    // A kind this screen does not know yet still reads, and still names what it is about.
    [
      'car_transfer.requested',
      {},
      { car, person: robin },
      'Sam Reyes: car transfer requested (Robin Ashcombe, Grey Saloon).',
    ],
  ] as const)('%s reads as a sentence (%#)', (action, details, subjects, sentence) => {
    expect(S(action, details as Record<string, unknown>, subjects as AuditSubjectsWire)).toEqual(sentence);
  });

  test('the system reads as such, and a job’s entry needs no actor', () => {
    const e = entry(
      'ruleset.recheck_completed',
      { checked: 12, changed: 2, mailed: 1, failed: 0 },
      { edition },
      null,
    );
    expect(auditSentenceText(e, tarnwick.id)).toBe(
      `Re-check after publishing ${edition.name}: 12 build sheets checked, 2 changed verdict, 1 builder e-mailed.`,
    );
    expect(auditSentenceText(entry('club.renamed', {}, {}, null), tarnwick.id)).toBe(
      'The system: club renamed.',
    );
  });

  test('each named thing links to its page, or to what the reader may open', () => {
    const links = auditSentence(approved, tarnwick.id)
      .filter((p) => p.to)
      .map((p) => [p.text, p.to]);
    expect(links).toEqual([
      ['Sam Reyes', { name: 'club-members', params: { clubId: tarnwick.id }, hash: `#member-${me.user.id}` }],
      // Only its owner opens a car's page: others get the log of that car.
      ['Grey Saloon', { name: 'club-activity', params: { clubId: tarnwick.id }, query: { carId: ids.car } }],
      ['TV-2026-0007', { name: 'cage-record', params: { recordId: ids.record } }],
    ]);
    const owned = auditSentence(entry('submission.claim', {}, { car: { ...car, open: true } }), tarnwick.id);
    expect(owned.find((p) => p.text === 'Grey Saloon')!.to).toEqual({
      name: 'car',
      params: { carId: ids.car },
    });
    const gone = auditSentence(
      entry('membership.removed', { roles: ['builder'] }, { person: { ...robin, open: false } }),
      tarnwick.id,
    );
    expect(gone.find((p) => p.text === 'Robin Ashcombe')!.to).toEqual({
      name: 'club-activity',
      params: { clubId: tarnwick.id },
      query: { personId: ids.robin },
    });
    const deleted = auditSentence(
      entry('ruleset.draft_deleted', {}, { edition: { ...edition, open: false } }),
      tarnwick.id,
    );
    expect(deleted.find((p) => p.text === edition.name)!.to).toBeUndefined();
    const sheetLink = auditSentence(entry('submission.submit', {}, { car, sheet }), tarnwick.id).find(
      (p) => p.text === sheet.name,
    )!;
    expect(sheetLink.to).toEqual({ name: 'build-sheet', params: { sheetId: ids.sheet } });
    const editionLink = auditSentence(entry('ruleset.retired', {}, { edition }), tarnwick.id).find(
      (p) => p.text === edition.name,
    )!;
    expect(editionLink.to).toEqual({ name: 'rulebook-version', params: { versionId: ids.version } });
  });

  test('labels the kinds, and names an unknown one from its raw name', () => {
    expect(actionLabel('submission.approve')).toBe('Approved');
    expect(actionLabel('car_transfer.requested')).toBe('Car transfer: requested');
  });
});

describe('the activity log page', () => {
  test('shows each entry as a sentence whose names are links', async () => {
    mock.on('GET', auditPath, page([changed, approved]));
    await openPage();
    const rows = [...document.querySelectorAll('tbody tr')].map((r) =>
      [...r.querySelectorAll('td')].slice(1).map((td) => td.textContent?.replace(/\s+/g, ' ').trim()),
    );
    expect(rows).toEqual([
      ['Sam Reyes changed the roles of Robin Ashcombe from Builder to Builder and Steward.', 'Roles changed'],
      ['Sam Reyes approved Grey Saloon, record TV-2026-0007.', 'Approved'],
    ]);
    const hrefs = [...document.querySelectorAll('tbody tr:nth-child(2) a')].map((a) => [
      a.textContent,
      a.getAttribute('href'),
    ]);
    expect(hrefs).toEqual([
      ['Sam Reyes', `/clubs/${tarnwick.id}/members#member-${me.user.id}`],
      ['Grey Saloon', `/clubs/${tarnwick.id}/activity?carId=${ids.car}`],
      ['TV-2026-0007', `/cage-records/${ids.record}`],
    ]);
  });

  test('asks for the first page of 25, then sends each chosen filter from page 1', async () => {
    mock.on('GET', auditPath, page([changed], { total: 60 }));
    const log = useAuditLog(ref(tarnwick.id));
    await settle();
    log.page.value = 3;
    await settle();
    log.action.value = 'membership.added';
    await settle();
    log.carId.value = ids.car;
    await settle();
    log.personId.value = ids.robin;
    await settle();
    // The fetch mock keeps paths only; the query strings are read from the fetch calls themselves.
    const urls = vi
      .mocked(mock.fetch)
      .mock.calls.map((c) => String(c[0]))
      .filter((u) => u.includes('/audit'));
    expect(urls).toEqual([
      `${auditPath}?page=1&pageSize=25`,
      `${auditPath}?page=3&pageSize=25`,
      `${auditPath}?page=1&pageSize=25&action=membership.added`,
      `${auditPath}?page=1&pageSize=25&action=membership.added&carId=${ids.car}`,
      `${auditPath}?page=1&pageSize=25&action=membership.added&carId=${ids.car}&personId=${ids.robin}`,
    ]);
    expect(log.total.value).toBe(60);
  });

  test('a car in the address filters the log, and the car list offers the club’s cars', async () => {
    mock.on(
      'GET',
      auditPath,
      page([approved], { cars: [{ id: ids.car, name: 'Grey Saloon', hint: 'Robin Ashcombe' }] }),
    );
    const { router } = await openPage(`/clubs/${tarnwick.id}/activity?carId=${ids.car}`);
    const urls = vi
      .mocked(mock.fetch)
      .mock.calls.map((c) => String(c[0]))
      .filter((u) => u.includes('/audit'));
    expect(urls).toEqual([`${auditPath}?page=1&pageSize=25&carId=${ids.car}`]);
    expect(document.querySelector('#activity-car')?.closest('.p-select')?.textContent).toContain(
      'Grey Saloon · Robin Ashcombe',
    );
    // Following a car link from another entry changes the filter in place.
    await router.push({
      name: 'club-activity',
      params: { clubId: tarnwick.id },
      query: { personId: ids.robin },
    });
    await settle();
    expect(
      vi
        .mocked(mock.fetch)
        .mock.calls.map((c) => String(c[0]))
        .filter((u) => u.includes('/audit'))
        .at(-1),
    ).toBe(`${auditPath}?page=1&pageSize=25&personId=${ids.robin}`);
  });

  test('nothing matching the filters says so, and clearing them asks again', async () => {
    mock.on('GET', auditPath, page([]), page([approved]));
    const { router } = await openPage(`/clubs/${tarnwick.id}/activity?personId=${ids.robin}`);
    expect(document.body.textContent).toContain('Nothing logged matches these filters');
    (
      [...document.querySelectorAll('button')].find(
        (b) => b.textContent?.trim() === 'Clear the filters',
      ) as HTMLElement
    ).click();
    await settle();
    expect(router.currentRoute.value.query).toEqual({});
    expect(document.body.textContent).toContain('Sam Reyes approved Grey Saloon');
  });

  test('an empty log says what will appear there', async () => {
    mock.on('GET', auditPath, page([]));
    await openPage();
    expect(document.body.textContent).toContain('Nothing logged yet');
    expect(queries()).toHaveLength(1);
  });

  test('a failed load shows the error with a way to try again', async () => {
    mock.on(
      'GET',
      auditPath,
      // A GET meeting a 503 is tried again twice (api/http.ts) before the page shows the error.
      ...Array.from({ length: 1 + RETRY_DELAYS_MS.length }, () =>
        json(503, {
          error: { code: 'database_unavailable', message: 'The database is unavailable right now.' },
        }),
      ),
      page([changed]),
    );
    await openPage();
    await vi.waitFor(
      () => expect(document.body.textContent).toContain('The database is unavailable right now.'),
      { timeout: 4000 },
    );
    (
      [...document.querySelectorAll('button')].find(
        (b) => b.textContent?.trim() === 'Try again',
      ) as HTMLElement
    ).click();
    await settle();
    expect(document.body.textContent).toContain('Roles changed');
  });
});
