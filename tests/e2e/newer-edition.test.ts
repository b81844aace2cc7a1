// A stricter edition published ahead of its date (issue 13 §1): the demo admin publishes the
// hillclimb schedule's next edition with hoop walls raised, dated 30 days ahead in the club's time
// zone. The publish dialog offers today there (a date the server accepts), refuses a date before the
// edition in force with the reason, and says the edition is scheduled while the one in force stays.
// The re-check runs at once; the builder's mail and the build sheet's banner say the same thing: which
// edition is newer, from when, and what this sheet gets under it. One confirmed action moves the sheet
// to the newer edition as a new revision. Screens land in .artifacts/screens/edition-*.png.
import type { Page } from 'playwright-core';
import { expect, inject } from 'vitest';
import { demoSpecification } from '../../backend/src/db/seed-garage';
import { browserTest as test, openBrowser, screenshot as fullPageShot, type BrowserSession } from './browser';
import { api, demoPassword, demoUsers, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');
const carName = 'Slate Hillclimber';
const HOOPS = ['main_hoop', 'front_hoop', 'lateral_hoop', 'rear_brace'];

async function screenshot(page: Page, name: string): Promise<void> {
  await page.evaluate(() => window.scrollTo(0, 0));
  await fullPageShot(page, name);
}

/** A date in London (the demo club's zone), `days` from today, as YYYY-MM-DD. */
function londonDate(days = 0): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone: 'Europe/London', year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date(Date.now() + days * 86_400_000));
}
const shown = (iso: string) => {
  const [y, m, d] = iso.split('-').map(Number);
  return `${d} ${['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'][m! - 1]} ${y}`;
};

/**
 * The demo hillclimb cage (backend/src/db/seed-garage.ts) on 45 × 2.5 mm hoops and 38 × 2.5 mm other
 * members, the schedule's own listed sizes, with a 2.45 mm sonic reading on each hoop and backstay and
 * an approval date: it meets the schedule in force.
 */
function passingHillCage() {
  const spec = demoSpecification((kind) => (HOOPS.includes(kind) ? { odMm: 45, wallMm: 2.5 } : { odMm: 38, wallMm: 2.5 }));
  return {
    ...spec,
    cage: { approvedOn: '2026-10-01' },
    members: spec.members.map((m) => (HOOPS.includes(m.kind) ? { ...m, wallReadings: [{ method: 'ultrasonic' as const, wallMm: 2.45 }] } : m)),
  };
}

interface TubeReq { id: string; requires: { bands?: { rows: { alternatives: { od: number; wall: number }[] }[] }[] } }

