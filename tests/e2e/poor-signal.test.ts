// Poor signal at the track (issue 13 §6), in a production build with its service worker: a builder edits
// a sheet, the signal drops (context.setOffline), they type on, including a number with its raw text,
// see the offline banner, try to save (not saved, kept), reload with no signal (the app shell and the
// sheet come from this device, the kept draft is offered and put back as typed, the class list and the
// live pre-check work from the kept edition), the signal returns
// (the banner goes), they save and the server has the values; then a save that meets a newer revision
// goes through the conflict view. A second journey opens the public verification page and the
// builder's own cage record with no signal once seen. Screens: .artifacts/screens/signal-*.png.
import type { BrowserContext, Page } from 'playwright-core';
import { expect, inject } from 'vitest';
import { browserTest as test, screenshot as fullPageShot } from './browser';
import { api, demoSaloon, demoPassword, demoUsers } from './demo';

const baseUrl = inject('e2eBaseUrl');
const IN = 25.4; // F-UNIT-1: 1 in = 25.4 mm

async function screenshot(page: Page, name: string): Promise<void> {
  await page.evaluate(() => window.scrollTo(0, 0));
  await fullPageShot(page, name);
}

/** A club-saloon cage, every wall 0.120 in, that passes under the demo rulebook. */
function saloonCage() {
  return demoSaloon(0.12 * IN);
}

async function newSheet(page: Page, carName: string) {
  await api(page, 'POST', '/auth/login', { email: demoUsers.builder, password: demoPassword });
  const me = await api<{ user: { preferredUnits: string }; memberships: { club: { id: string } }[] }>(page, 'GET', '/auth/me');
  const clubId = me.memberships[0]!.club.id;
  const books = await api<{ rulebooks: { slug: string; versions: { id: string; status: string }[] }[] }>(page, 'GET', `/clubs/${clubId}/rulebooks`);
  const inForce = books.rulebooks.find((b) => b.slug === 'tarnwick-vale-mc-cage-regulations-2027')!.versions.find((v) => v.status === 'published')!;
  const car = await api<{ car: { id: string } }>(page, 'POST', '/cars', { name: carName, make: 'Varden', model: 'Corsair', year: 1999, chassisType: 'unibody', raceNumber: '71' });
  const sheet = await api<{ buildSheet: { id: string } }>(page, 'POST', `/cars/${car.car.id}/build-sheets`, { name: 'Track-day cage', clubId, rulesetVersionId: inForce.id, classId: 'club-saloon', specification: saloonCage() });
  return { sheetId: sheet.buildSheet.id, clubId, imperial: me.user.preferredUnits === 'imperial' };
}

/** Waits until the service worker controls the page, so what it precached is there with no signal. */
async function controlled(page: Page): Promise<void> {
  await page.evaluate(async () => {
    await navigator.serviceWorker.ready;
    if (!navigator.serviceWorker.controller) await new Promise((resolve) => navigator.serviceWorker.addEventListener('controllerchange', resolve, { once: true }));
  });
}

const banner = (page: Page) => page.locator('[data-test="offline-banner"]');

async function goOffline(context: BrowserContext, page: Page): Promise<void> {
  await context.setOffline(true);
  await page.evaluate(() => window.dispatchEvent(new Event('offline')));
}

