// Poor signal on the build sheet: the draft is kept on this device until it is saved, per user and
// sheet, with the raw text of every typed number (bad text too); reopening offers it back; sign-out
// forgets it; a restored draft that meets a newer revision goes through the conflict view; and with no
// signal the sheet opens from the copy this device saw last, never the sign-in page.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import BuildSheetView from '@/views/BuildSheetView.vue';
import { http } from '@/api/http';
import { keptKey } from '@/api/kept';
import { reportReachable, setProbe } from '@/api/connection';
import { forgetRulesetVersions } from '@/api/rulesets';
import { useSessionStore } from '@/stores/session';
import { KEEP_DELAY_MS } from '@/composables/useBuildSheet';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';
import { session, tarnwick } from './fixtures';
import { mountAt, settle } from './mount-app';
import { IN, noNewerEdition, sheetDetail, sheetId, versionBody, versionId } from './garage-fixtures';

// Each test mounts the whole editor, some twice: slow on a shared machine.
vi.setConfig({ testTimeout: 15000 });

const me = session([{ club: tarnwick, roles: ['builder'] }], { preferredUnits: 'imperial' });
const other = session([{ club: tarnwick, roles: ['builder'] }], { id: 'b0000000-0000-4000-8000-00000000000b', preferredUnits: 'imperial' });
const sheetPath = `/api/build-sheets/${sheetId}`;
let mock: ReturnType<typeof createFetchMock>;

beforeEach(() => {
  localStorage.clear();
  reportReachable();
  setProbe(null);
  http.resetCsrfToken();
  forgetRulesetVersions();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  mock.on('GET', '/api/auth/csrf', csrfToken('csrf-sheet'));
  mock.on('GET', sheetPath, json(200, sheetDetail(3)));
  mock.on('GET', `/api/ruleset-versions/${versionId}`, json(200, versionBody));
  mock.on('GET', `${sheetPath}/revisions`, json(200, { revisions: [] }));
  mock.on('GET', `${sheetPath}/photos`, json(200, { photos: [] }));
  mock.on('GET', `${sheetPath}/editions`, json(200, noNewerEdition));
});
const open: { unmount(): void }[] = [];
afterEach(() => {
  // A view left mounted would still listen for pagehide and beforeunload in the next test.
  for (const w of open.splice(0)) w.unmount();
  document.body.innerHTML = '';
});

async function openSheet(who = me) {
  const mounted = await mountAt(`/build-sheets/${sheetId}`, BuildSheetView, () => useSessionStore().setSession(who));
  open.push(mounted.wrapper);
  await settle();
  return mounted;
}
/** Closes the tab: the view is gone (its listeners too), the kept draft stays. */
function closeTab(mounted: { wrapper: { unmount(): void } }) {
  window.dispatchEvent(new Event('pagehide'));
  mounted.wrapper.unmount();
  open.splice(open.indexOf(mounted.wrapper), 1);
  document.body.innerHTML = '';
}
const input = (path: string) => document.querySelector<HTMLInputElement>(`#in-${path.replace(/\./g, '-')}`)!;
async function type(el: HTMLInputElement, text: string) {
  el.value = text;
  el.dispatchEvent(new Event('input'));
  await settle();
}
async function click(label: string) {
  const button = [...document.querySelectorAll('button')].find((b) => b.textContent?.trim() === label);
  if (!button) throw new Error(`no button "${label}"`);
  button.click();
  await settle();
}
/** The offer is its own chunk, loaded when there is something to offer. */
async function offerShown(): Promise<string> {
  await vi.waitFor(() => expect(document.querySelector('[data-test="kept-draft"]')).not.toBeNull(), { timeout: 4000 });
  return document.querySelector('[data-test="kept-draft"]')!.textContent ?? '';
}
function keptFor(userId: string) {
  const text = localStorage.getItem(keptKey('draft', userId, sheetId));
  return text ? (JSON.parse(text) as { at: number; value: { baseRevision: number; draft: { members: { wallMm?: number; odMm?: number }[] }; typed: Record<string, { text: string; bad: boolean }> } }) : null;
}

