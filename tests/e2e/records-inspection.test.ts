// The steward sees what they approve (issue 13 §3): a builder's car is approved; the steward opens
// "Cage records" from the menu, finds the record by the car's race number, opens it and records a
// track inspection with a seal number and sonic wall readings typed in their own units (one under
// the rulebook's minimum, flagged as typed and on the saved history). Anyone at the track then checks
// the record's code: the page shows the record number, club, make and model, expiry and the seal,
// and no people and no photos. Screens at 1280 and 390 px land in .artifacts/screens/records-*.png.
import type { Page } from 'playwright-core';
import { expect, inject } from 'vitest';
import { browserTest as test, openBrowser, screenshot, type BrowserSession } from './browser';
import { api, demoSaloon, demoPassword, demoUsers, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');
const carName = 'Slate Roadster';
const raceNumber = '618';

/** A passing demo club-saloon cage: every wall 0.120 in (3.048 mm; F-UNIT-1: 1 in = 25.4 mm), above any band's minimum. */
function passingCage() {
  return demoSaloon();
}

/** Types a wall in whatever units the input shows: `mm` millimetres, else inches. */
async function typeWall(page: Page, memberId: string, mm: number): Promise<void> {
  const box = page.locator(`[data-test="wall-${memberId}"]`);
  const unit = (await box.locator('.bq__unit').innerText()).trim();
  await box.locator('input').fill(unit === 'mm' ? mm.toFixed(2) : (mm / 25.4).toFixed(3));
  await box.locator('input').blur();
}

test('a steward finds a record by race number, records a track inspection, and the public check shows make, model, club and expiry', async ({ browser }) => {
  const steward = browser.page;
  const others: BrowserSession[] = [];
  try {
    // The builder's car, checked, submitted; the steward approves it (the review itself is another journey's).
    await api(steward, 'POST', '/auth/login', { email: demoUsers.builder, password: demoPassword });
    const me = await api<{ user: { displayName: string }; memberships: { club: { id: string; name: string } }[] }>(steward, 'GET', '/auth/me');
    const club = me.memberships[0]!.club;
    const books = await api<{ rulebooks: { slug: string; versions: { id: string; status: string }[] }[] }>(steward, 'GET', `/clubs/${club.id}/rulebooks`);
    const inForce = books.rulebooks.find((b) => b.slug === 'tarnwick-vale-mc-cage-regulations-2027')!.versions.find((v) => v.status === 'published')!;
    const car = await api<{ car: { id: string } }>(steward, 'POST', '/cars', { name: carName, make: 'Orlen', model: 'Tarrant', year: 1991, chassisType: 'unibody', raceNumber });
    const sheet = await api<{ buildSheet: { id: string } }>(steward, 'POST', `/cars/${car.car.id}/build-sheets`, { name: 'Roadster cage', clubId: club.id, rulesetVersionId: inForce.id, classId: 'club-saloon', specification: passingCage() });
    const run = await api<{ checkRun: { id: string } }>(steward, 'POST', `/build-sheets/${sheet.buildSheet.id}/check-runs`);
    const sub = await api<{ submission: { id: string; state: string; version: number } }>(steward, 'POST', '/submissions', { checkRunId: run.checkRun.id });
    await api(steward, 'POST', '/auth/logout');
    await api(steward, 'POST', '/auth/login', { email: demoUsers.steward, password: demoPassword });
    const stewardName = (await api<{ user: { displayName: string } }>(steward, 'GET', '/auth/me')).user.displayName;
    const claimed = await api<{ submission: { state: string; version: number } }>(steward, 'POST', `/submissions/${sub.submission.id}/actions`, { type: 'claim', expected: { state: sub.submission.state, version: sub.submission.version } });
    const decided = await api<{ submission: { record: { number: string; verificationCode: string } } }>(steward, 'POST', `/submissions/${sub.submission.id}/actions`, { type: 'approve', expected: { state: claimed.submission.state, version: claimed.submission.version } });
    const record = decided.submission.record;
    await api(steward, 'POST', '/auth/logout');

    // The steward: the menu's "Cage records", found by race number.
    await signIn(steward, baseUrl, demoUsers.steward);
    await steward.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Cage records' }).click();
    await steward.getByRole('heading', { name: 'Cage records', level: 1 }).waitFor();
    await steward.getByLabel('Find a record').fill(`No. ${raceNumber}`);
    const row = steward.locator('[data-test="record-row"]', { hasText: record.number });
    await row.waitFor();
    await expect.poll(() => steward.locator('[data-test="record-row"]').count()).toBe(1);
    expect(await row.innerText()).toContain(carName);
    expect(await row.innerText()).toContain('Orlen Tarrant');
    expect(await row.locator('[data-test="record-row-status"]').innerText()).toBe('Valid');
    expect(await row.innerText()).toContain('No track inspection yet');
    await screenshot(steward, 'records-found-1280');
    // A race number that is nobody's: the empty state says what to do.
    await steward.getByLabel('Find a record').fill('No. 99999');
    await steward.locator('[data-test="records-empty"]').waitFor();
    expect(await steward.locator('[data-test="records-empty"]').innerText()).toContain('No record matches');
    await screenshot(steward, 'records-empty-1280');
    await steward.getByLabel('Find a record').fill(raceNumber);
    await row.getByRole('link').click();
    await steward.getByRole('heading', { name: `Cage record ${record.number}`, level: 1 }).waitFor();

    // The inspection: a seal number, a normal reading on the main hoop and a thin one on the front hoop.
    await steward.locator('[data-test="inspection-add"]').click();
    await steward.locator('[data-test="inspection-seal"]').fill('TV-S-6180');
    await typeWall(steward, 'mh', 3.05);
    await typeWall(steward, 'fh', 1.6);
    expect(await steward.locator('[data-test="wall-mh"] [data-test="wall-below"]').count()).toBe(0);
    await steward.locator('[data-test="wall-fh"] [data-test="wall-below"]').waitFor();
    expect(await steward.locator('[data-test="wall-fh"]').innerText()).toContain('Under the rulebook’s minimum');
    await screenshot(steward, 'records-inspection-form-1280');
    await steward.locator('[data-test="inspection-save"]').click();
    const saved = steward.locator('[data-test="inspection"]').first();
    await saved.waitFor();
    expect(await saved.locator('[data-test="inspection-seal-shown"]').innerText()).toBe('TV-S-6180');
    expect(await saved.innerText()).toContain(stewardName);
    const readings = saved.locator('[data-test="inspection-reading"]');
    expect(await readings.count()).toBe(2);
    expect(await readings.nth(1).innerText()).toContain('under the minimum');
    expect(await readings.nth(0).innerText()).not.toContain('under the minimum');
    await screenshot(steward, 'records-inspected-1280');

    // Back on the list, the row shows the inspection.
    await steward.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Cage records' }).click();
    await steward.getByLabel('Find a record').fill(raceNumber);
    await expect.poll(() => row.innerText()).toContain('seal TV-S-6180');

    // At 390 px: the records page and the record with its history.
    const phone = await openBrowser({ width: 390, height: 844 });
    others.push(phone);
    await signIn(phone.page, baseUrl, demoUsers.steward);
    await phone.page.goto(`${baseUrl}/clubs/${club.id}/records`);
    await phone.page.getByLabel('Find a record').fill(raceNumber);
    await phone.page.locator('[data-test="record-row"]', { hasText: record.number }).waitFor();
    await screenshot(phone.page, 'records-found-390');
    await phone.page.locator('[data-test="record-row"]', { hasText: record.number }).getByRole('link').click();
    await phone.page.locator('[data-test="inspection"]').first().waitFor();
    await phone.page.locator('[data-test="inspection-add"]').click();
    await typeWall(phone.page, 'fh', 1.6);
    await screenshot(phone.page, 'records-record-390');

    // Anyone at the track, signed out: the public check.
    const track = await openBrowser({ width: 390, height: 844 });
    others.push(track);
    await track.page.goto(`${baseUrl}/verify/${record.verificationCode}`);
    const status = track.page.locator('[data-test="verify-status"]');
    await status.waitFor();
    expect(await status.innerText()).toContain('Valid');
    expect(await track.page.locator('[data-test="verify-number"]').innerText()).toBe(record.number);
    expect(await track.page.locator('[data-test="verify-club"]').innerText()).toBe(club.name);
    expect(await track.page.locator('[data-test="verify-make-model"]').innerText()).toBe('Orlen Tarrant');
    expect(await track.page.locator('[data-test="verify-expiry"]').innerText()).toMatch(/^\d{1,2} [A-Z][a-z]{2} \d{4}$/);
    expect(await track.page.locator('[data-test="verify-inspection"]').innerText()).toContain('seal TV-S-6180');
    const shown = await track.page.locator('main').innerText();
    expect(shown).not.toContain(stewardName);
    expect(shown).not.toContain(me.user.displayName);
    expect(shown).not.toMatch(/tarnwick\.example/);
    expect(await track.page.locator('main img').count()).toBe(0);
    await screenshot(track.page, 'records-verify-390');
    const wide = await openBrowser();
    others.push(wide);
    await wide.page.goto(`${baseUrl}/verify/${record.verificationCode}`);
    await wide.page.locator('[data-test="verify-number"]').waitFor();
    await screenshot(wide.page, 'records-verify-1280');
    for (const s of [browser, ...others]) expect(s.pageErrors).toEqual([]);
  } finally {
    for (const s of others) await s.close();
  }
});
