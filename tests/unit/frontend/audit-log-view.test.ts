// The activity log page: entries read as sentences, the filter and paging ask the server with the right
// query, and an empty log or an empty filter says so.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import AuditLogView from '@/views/AuditLogView.vue';
import { http } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import { actionLabel, auditSummary } from '@/components/audit/auditText';
import type { AuditEntry } from '@/api/audit';
import { ref } from 'vue';
import { useAuditLog } from '@/composables/useAuditLog';
import { createFetchMock, json } from './fetch-mock';
import { session, tarnwick } from './fixtures';
import { mountAt, settle } from './mount-app';

const me = session([{ club: tarnwick, roles: ['admin'] }]);
const auditPath = `/api/clubs/${tarnwick.id}/audit`;

function entry(n: number, action: string, details: Record<string, unknown>): AuditEntry {
  return {
    id: `e0000000-0000-4000-8000-00000000000${n}`,
    action,
    entityType: 'membership',
    entityId: 'b0000000-0000-4000-8000-00000000000b',
    actor: { id: me.user.id, email: me.user.email, displayName: 'Pat Hollis' },
    details,
    createdAt: '2026-11-30T10:00:00.000Z',
  };
}
const changed = entry(1, 'membership.roles_changed', {
  email: 'robin@tarnwick.example',
  before: ['builder'],
  after: ['builder', 'steward'],
});
const added = entry(2, 'membership.added', {
  email: 'robin@tarnwick.example',
  roles: ['builder'],
  invited: true,
});

let mock: ReturnType<typeof createFetchMock>;
const queries = () => mock.calls.filter((c) => c.path === auditPath);

beforeEach(() => {
  http.resetCsrfToken();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
});
afterEach(() => {
  document.body.innerHTML = '';
});

async function openPage() {
  const mounted = await mountAt(`/clubs/${tarnwick.id}/activity`, AuditLogView, () =>
    useSessionStore().setSession(me),
  );
  await settle();
  return mounted;
}

describe('auditText', () => {
  test.each([
    [changed, 'Roles changed', 'robin@tarnwick.example: Builder → Builder, Steward'],
    [added, 'Member added', 'robin@tarnwick.example as Builder (invitation sent)'],
    [
      entry(3, 'membership.removed', { email: 'robin@tarnwick.example', roles: ['steward'] }),
      'Member removed',
      'robin@tarnwick.example (was Steward)',
    ],
    [
      entry(4, 'ruleset.version_published', {}),
      'Ruleset: version published',
      'membership b0000000-0000-4000-8000-00000000000b',
    ],
  ])('%#: reads as "%s" / "%s"', (e, label, summary) => {
    expect(actionLabel(e.action)).toBe(label);
    expect(auditSummary(e)).toBe(summary);
  });
});

describe('the activity log page', () => {
  test('shows the entries as rows', async () => {
    mock.on(
      'GET',
      auditPath,
      json(200, {
        entries: [changed, added],
        page: 1,
        pageSize: 25,
        total: 2,
        actions: ['membership.added', 'membership.roles_changed'],
      }),
    );
    await openPage();
    const rows = [...document.querySelectorAll('tbody tr')].map((r) =>
      [...r.querySelectorAll('td')].slice(1).map((td) => td.textContent?.trim()),
    );
    expect(rows).toEqual([
      ['Pat Hollis', 'Roles changed', 'robin@tarnwick.example: Builder → Builder, Steward'],
      ['Pat Hollis', 'Member added', 'robin@tarnwick.example as Builder (invitation sent)'],
    ]);
    expect(new URL(`http://x${mock.calls.at(-1)!.path}`).pathname).toBe(auditPath);
  });

  test('asks for the first page of 25, then sends the chosen filter from page 1', async () => {
    mock.on(
      'GET',
      auditPath,
      json(200, { entries: [added], page: 1, pageSize: 25, total: 60, actions: ['membership.added'] }),
    );
    const clubId = ref(tarnwick.id);
    const log = useAuditLog(clubId);
    await settle();
    log.page.value = 3;
    await settle();
    log.action.value = 'membership.added';
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
    ]);
    expect(log.total.value).toBe(60);
  });

  test('an empty log says what will appear there', async () => {
    mock.on('GET', auditPath, json(200, { entries: [], page: 1, pageSize: 25, total: 0, actions: [] }));
    await openPage();
    expect(document.body.textContent).toContain('Nothing logged yet');
    expect(queries()).toHaveLength(1);
  });

  test('a failed load shows the error with a way to try again', async () => {
    mock.on(
      'GET',
      auditPath,
      json(503, {
        error: { code: 'database_unavailable', message: 'The database is unavailable right now.' },
      }),
      json(200, { entries: [added], page: 1, pageSize: 25, total: 1, actions: [] }),
    );
    await openPage();
    expect(document.body.textContent).toContain('The database is unavailable right now.');
    (
      [...document.querySelectorAll('button')].find(
        (b) => b.textContent?.trim() === 'Try again',
      ) as HTMLElement
    ).click();
    await settle();
    expect(document.body.textContent).toContain('Member added');
  });
});