describe('kept on this device until saved', () => {
  test('typed numbers are kept after a pause with their raw text, a bad one included', async () => {
    const { wrapper } = await openSheet();
    await type(input('members.0.wallMm'), '0.0950');
    await type(input('members.0.odMm'), '1.75 in.'); // not a number the input takes
    await new Promise((resolve) => setTimeout(resolve, KEEP_DELAY_MS + 50));

    const kept = keptFor(me.user.id)!;
    expect(kept.value.baseRevision).toBe(3);
    expect(kept.value.draft.members[0].wallMm).toBeCloseTo(0.095 * IN, 9);
    expect(kept.value.typed['members.0.wallMm']).toMatchObject({ text: '0.0950', bad: false });
    expect(kept.value.typed['members.0.odMm']).toMatchObject({ text: '1.75 in.', bad: true });
    expect(wrapper.exists()).toBe(true);
  });

  test('closing the tab writes at once; reopening offers the draft, and restoring brings the typed text back', async () => {
    const first = await openSheet();
    await type(input('members.0.wallMm'), '0.0950');
    await type(input('members.0.odMm'), '1.75 in.');
    closeTab(first);
    expect(keptFor(me.user.id)).not.toBeNull();

    await openSheet();
    expect(input('members.0.wallMm').value).toBe('0.065'); // the saved revision until asked
    expect(await offerShown()).toContain('started from revision 3');
    await click('Put my changes back');

    expect(input('members.0.wallMm').value).toBe('0.0950'); // as typed, not re-formatted to 0.095
    expect(input('members.0.odMm').value).toBe('1.75 in.');
    expect(input('members.0.odMm').getAttribute('aria-invalid')).toBe('true');
    expect(document.body.textContent).toContain('unsaved changes');
  });

  test('discarding asks once more, then forgets the kept draft', async () => {
    const first = await openSheet();
    await type(input('members.0.wallMm'), '0.095');
    closeTab(first);
    await openSheet();
    await offerShown();
    await click('Discard them');
    expect(keptFor(me.user.id)).not.toBeNull();
    await click('Yes, discard');
    expect(keptFor(me.user.id)).toBeNull();
    expect(document.querySelector('[data-test="kept-draft"]')).toBeNull();
  });

  test('a save forgets the kept draft', async () => {
    mock.on('PUT', `${sheetPath}/specification`, json(200, sheetDetail(4, 0.095)));
    await openSheet();
    await type(input('members.0.wallMm'), '0.095');
    window.dispatchEvent(new Event('pagehide'));
    expect(keptFor(me.user.id)).not.toBeNull();
    await click('Save');
    expect(keptFor(me.user.id)).toBeNull();
  });

  test('a warning is asked for before the tab closes with unsaved work, not without', async () => {
    await openSheet();
    const clean = new Event('beforeunload', { cancelable: true });
    window.dispatchEvent(clean);
    expect(clean.defaultPrevented).toBe(false);
    await type(input('members.0.wallMm'), '0.095');
    const dirty = new Event('beforeunload', { cancelable: true });
    window.dispatchEvent(dirty);
    expect(dirty.defaultPrevented).toBe(true);
  });
});

describe('per user, and forgotten at sign-out', () => {
  test('another user on the same laptop is not offered the draft; sign-out forgets only the leaver’s', async () => {
    const first = await openSheet(me);
    await type(input('members.0.wallMm'), '0.095');
    closeTab(first);

    const second = await openSheet(other);
    expect(document.querySelector('[data-test="kept-draft"]')).toBeNull();
    await type(input('members.0.wallMm'), '0.12');
    window.dispatchEvent(new Event('pagehide'));
    expect(keptFor(other.user.id)).not.toBeNull();
    expect(keptFor(me.user.id)!.value.draft.members[0].wallMm).toBeCloseTo(0.095 * IN, 9);

    mock.on('POST', '/api/auth/logout', json(204));
    await useSessionStore(second.pinia).signOut();
    expect(keptFor(other.user.id)).toBeNull();
    expect(localStorage.getItem('cagewright.kept.session')).toBeNull();
    expect(keptFor(me.user.id)).not.toBeNull();
  });

  test('signing out with no signal still forgets the drafts on this device', async () => {
    const mounted = await openSheet(me);
    await type(input('members.0.wallMm'), '0.095');
    closeTab(mounted);
    const { pinia } = mounted;
    mock.on('POST', '/api/auth/logout', () => {
      throw new TypeError('Failed to fetch');
    });
    await useSessionStore(pinia).signOut().catch(() => undefined);
    expect(keptFor(me.user.id)).toBeNull();
  });
});

describe('after reconnecting', { timeout: 15000 }, () => {
  test('a kept draft from revision 3 saved over revision 4 goes through the conflict view', async () => {
    const first = await openSheet();
    await type(input('members.0.wallMm'), '0.095');
    closeTab(first);

    mock.on('GET', sheetPath, json(200, sheetDetail(4, 0.08))); // saved meanwhile from another device
    mock.on('PUT', `${sheetPath}/specification`, apiError(409, 'conflict', 'The sheet was saved meanwhile.', { currentRevision: 4 }));
    await openSheet();
    expect(await offerShown()).toContain('Revision 4 has been saved since');
    await click('Put my changes back');
    await click('Save');

    const put = mock.calls.find((c) => c.method === 'PUT')!;
    expect((put.body as { baseRevision: number }).baseRevision).toBe(3);
    expect(document.body.textContent).toContain('Not saved: the sheet changed meanwhile');
    expect(input('members.0.wallMm').value).toBe('0.095');
    expect(keptFor(me.user.id)).not.toBeNull(); // still kept until it is saved
  });

  test('with no signal the sheet opens from the copy seen here, a save explains, and the draft is kept', async () => {
    closeTab(await openSheet());
    mock.on('GET', sheetPath, () => {
      throw new TypeError('Failed to fetch');
    });
    mock.on('PUT', `${sheetPath}/specification`, () => {
      throw new TypeError('Failed to fetch');
    });
    await openSheet(); // the GET is tried three times over about 2.6 s, then the kept copy opens
    await vi.waitFor(() => expect(document.querySelector('[data-test="kept-copy"]')?.textContent).toContain('No signal'), { timeout: 6000 });
    expect(input('members.0.wallMm').value).toBe('0.065');
    await type(input('members.0.wallMm'), '0.095');
    await click('Save');
    await vi.waitFor(() => expect(document.body.textContent).toContain('Your changes are kept on this device'));
    expect(keptFor(me.user.id)!.value.typed['members.0.wallMm']!.text).toBe('0.095');
  });
});