test('editing offline, then reconnecting, with nothing lost', { timeout: 180_000 }, async ({ browser }) => {
  const { page, context } = browser;
  const { sheetId, imperial } = await newSheet(page, 'Signal test saloon');
  // The door bar's wall as the builder types it, trailing zero and all (the raw text is kept as typed).
  const typedWall = imperial ? '0.1340' : '3.4040';
  const wallMm = imperial ? 0.134 * IN : 3.404;
  const unloads: string[] = [];
  page.on('dialog', (d) => {
    unloads.push(d.type());
    void d.accept();
  });

  await page.goto(`${baseUrl}/build-sheets/${sheetId}`);
  const wall = page.locator('#in-members-5-wallMm');
  await wall.waitFor();
  await controlled(page);

  // The signal drops while the builder types on.
  await goOffline(context, page);
  await wall.fill(typedWall);
  const weight = page.locator('#in-vehicle-weightWithDriverKg');
  await weight.fill(imperial ? '2,700' : '1225');
  await page.getByRole('button', { name: 'Save', exact: true }).click();
  await page.getByText('Not saved: the server cannot be reached').waitFor();
  await banner(page).waitFor();
  expect(await banner(page).innerText()).toContain('Your changes are kept on this device');
  await screenshot(page, 'signal-offline-edit-1280');

  // A reload with no signal: the shell from the service worker, the sheet and the draft from this device.
  await page.reload();
  expect(unloads).toContain('beforeunload'); // unsaved work: the browser asked first
  await page.locator('[data-test="kept-copy"]').waitFor({ timeout: 30_000 });
  await page.locator('[data-test="kept-draft"]').waitFor();
  expect(await page.locator('#in-members-5-wallMm').inputValue()).not.toBe(typedWall); // the copy seen, until asked
  await page.locator('[data-test="kept-restore"]').click();
  await expect.poll(() => page.locator('#in-members-5-wallMm').inputValue()).toBe(typedWall);
  expect(await page.locator('#in-vehicle-weightWithDriverKg').inputValue()).toBe(imperial ? '2,700' : '1225');
  // The class list and the live pre-check work with no signal too: the edition the sheet names was kept
  // on this device when it was first read, and the check runs in the browser.
  // (After the GET's own retries: about 3 s with no signal.)
  await expect.poll(() => page.locator('#sheet-class-select option').allInnerTexts(), { timeout: 20_000 }).toContain('Club Saloon (full cage)');
  const live = page.locator('aside[aria-labelledby="live-findings-heading"] [role="status"]');
  await expect.poll(() => live.innerText(), { timeout: 20_000 }).toBe('Up to date');
  // Whether a newer edition applies waits for the signal, said quietly (no error in red).
  await page.locator('[data-test="edition-no-signal"]').waitFor();
  expect(await page.locator('.edition-banner__error').count()).toBe(0);
  await screenshot(page, 'signal-offline-restored-1280');
  await page.setViewportSize({ width: 390, height: 844 });
  await screenshot(page, 'signal-offline-restored-390');
  await page.setViewportSize({ width: 1280, height: 800 });
  expect(page.url()).not.toContain('/sign-in');

  // The signal returns: the banner goes by itself, and the save reaches the server.
  await context.setOffline(false);
  await page.evaluate(() => window.dispatchEvent(new Event('online')));
  await banner(page).waitFor({ state: 'hidden', timeout: 20_000 });
  await page.locator('[data-test="edition-no-signal"]').waitFor({ state: 'detached' }); // looked up again
  await page.getByRole('button', { name: 'Save', exact: true }).click();
  await page.getByText('Saved as revision 2').waitFor();
  const saved = await api<{ revision: { number: number; specification: { members: { wallMm: number }[]; vehicle: { weightWithDriverKg: number } } } }>(page, 'GET', `/build-sheets/${sheetId}`);
  expect(saved.revision.number).toBe(2);
  expect(saved.revision.specification.members[5]!.wallMm).toBeCloseTo(wallMm, 6);
  expect(saved.revision.specification.vehicle.weightWithDriverKg).toBeCloseTo(imperial ? 2700 * 0.45359237 : 1225, 3); // F-UNIT-2: 1 lb = 0.45359237 kg
  expect(await page.evaluate(() => Object.keys(localStorage).filter((k) => k.startsWith('cagewright.kept.draft.')))).toEqual([]);

  // Offline again; meanwhile the sheet is saved from another device. Back online, the save meets it.
  await goOffline(context, page);
  await page.locator('#in-members-6-wallMm').fill(typedWall);
  await context.setOffline(false);
  const other = saved.revision.specification;
  await api(page, 'PUT', `/build-sheets/${sheetId}/specification`, { baseRevision: 2, rulesetVersionId: (await api<{ buildSheet: { rulesetVersionId: string } }>(page, 'GET', `/build-sheets/${sheetId}`)).buildSheet.rulesetVersionId, classId: 'club-saloon', specification: { ...other, vehicle: { ...other.vehicle, weightWithDriverKg: 1190 } } });
  await page.getByRole('button', { name: 'Save', exact: true }).click();
  await page.getByText('Not saved: the sheet changed meanwhile').waitFor();
  // The input kept its value (tidied to the usual decimals when the Save click left it).
  expect(await page.locator('#in-members-6-wallMm').inputValue()).toBe(imperial ? '0.134' : '3.404');
  await screenshot(page, 'signal-conflict-1280');
  await page.getByRole('button', { name: 'Keep mine, save over it next' }).click();
  await page.getByRole('button', { name: 'Save', exact: true }).click();
  await page.getByText('Saved as revision 4').waitFor();
  expect(browser.pageErrors).toEqual([]);
});

