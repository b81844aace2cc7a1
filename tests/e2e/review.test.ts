// The steward review journey: the demo builder's passing saloon sheet and check run come through the
// API; in the browser the builder submits it with a note, the demo steward claims it and asks for
// changes, the builder resubmits a newer check, the steward reads what changed and approves, the
// builder's decision mail reaches the dev mailbox, the public check page (no sign-in) says valid, the
// steward revokes the record after a confirm, and the public page says revoked.
// Screens land in .artifacts/screens/review-*.png (1280 wide; the public check also at 390).
import type { Page } from 'playwright-core';
import { expect, inject } from 'vitest';
import { browserTest as test, openBrowser, screenshot as fullPageShot, type BrowserSession } from './browser';
import { api, demoSaloon, demoPassword, demoUsers, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');
const carName = 'Blue Saloon';

/**
 * A demo club-saloon cage that passes: 1,200 kg with driver (2,646 lb, the 2,201–3,000 lb band) on
 * 1.750 in hoops. Every wall is 0.120 in (3.048 mm; F-UNIT-1: 1 in = 25.4 mm) so the sheet also passes
 * if the rulebook journey has already raised that band's minimum to 0.120 in.
 */
function passingSaloon(harnessBarBelowShouldersMm = 40) {
  const cage = demoSaloon();
  return { ...cage, geometry: { ...cage.geometry, harnessBarBelowShouldersMm } };
}

/** A full-page shot from the top, so the sticky app bar is drawn where a person sees it. */
async function screenshot(page: Page, name: string): Promise<void> {
  await page.evaluate(() => window.scrollTo(0, 0));
  await fullPageShot(page, name);
}

const stateTag = (page: Page) => page.locator('[data-test="state"]');

/** Opens the club's Review queue from the main navigation and the open submission of our car. */
async function openFromQueue(page: Page, resubmission: boolean): Promise<void> {
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Review queue' }).click();
  await page.getByRole('heading', { name: 'Review queue', level: 1 }).waitFor();
  const item = page.locator('.ql__item', { hasText: carName });
  await item.first().waitFor();
  if (resubmission) await item.getByText('Resubmission').waitFor();
  await screenshot(page, resubmission ? 'review-queue-resubmission' : 'review-queue');
  await item.first().getByRole('link').click();
  await page.waitForURL(/\/submissions\//);
  await stateTag(page).waitFor();
}

async function verifyStatus(page: Page, url: string): Promise<string> {
  await page.goto(url);
  const status = page.locator('[data-test="verify-status"]');
  await status.waitFor();
  return (await status.innerText()).trim();
}

test('a builder submits a check, a steward asks for changes, approves the resubmission and later revokes the record', async ({ browser }) => {
  const builder = browser.page;
  const others: BrowserSession[] = [];
  try {
    // The builder's car, sheet and saved check run, through the API with the page's session.
    await api(builder, 'POST', '/auth/login', { email: demoUsers.builder, password: demoPassword });
    const me = await api<{ memberships: { club: { id: string } }[] }>(builder, 'GET', '/auth/me');
    const clubId = me.memberships[0]!.club.id;
    const books = await api<{ rulebooks: { slug: string; versions: { id: string; status: string }[] }[] }>(builder, 'GET', `/clubs/${clubId}/rulebooks`);
    const cage = books.rulebooks.find((b) => b.slug === 'tarnwick-vale-mc-cage-regulations-2027')!;
    const inForce = cage.versions.find((v) => v.status === 'published')!;
    const car = await api<{ car: { id: string } }>(builder, 'POST', '/cars', { name: carName, make: 'Varden', model: 'Corsair', year: 1996, chassisType: 'unibody', raceNumber: '63' });
    const sheet = await api<{ buildSheet: { id: string } }>(builder, 'POST', `/cars/${car.car.id}/build-sheets`, { name: 'Club saloon cage', clubId, rulesetVersionId: inForce.id, classId: 'club-saloon', specification: passingSaloon() });
    const run1 = await api<{ checkRun: { id: string; overallVerdict: string } }>(builder, 'POST', `/build-sheets/${sheet.buildSheet.id}/check-runs`);
    expect(run1.checkRun.overallVerdict).toBe('pass');
    await api(builder, 'POST', '/auth/logout');

    // The builder submits the check run for review from its page.
    await signIn(builder, baseUrl, demoUsers.builder);
    await builder.goto(`${baseUrl}/check-runs/${run1.checkRun.id}`);
    await builder.getByRole('heading', { name: 'Steward review' }).waitFor();
    await builder.locator('#submit-note').fill('First cage on this car, ready for a look.');
    await screenshot(builder, 'review-check-run-submit');
    await builder.locator('[data-test="submit-review"]').click();
    await builder.waitForURL(/\/submissions\//);
    await expect.poll(() => stateTag(builder).innerText()).toBe('Waiting for a steward');
    expect(await builder.getByRole('region', { name: 'Status' }).innerText()).toContain('First cage on this car, ready for a look.');
    await screenshot(builder, 'review-submitted-builder');

    // The steward claims it from the queue and asks for changes with a note.
    const stewardSession = await openBrowser();
    others.push(stewardSession);
    const steward = stewardSession.page;
    await signIn(steward, baseUrl, demoUsers.steward);
    await openFromQueue(steward, false);
    await steward.locator('[data-test="claim"]').click();
    await expect.poll(() => stateTag(steward).innerText()).toBe('In review');
    const decision = steward.getByRole('form', { name: 'Decision' });
    await decision.getByText('Request changes', { exact: true }).click();
    await steward.locator('#decision-text').fill('Lower the harness bar a little.');
    await screenshot(steward, 'review-steward-request-changes');
    await steward.locator('[data-test="decide"]').click();
    await expect.poll(() => stateTag(steward).innerText()).toBe('Changes requested');
    expect(await steward.locator('[data-test="decision-note"]').innerText()).toContain('Lower the harness bar a little.');

    // The builder edits the sheet (API), runs a new check and resubmits it from the new run's page.
    await api(builder, 'PUT', `/build-sheets/${sheet.buildSheet.id}/specification`, { baseRevision: 1, rulesetVersionId: inForce.id, classId: 'club-saloon', specification: passingSaloon(30) });
    const run2 = await api<{ checkRun: { id: string; overallVerdict: string } }>(builder, 'POST', `/build-sheets/${sheet.buildSheet.id}/check-runs`);
    expect(run2.checkRun.overallVerdict).toBe('pass');
    await builder.goto(`${baseUrl}/check-runs/${run2.checkRun.id}`);
    const asked = builder.locator('[data-test="asked"]');
    await asked.waitFor();
    expect(await asked.innerText()).toContain('Lower the harness bar a little.');
    await builder.locator('#submit-note').fill('Harness bar lowered by 10 mm.');
    await screenshot(builder, 'review-check-run-resubmit');
    await builder.locator('[data-test="submit-review"]').click();
    await builder.waitForURL(/\/submissions\//);
    // It goes back to the steward who asked for the changes, already claimed by them.
    await expect.poll(() => stateTag(builder).innerText()).toBe('In review');
    expect(await builder.locator('[data-test="claimed-by"]').innerText()).toContain('Imogen Feld');

    // The steward sees what changed and approves.
    await openFromQueue(steward, true);
    const changes = steward.getByRole('region', { name: 'What changed since the last submission' });
    await changes.waitFor();
    expect(await changes.innerText()).toContain('Lower the harness bar a little.');
    expect(await changes.locator('[data-test="changes"] li').count()).toBeGreaterThan(0);
    expect(await steward.locator('[data-test="claim"]').count()).toBe(0);
    await expect.poll(() => stateTag(steward).innerText()).toBe('In review');
    expect(await steward.locator('[data-test="blocking"]').count()).toBe(0);
    await steward.getByRole('form', { name: 'Decision' }).getByText('Approve', { exact: true }).click();
    await steward.locator('#decision-text').fill('Good work, see you at scrutineering.');
    await screenshot(steward, 'review-steward-resubmission');
    await steward.locator('[data-test="decide"]').click();
    const confirmBox = steward.getByRole('dialog', { name: `Approve ${carName} (No. 63)?` });
    await confirmBox.waitFor();
    await confirmBox.locator('[data-test="decision-accept"]').click();
    await expect.poll(() => stateTag(steward).innerText()).toBe('Approved');
    const recordCard = steward.getByRole('region', { name: 'Cage record' });
    await recordCard.waitFor();
    expect(await recordCard.locator('[data-test="record-status"]').innerText()).toBe('Valid');
    const verifyUrl = (await recordCard.getByRole('link').first().getAttribute('href'))!;
    expect(verifyUrl).toMatch(new RegExp(`^${baseUrl}/verify/.+`));
    await screenshot(steward, 'review-approved');

    // The builder's decision mail, through the outbox and the fake SMTP server, as the demo admin sees it.
    const adminSession = await openBrowser();
    others.push(adminSession);
    await api(adminSession.page, 'POST', '/auth/login', { email: demoUsers.admin, password: demoPassword });
    let subjects: string[] = [];
    for (let i = 0; i < 60 && !subjects.includes(`Steward decision on ${carName}: approved`); i++) {
      const box = await api<{ messages: { to: string; subject: string }[] }>(adminSession.page, 'GET', '/dev/mailbox');
      subjects = box.messages.filter((m) => m.to === demoUsers.builder).map((m) => m.subject);
      if (!subjects.includes(`Steward decision on ${carName}: approved`)) await adminSession.page.waitForTimeout(500);
    }
    expect(subjects).toContain(`Steward decision on ${carName}: approved`);
    expect(subjects).toContain(`Steward decision on ${carName}: changes requested`);

    // The public check, signed out, at desk and phone width.
    const publicSession = await openBrowser();
    others.push(publicSession);
    const visitor = publicSession.page;
    expect(await verifyStatus(visitor, verifyUrl)).toBe('Valid');
    expect(await visitor.locator('.vr').innerText()).toContain(carName);
    expect(await visitor.locator('.vv__caution').innerText()).toContain('inspector decides');
    await screenshot(visitor, 'review-verify-valid-1280');
    await visitor.setViewportSize({ width: 390, height: 844 });
    await visitor.waitForTimeout(150);
    await screenshot(visitor, 'review-verify-valid-390');
    expect(await visitor.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
    await visitor.setViewportSize({ width: 1280, height: 800 });

    // The steward revokes the record with a reason, after the confirm dialog.
    await steward.locator('[data-test="revoke"]').click();
    const dialog = steward.getByRole('dialog', { name: 'Revoke this cage record?' });
    await dialog.waitFor();
    await steward.locator('#revoke-reason').fill('Crash damage to the main hoop at the autumn sprint.');
    await screenshot(steward, 'review-revoke-confirm');
    await steward.locator('[data-test="revoke-confirm"]').click();
    await dialog.waitFor({ state: 'hidden' });
    await expect.poll(() => recordCard.locator('[data-test="record-status"]').innerText()).toBe('Revoked');
    expect(await recordCard.innerText()).toContain('Crash damage to the main hoop');
    await screenshot(steward, 'review-revoked');

    expect(await verifyStatus(visitor, verifyUrl)).toBe('Revoked');
    await screenshot(visitor, 'review-verify-revoked-1280');
    await visitor.setViewportSize({ width: 390, height: 844 });
    await visitor.waitForTimeout(150);
    await screenshot(visitor, 'review-verify-revoked-390');

    for (const s of [browser, ...others]) expect(s.pageErrors.map((e) => e.message)).toEqual([]);

    // The builder archives the sheet: the journeys share one database, and the rulebook journey counts
    // every live club-saloon sheet its re-check touches.
    await api(builder, 'POST', `/build-sheets/${sheet.buildSheet.id}/archive`);
  } finally {
    for (const s of others) await s.close();
  }
}, 180_000);
