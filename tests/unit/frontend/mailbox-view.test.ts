// The mailbox page: lists caught mail, opens one (HTML only in a script-less sandbox), clears only after a
// confirmation, says plainly when the server has no mailbox, and the menu shows it only when it exists.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import MailboxView from '@/views/MailboxView.vue';
import { http } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import { navEntries, visibleNavLinks } from '@/layout/navigation';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';
import { session, tarnwick } from './fixtures';
import { mountAt, settle } from './mount-app';

const me = session([{ club: tarnwick, roles: ['admin'] }]);
const first = {
  id: 'f0000000-0000-4000-8000-000000000001',
  to: 'robin@tarnwick.example',
  from: '"Cagewright" <no-reply@cagewright.example>',
  subject: 'Your build sheet needs another look',
  receivedAt: '2026-11-30T09:15:00.000Z',
  hasHtml: true,
};
const second = {
  ...first,
  id: 'f0000000-0000-4000-8000-000000000002',
  subject: 'Welcome to Tarnwick',
  hasHtml: false,
};

let mock: ReturnType<typeof createFetchMock>;

beforeEach(() => {
  http.resetCsrfToken();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  mock.on('GET', '/api/auth/csrf', csrfToken('csrf-mb'));
  mock.on('GET', '/api/dev/mailbox', json(200, { messages: [first, second] }));
  mock.on(
    'GET',
    `/api/dev/mailbox/${first.id}`,
    json(200, {
      message: { ...first, text: 'Hello Robin,\n\nThe verdict changed.', html: '<p>Hello <b>Robin</b></p>' },
    }),
  );
});
let unmount: (() => void) | null = null;
afterEach(() => {
  unmount?.();
  unmount = null;
  document.body.innerHTML = '';
});

async function openPage() {
  const mounted = await mountAt('/dev/mailbox', MailboxView, () => useSessionStore().setSession(me));
  unmount = () => mounted.wrapper.unmount();
  await settle();
  return mounted;
}

function button(label: string): HTMLButtonElement {
  const found = [...document.querySelectorAll('button')].find(
    (b) => b.getAttribute('aria-label') === label || b.textContent?.trim() === label,
  );
  if (!found) throw new Error(`no button "${label}"`);
  return found;
}

async function click(el: HTMLElement) {
  el.click();
  await settle();
}

describe('the mailbox page', () => {
  test('lists the caught mails and opens one with its text, then its HTML in a sandbox', async () => {
    await openPage();
    const items = [...document.querySelectorAll('.mailbox-list__item')];
    expect(items.map((i) => i.querySelector('.mailbox-list__subject')?.textContent)).toEqual([
      'Your build sheet needs another look',
      'Welcome to Tarnwick',
    ]);

    await click(items[0] as HTMLElement);
    expect(document.querySelector('#mail-subject')?.textContent).toBe('Your build sheet needs another look');
    expect(document.querySelector('.mail__text')?.textContent).toBe('Hello Robin,\n\nThe verdict changed.');

    await click(button('HTML'));
    const frame = document.querySelector('iframe.mail__html');
    expect(frame?.getAttribute('sandbox')).toBe('');
    expect(frame?.getAttribute('srcdoc')).toBe('<p>Hello <b>Robin</b></p>');
  });

  test('clears only after a confirmation, with the CSRF token', async () => {
    mock.on('DELETE', '/api/dev/mailbox', json(204));
    await openPage();

    await click(button('Clear mailbox'));
    expect(document.body.textContent).toContain('Delete all 2 caught messages?');
    await click(button('Cancel'));
    expect(mock.calls.filter((c) => c.method === 'DELETE')).toHaveLength(0);

    await click(button('Clear mailbox'));
    const dialogButtons = [
      ...document.querySelectorAll('[role="alertdialog"] button, [role="dialog"] button'),
    ];
    await click(dialogButtons.find((b) => b.textContent?.trim() === 'Clear mailbox') as HTMLElement);
    const deletes = mock.calls.filter((c) => c.method === 'DELETE');
    expect(deletes.map((c) => [c.path, c.headers['x-csrf-token']])).toEqual([
      ['/api/dev/mailbox', 'csrf-mb'],
    ]);
    expect(document.body.textContent).toContain('The mailbox is empty');
  });

  test('shows the empty state, and Refresh asks again', async () => {
    mock.on('GET', '/api/dev/mailbox', json(200, { messages: [] }), json(200, { messages: [second] }));
    await openPage();
    expect(document.body.textContent).toContain('The mailbox is empty');
    await click(button('Refresh'));
    expect(document.body.textContent).toContain('Welcome to Tarnwick');
    expect(mock.calls.filter((c) => c.path === '/api/dev/mailbox')).toHaveLength(2);
  });

  test('says so when the server runs without the fake mail server (404)', async () => {
    mock.on('GET', '/api/dev/mailbox', apiError(404, 'not_found', 'No such API route.'));
    await openPage();
    expect(document.body.textContent).toContain('This server runs without its local test mail server');
    expect(document.body.textContent).not.toContain('The mailbox is empty');
  });

  test('shows other errors as they are', async () => {
    mock.on('GET', '/api/dev/mailbox', apiError(403, 'forbidden', 'Your role does not allow this.'));
    await openPage();
    expect(document.querySelector('[role="alert"], .p-message')?.textContent).toContain(
      'Your role does not allow this.',
    );
  });
});

describe('the Mailbox menu entry', () => {
  const labels = (roles: ('admin' | 'builder')[], features: Set<'mailbox'>) =>
    visibleNavLinks(navEntries, tarnwick.id, roles, features).map((l) => l.label);

  test.each([
    [['admin'] as const, true, true],
    [['admin'] as const, false, false],
    [['builder'] as const, true, false],
  ])('roles %j with the mailbox on=%s: shown=%s', (roles, on, shown) => {
    const features = new Set<'mailbox'>(on ? ['mailbox'] : []);
    expect(labels([...roles], features).includes('Mailbox')).toBe(shown);
  });
});