test('the verification page and the builder’s own record open with no signal once seen, and say how old they are', { timeout: 180_000 }, async ({ browser }) => {
  const { page, context } = browser;
  const { sheetId } = await newSheet(page, 'Signal record saloon');
  const run = await api<{ checkRun: { id: string } }>(page, 'POST', `/build-sheets/${sheetId}/check-runs`);
  const submitted = await api<{ submission: { id: string } }>(page, 'POST', '/submissions', { checkRunId: run.checkRun.id });
  const submissionId = submitted.submission.id;
  await api(page, 'POST', '/auth/logout');
  await api(page, 'POST', '/auth/login', { email: demoUsers.steward, password: demoPassword });
  const act = async (type: string) => {
    const s = await api<{ submission: { state: string; version: number } }>(page, 'GET', `/submissions/${submissionId}`);
    await api(page, 'POST', `/submissions/${submissionId}/actions`, { type, expected: { state: s.submission.state, version: s.submission.version } });
  };
  await act('claim');
  await act('approve');
  const record = (await api<{ submission: { record: { id: string; verificationCode: string } } }>(page, 'GET', `/submissions/${submissionId}`)).submission.record;
  await api(page, 'POST', '/auth/logout');
  await api(page, 'POST', '/auth/login', { email: demoUsers.builder, password: demoPassword });

  // Seen once with signal: the record page and the public check.
  await page.goto(`${baseUrl}/cage-records/${record.id}`);
  await page.getByText('Open the reviewed submission').waitFor();
  await controlled(page);
  await page.goto(`${baseUrl}/verify/${record.verificationCode}`);
  await page.locator('[data-test="verify-status"]').waitFor();
  expect(await page.locator('[data-test="kept-answer"]').count()).toBe(0);

  await goOffline(context, page);
  await page.reload();
  await page.locator('[data-test="kept-answer"]').waitFor({ timeout: 30_000 });
  expect(await page.locator('[data-test="kept-answer"]').innerText()).toMatch(/^As of .+, on this device: check again with signal for a revocation\.$/);
  expect((await page.locator('[data-test="verify-status"]').innerText()).trim()).toBe('Valid');
  await banner(page).waitFor();
  await screenshot(page, 'signal-verify-offline-1280');
  await page.setViewportSize({ width: 390, height: 844 });
  await screenshot(page, 'signal-verify-offline-390');
  await page.setViewportSize({ width: 1280, height: 800 });

  await page.goto(`${baseUrl}/cage-records/${record.id}`);
  await page.locator('[data-test="kept-answer"]').waitFor({ timeout: 30_000 });
  expect(page.url()).not.toContain('/sign-in');
  await page.getByText('Open the reviewed submission').waitFor();
  await screenshot(page, 'signal-record-offline-1280');
  expect(browser.pageErrors).toEqual([]);
});