test('a stricter edition scheduled ahead of its date: the builder’s sheet shows the banner and moves to it', async ({ browser }) => {
  const admin = browser.page;
  const others: BrowserSession[] = [];
  try {
    await api(admin, 'POST', '/auth/login', { email: demoUsers.admin, password: demoPassword });
    const me = await api<{ memberships: { club: { id: string } }[] }>(admin, 'GET', '/auth/me');
    const clubId = me.memberships[0]!.club.id;
    const books = await api<{ rulebooks: { id: string; slug: string; versions: { id: string; status: string; edition: string }[] }[] }>(admin, 'GET', `/clubs/${clubId}/rulebooks`);
    const hill = books.rulebooks.find((b) => b.slug === 'tarnwick-vale-mc-hillclimb-2027-metric')!;
    const inForce = hill.versions.find((v) => v.status === 'published')!;

    // The builder's passing sheet and its saved check, through the API as the garage would make them.
    const builderSession = await openBrowser();
    others.push(builderSession);
    const builder = builderSession.page;
    await api(builder, 'POST', '/auth/login', { email: demoUsers.builder, password: demoPassword });
    const car = await api<{ car: { id: string } }>(builder, 'POST', '/cars', { name: carName, make: 'Varden', model: 'Kestrel', year: 2001, chassisType: 'unibody', raceNumber: '8' });
    const sheet = await api<{ buildSheet: { id: string } }>(builder, 'POST', `/cars/${car.car.id}/build-sheets`, { name: 'Hill cage 2027', clubId, rulesetVersionId: inForce.id, classId: 'hill-saloon', specification: passingHillCage() });
    const sheetId = sheet.buildSheet.id;
    const run = await api<{ checkRun: { overallVerdict: string } }>(builder, 'POST', `/build-sheets/${sheetId}/check-runs`);
    expect(run.checkRun.overallVerdict).toBe('pass');

    // The admin's draft: hoops and backstays 45 × 3.0 or 50 × 2.5 mm (walls raised by 0.5 mm; our invented change).
    const draft = await api<{ version: { id: string; lockVersion: number; document: { requirements: TubeReq[] } } }>(admin, 'POST', `/rulebooks/${hill.id}/drafts`);
    const doc = structuredClone(draft.version.document);
    for (const band of doc.requirements.find((r) => r.id === 'hc-main-tubes')!.requires.bands ?? []) for (const row of band.rows) for (const alt of row.alternatives) alt.wall += 0.5;
    await api(admin, 'PUT', `/ruleset-drafts/${draft.version.id}`, { lockVersion: draft.version.lockVersion, document: doc });

    // The publish dialog, as the admin sees it.
    await api(admin, 'POST', '/auth/logout');
    await signIn(admin, baseUrl, demoUsers.admin);
    await admin.goto(`${baseUrl}/ruleset-versions/${draft.version.id}`);
    await admin.getByText('All changes saved').waitFor();
    await admin.getByRole('button', { name: 'Publish…' }).click();
    const dialog = admin.getByRole('dialog', { name: 'Publish this edition' });
    const date = dialog.getByLabel('Takes effect on');
    await date.waitFor();
    expect(await date.inputValue()).toBe(londonDate());
    expect(await dialog.locator('[data-test="publish-date-hint"]').innerText()).toBe(`Dates are the club's, in Europe/London: today there is ${shown(londonDate())}.`);
    // A date before the edition in force (15 Nov 2026) is refused here, with the server's reason.
    await date.fill('2026-11-01');
    expect(await dialog.locator('[data-test="publish-date-hint"]').innerText()).toBe('The effective date 1 Nov 2026 is before 15 Nov 2026, when the current version 1 took effect. Choose 15 Nov 2026 or later.');
    await dialog.getByText('I have looked at the impact').click();
    expect(await dialog.getByRole('button', { name: 'Put in force' }).isDisabled()).toBe(true);
    await screenshot(admin, 'edition-publish-refused');
    const effective = londonDate(30);
    await date.fill(effective);
    expect(await dialog.locator('[data-test="publish-scheduled"]').innerText()).toContain(`comes into force on ${shown(effective)}. Until then edition 2027 stays in force.`);
    await screenshot(admin, 'edition-publish-scheduled');
    await dialog.getByRole('button', { name: 'Schedule it' }).click();
    await dialog.getByText('Re-check done').waitFor({ timeout: 30_000 });
    expect(await dialog.locator('[data-test="publish-result"]').innerText()).toBe(`Scheduled: edition 2028 comes into force on ${shown(effective)}.`);
    await admin.waitForTimeout(1200); // the bar's own fill animation
    await screenshot(admin, 'edition-publish-done');
    await dialog.getByRole('button', { name: 'Done' }).click();
    await admin.getByRole('link', { name: 'All versions' }).click();
    const book = admin.getByRole('region', { name: /Hillclimb/ });
    await book.getByText(`in force from ${shown(effective)} (scheduled)`).waitFor();
    expect(await book.innerText()).toContain('Scheduled');
    expect(await book.innerText()).toContain('in force since 15 Nov 2026');
    await screenshot(admin, 'edition-rulebooks');

    // The builder's mail says from which date the change applies, in the banner's own words.
    let text = '';
    for (let i = 0; i < 60 && !text; i++) {
      const box = await api<{ messages: { id: string; to: string; subject: string }[] }>(admin, 'GET', '/dev/mailbox');
      const m = box.messages.find((x) => x.to === demoUsers.builder && x.subject.includes(`new pre-check verdict for ${carName}`));
      if (m) text = (await api<{ message: { text: string | null } }>(admin, 'GET', `/dev/mailbox/${m.id}`)).message.text ?? '';
      else await admin.waitForTimeout(500);
    }
    const headline = `Tarnwick Vale MC Hillclimb Cage Schedule, edition 2028, applies from ${shown(effective)}. It is not in force yet.`;
    const verdicts = `Under edition 2027 it meets the rules; from ${shown(effective)}, under edition 2028, it does not meet the rules.`;
    expect(text).toContain(headline);
    expect(text).toContain(verdicts);

    // The builder's sheet (signed in above, through the same browser): the banner, then the move.
    await builder.goto(`${baseUrl}/build-sheets/${sheetId}`);
    const banner = builder.locator('[data-test="edition-banner"]');
    await banner.waitFor();
    expect(await banner.getByRole('heading').innerText()).toBe(`Edition 2028 is scheduled: in force from ${shown(effective)}`);
    const said = (await banner.innerText()).replace(/\s+/g, ' ');
    expect(said).toContain(headline);
    expect(said).toContain(verdicts);
    expect(said).toMatch(/Would not meet: Hoops and backstays/);
    await banner.getByRole('button', { name: /Show what changed/ }).click();
    // In the builder's units (the demo builder reads inches; F-UNIT-1: 45 mm = 1.772 in, 2.5 mm = 0.098 in, 3.0 mm = 0.118 in).
    expect(await banner.innerText()).toContain('minimum wall for 1.772 in OD 0.098 → 0.118 in');
    await screenshot(builder, 'edition-sheet-banner');
    await builder.setViewportSize({ width: 390, height: 844 });
    await builder.waitForTimeout(150);
    await screenshot(builder, 'edition-sheet-banner-390');
    await builder.setViewportSize({ width: 1280, height: 800 });

    await banner.locator('[data-test="move-edition"]').click();
    const confirm = builder.getByRole('alertdialog').or(builder.getByRole('dialog', { name: 'Move to edition 2028?' }));
    await confirm.getByText('Revision 1 and its checks keep edition 2027.').waitFor();
    await screenshot(builder, 'edition-move-confirm');
    await confirm.getByRole('button', { name: 'Move to edition 2028' }).click();
    await banner.waitFor({ state: 'detached' });
    await builder.getByText('Moved to edition 2028').waitFor();
    expect(await builder.locator('.sheet-head__meta').innerText()).toContain('Tarnwick Vale MC Hillclimb Cage Schedule, 2028 · revision 2');
    expect((await builder.locator('[data-test="edition-pinned-scheduled"]').innerText()).trim()).toBe(`This sheet is checked against edition 2028, in force from ${shown(effective)} (scheduled). Until then edition 2027 is in force.`);
    await screenshot(builder, 'edition-sheet-moved');
    const revisions = await api<{ revisions: { number: number; rulesetVersionId: string }[] }>(builder, 'GET', `/build-sheets/${sheetId}/revisions`);
    expect(revisions.revisions.map((r) => [r.number, r.rulesetVersionId])).toEqual([[2, draft.version.id], [1, inForce.id]]);

    for (const s of [browser, ...others]) expect(s.pageErrors.map((e) => e.message)).toEqual([]);
  } finally {
    for (const s of others) await s.close();
  }
}, 180_000);
