// The build sheet editor: a save sends the revision it started from; a stale save (409) keeps every
// typed value and explains what happened; field errors from the API land at their inputs; mistakes
// are caught before anything is sent.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import BuildSheetView from '@/views/BuildSheetView.vue';
import { http } from '@/api/http';
import { forgetRulesetVersions } from '@/api/rulesets';
import { useSessionStore } from '@/stores/session';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';
import { session, tarnwick } from './fixtures';
import { mountAt, settle } from './mount-app';
import { IN, noNewerEdition, sheetDetail, sheetId, versionBody, versionId } from './garage-fixtures';

const me = session([{ club: tarnwick, roles: ['builder'] }], { preferredUnits: 'imperial' });
const sheetPath = `/api/build-sheets/${sheetId}`;
let mock: ReturnType<typeof createFetchMock>;

beforeEach(() => {
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
afterEach(() => {
  document.body.innerHTML = '';
});

async function openSheet() {
  const mounted = await mountAt(`/build-sheets/${sheetId}`, BuildSheetView, () => useSessionStore().setSession(me));
  await settle();
  return mounted;
}

const wallInput = () => document.querySelector<HTMLInputElement>('#in-members-0-wallMm')!;
async function type(input: HTMLInputElement, text: string) {
  input.value = text;
  input.dispatchEvent(new Event('input'));
  await settle();
}
async function clickButton(label: string) {
  const button = [...document.querySelectorAll('button')].find((b) => b.textContent?.trim() === label || b.getAttribute('aria-label') === label);
  if (!button) throw new Error(`no button "${label}"`);
  button.click();
  await settle();
}
const posts = () => mock.calls.filter((c) => c.method === 'PUT' && c.path === `${sheetPath}/specification`);

test('the saved specification shows in the builder units, the unit beside each input', async () => {
  await openSheet();
  expect(wallInput().value).toBe('0.065');
  expect(document.querySelector<HTMLInputElement>('#in-members-0-odMm')!.value).toBe('1.625');
  expect(document.querySelector<HTMLInputElement>('#in-vehicle-weightWithoutDriverKg')!.value).toBe('1400'); // 635 kg ≈ 1,400 lb (F-UNIT-1)
  expect(wallInput().closest('.qty')!.querySelector('.qty__unit')!.textContent).toBe('in');
});

describe('saving', () => {
  test('sends the revision it started from, the class and the canonical specification', async () => {
    mock.on('PUT', `${sheetPath}/specification`, json(200, sheetDetail(4, 0.095)));
    await openSheet();
    await type(wallInput(), '0.095');
    await clickButton('Save');

    expect(posts()).toHaveLength(1);
    const body = posts()[0].body as { baseRevision: number; rulesetVersionId: string; classId: string; specification: { members: { wallMm: number }[] } };
    expect(body.baseRevision).toBe(3);
    expect(body.rulesetVersionId).toBe(versionId);
    expect(body.classId).toBe('open-sprint');
    expect(body.specification.members[0].wallMm).toBeCloseTo(0.095 * IN, 9);
    expect(posts()[0].headers['x-csrf-token']).toBe('csrf-sheet');
    expect(document.body.textContent).toContain('revision 4');
  });

  test('a stale revision (409) keeps the typed input, explains, and "keep mine" saves over the newer one', async () => {
    mock.on(
      'PUT',
      `${sheetPath}/specification`,
      apiError(409, 'conflict', 'The sheet was saved meanwhile.', { currentRevision: 5 }),
      json(200, sheetDetail(6, 0.095)),
    );
    await openSheet();
    await type(wallInput(), '0.095');
    await clickButton('Save');

    const alert = document.querySelector('[aria-labelledby="conflict-heading"]')!;
    expect(alert.textContent).toContain('You started from revision 3, but revision 5 was saved since');
    expect(alert.textContent).toContain('Your input is still here');
    expect(wallInput().value).toBe('0.095');

    await clickButton('Keep mine, save over it next');
    await clickButton('Save');
    expect((posts()[1].body as { baseRevision: number }).baseRevision).toBe(5);
    expect(wallInput().value).toBe('0.095');
  });

  test("the API's field errors appear at their inputs (paths under specification.)", async () => {
    mock.on(
      'PUT',
      `${sheetPath}/specification`,
      apiError(400, 'validation_failed', 'Some fields are invalid.', [{ path: 'specification.members.0.wallMm', message: 'Must be less than half the OD' }]),
    );
    await openSheet();
    await type(wallInput(), '0.09');
    await clickButton('Save');
    expect(wallInput().closest('.qty')!.querySelector('.qty__msg--bad')!.textContent).toContain('Must be less than half the OD');
  });

  test('a wall of half the OD or more, or text that is not a number, is caught before anything is sent', async () => {
    await openSheet();
    // 0.9 in is past any cage wall: the field's range says so first (issue 9 §1).
    await type(wallInput(), '0.9');
    expect(wallInput().closest('.qty')!.textContent).toContain("A cage tube's wall is 0.02 to 0.394 in: check the units.");
    // Within the range, a wall of half a small OD is the sheet's own check.
    await type(document.querySelector<HTMLInputElement>('#in-members-0-odMm')!, '0.5');
    await type(wallInput(), '0.3');
    await new Promise((r) => setTimeout(r, 350)); // the live check's pause
    await settle();
    expect(wallInput().closest('.qty')!.textContent).toContain('is half the OD (0.500 in) or more');
    await clickButton('Save');
    await type(wallInput(), '0.o9');
    await clickButton('Save');
    expect(posts()).toHaveLength(0);
    expect(document.querySelector('[role="alert"]')!.textContent).toContain('Nothing was saved');
  });
});

test('the live pre-check marks the thin wall with the rule section, then clears once fixed', async () => {
  await openSheet();
  await new Promise((r) => setTimeout(r, 350));
  await settle();
  const panel = document.querySelector('[aria-labelledby="live-findings-heading"]')!;
  expect(panel.textContent).toContain('§ C4.2.1');
  expect(panel.textContent).toContain('pre-check only');
  expect(wallInput().closest('.qty')!.classList).toContain('qty--bad');
  expect(wallInput().closest('.qty')!.textContent).toContain('§ C4.2.1');

  await type(wallInput(), '0.083');
  await new Promise((r) => setTimeout(r, 350));
  await settle();
  expect(wallInput().closest('.qty')!.classList).not.toContain('qty--bad');
});
