// Journeys through the admin's plumbing pages: a mail sent to the server's fake SMTP server shows up in
// the Mailbox (text and HTML), a member change shows up in the Activity log, and a builder sees neither.
// The log in words (issue 13 §4): a builder's submission approved by the steward reads as sentences with
// links, filtered by car and by person; an invitation reaches the Mailbox and the log says it was
// e-mailed; an admin creates a new rulebook, and the editor warns when a changed tube table no longer
// lists the size its explanation quotes. Screens: .artifacts/screens/activity-*, members-*, rulebook-new-*.
import type { Page } from 'playwright-core';
import { createTransport } from 'nodemailer';
import { expect, inject } from 'vitest';
import { browserTest as test, openBrowser, screenshot, type BrowserSession } from './browser';
import { api, demoSaloon, demoUsers, mainNavLabels, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');
const smtpPort = inject('e2eSmtpPort');

/**
 * A demo club-saloon cage that passes: 1,200 kg with driver on 1.750 in hoops, every wall 0.120 in
 * (3.048 mm; F-UNIT-1: 1 in = 25.4 mm), so it passes whichever edition another journey put in force.
 */
function passingSaloon() {
  return demoSaloon();
}

/** Picks an option of a PrimeVue Select by its label, typing into its search box first. */
async function choose(page: Page, selectId: string, search: string, option: RegExp): Promise<void> {
  await page.locator(`#${selectId}`).click();
  const overlay = page.locator('.p-select-overlay');
  await overlay.waitFor();
  await overlay.locator('input').fill(search);
  await overlay.getByRole('option', { name: option }).click();
  await overlay.waitFor({ state: 'detached' });
}

async function settledRows(page: Page) {
  await page.locator('.p-datatable-mask').waitFor({ state: 'detached' });
  return page.locator('tbody tr');
}

test('an admin reads a caught mail in the Mailbox', async ({ browser }) => {
  const { page } = browser;
  // A real SMTP conversation with the running server's fake, as the outbox dispatcher has it.
  const transport = createTransport({ url: `smtp://127.0.0.1:${smtpPort}` });
  await transport.sendMail({
    from: 'Cagewright <no-reply@cagewright.example>',
    to: 'builder@tarnwick.example',
    subject: 'Tarnwick Vale rulebook 2027: your build sheet needs another look',
    text: 'Hello Robin,\n\nThe 2027 edition changes the verdict of "Escort Mk2 clubman".\n\nOpen the build sheet: http://127.0.0.1/garage',
    html: '<p>Hello Robin,</p><p>The 2027 edition changes the verdict of <b>Escort Mk2 clubman</b>.</p>',
  });
  transport.close();

  await signIn(page, baseUrl, demoUsers.admin);
  await page.getByRole('link', { name: 'Mailbox' }).click();
  await page.getByRole('heading', { name: 'Mailbox', level: 1 }).waitFor();
  const item = page.getByRole('button', { name: /your build sheet needs another look/ });
  await item.waitFor();
  await item.click();
  await page.locator('#mail-subject').waitFor();
  expect(await page.locator('.mail__text').innerText()).toContain('The 2027 edition changes the verdict');
  await screenshot(page, 'mailbox-text');

  await page.getByRole('button', { name: 'HTML' }).click();
  await page.locator('iframe.mail__html').waitFor();
  expect(await page.frameLocator('iframe.mail__html').locator('b').innerText()).toBe('Escort Mk2 clubman');
  await screenshot(page, 'mailbox-html');

  await page.getByRole('button', { name: 'Clear mailbox' }).click();
  await page.getByRole('alertdialog').getByRole('button', { name: 'Clear mailbox' }).click();
  await page.getByText('The mailbox is empty').waitFor();
  await screenshot(page, 'mailbox-empty');
  expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
});

test('an admin sees member changes in the Activity log', async ({ browser }) => {
  const { page } = browser;
  await signIn(page, baseUrl, demoUsers.admin);
  await page.getByRole('link', { name: 'Activity log' }).click();
  await page.getByRole('heading', { name: 'Activity log', level: 1 }).waitFor();
  // Other journeys share this database and may have logged first: wait for the list or its empty state.
  await page.locator('table tbody tr, :text("Nothing logged yet")').first().waitFor();
  await screenshot(page, 'activity-log-before');

  // A change through the API with the page's own session (cookie and CSRF token), as the members page does.
  const { token } = (await (await page.request.get(`${baseUrl}/api/auth/csrf`)).json()) as { token: string };
  const me = (await (await page.request.get(`${baseUrl}/api/auth/me`)).json()) as {
    memberships: { club: { id: string } }[];
  };
  const clubId = me.memberships[0]!.club.id;
  const res = await page.request.post(`${baseUrl}/api/clubs/${clubId}/members`, {
    headers: { 'X-CSRF-Token': token },
    data: { email: 'wyn.parry@tarnwick.example', roles: ['builder'] },
  });
  expect(res.status()).toBe(201);

  await page.getByRole('button', { name: 'Refresh' }).click();
  const row = page.locator('tbody tr', { hasText: 'wyn.parry@tarnwick.example' });
  await row.waitFor();
  await page.locator('.p-datatable-mask').waitFor({ state: 'detached' });
  expect(await row.innerText()).toContain('Member added');
  expect(await row.innerText()).toContain('Dara Quill');
  await screenshot(page, 'activity-log');
  expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
});

test('a builder has neither page, not even by address', async ({ browser }) => {
  const { page } = browser;
  await signIn(page, baseUrl, demoUsers.builder);
  expect(await mainNavLabels(page)).not.toContain('Mailbox');
  expect(await mainNavLabels(page)).not.toContain('Activity log');
  await page.goto(`${baseUrl}/dev/mailbox`);
  await page.waitForURL(`${baseUrl}/`);
  const res = await page.request.get(`${baseUrl}/api/dev/mailbox`);
  expect(res.status()).toBe(403);
});

test('an admin reads the log in words: a car’s approval with links, filters, an e-mailed invitation and a new rulebook', async ({ browser }) => {
  const others: BrowserSession[] = [];
  try {
    // The builder's car goes in for review and the steward approves it, both through the API with their own sessions.
    const builder = await openBrowser();
    const steward = await openBrowser();
    others.push(builder, steward);
    await signIn(builder.page, baseUrl, demoUsers.builder);
    await signIn(steward.page, baseUrl, demoUsers.steward);
    const me = await api<{ memberships: { club: { id: string } }[] }>(builder.page, 'GET', '/auth/me');
    const clubId = me.memberships[0]!.club.id;
    const { rulebooks } = await api<{ rulebooks: { slug: string; versions: { id: string; status: string }[] }[] }>(builder.page, 'GET', `/clubs/${clubId}/rulebooks`);
    const edition = rulebooks.find((b) => b.slug === 'tarnwick-vale-mc-cage-regulations-2027')!.versions.find((v) => v.status === 'published')!;
    const { car } = await api<{ car: { id: string } }>(builder.page, 'POST', '/cars', { name: 'Amber Roadster', make: 'Varden', model: 'Corsair', year: 1994, chassisType: 'unibody', raceNumber: '31' });
    const { buildSheet } = await api<{ buildSheet: { id: string } }>(builder.page, 'POST', `/cars/${car.id}/build-sheets`, {
      name: 'Roll cage 2027', clubId, rulesetVersionId: edition.id, classId: 'club-saloon', specification: passingSaloon(),
    });
    const { checkRun } = await api<{ checkRun: { id: string } }>(builder.page, 'POST', `/build-sheets/${buildSheet.id}/check-runs`);
    const { submission } = await api<{ submission: { id: string } }>(builder.page, 'POST', '/submissions', { checkRunId: checkRun.id, note: 'Ready for a look.' });
    const decide = async (action: Record<string, unknown>) => {
      const seen = (await api<{ submission: { state: string; version: number } }>(steward.page, 'GET', `/submissions/${submission.id}`)).submission;
      await api(steward.page, 'POST', `/submissions/${submission.id}/actions`, { ...action, expected: { state: seen.state, version: seen.version } });
    };
    await decide({ type: 'claim' });
    await decide({ type: 'approve' });

    // The admin filters the log by the car: sentences, each name a link.
    const { page } = browser;
    await signIn(page, baseUrl, demoUsers.admin);
    await page.getByRole('link', { name: 'Activity log' }).click();
    await page.getByRole('heading', { name: 'Activity log', level: 1 }).waitFor();
    await choose(page, 'activity-car', 'Amber', /^Amber Roadster · Robin Ashcombe$/);
    await page.waitForURL(new RegExp(`carId=${car.id}`));
    await page.locator('tbody tr', { hasText: 'approved Amber Roadster' }).waitFor();
    const rows = await settledRows(page);
    const texts = (await rows.allInnerTexts()).map((t) => t.replace(/\s+/g, ' '));
    expect(texts.every((t) => t.includes('Amber Roadster'))).toBe(true);
    expect(texts.some((t) => /Robin Ashcombe sent Amber Roadster for review, build sheet Roll cage 2027\./.test(t))).toBe(true);
    expect(texts.some((t) => /Imogen Feld took up the review of Amber Roadster\./.test(t))).toBe(true);
    const approval = rows.filter({ hasText: 'approved Amber Roadster' });
    const approvalText = (await approval.innerText()).replace(/\s+/g, ' ');
    const recordNumber = /record (\S+)\./.exec(approvalText)![1]!;
    expect(approvalText).toContain(`Imogen Feld approved Amber Roadster, record ${recordNumber}.`);
    expect(await approval.getByRole('link', { name: 'Imogen Feld' }).getAttribute('href')).toMatch(new RegExp(`/clubs/${clubId}/members#member-`));
    expect(await approval.getByRole('link', { name: recordNumber }).getAttribute('href')).toMatch(/^\/cage-records\//);
    await screenshot(page, 'activity-log-car');
    await page.setViewportSize({ width: 390, height: 844 });
    await page.waitForTimeout(150);
    await screenshot(page, 'activity-log-car-390');
    await page.setViewportSize({ width: 1280, height: 800 });

    // And by person: the steward's entries about this car only.
    await choose(page, 'activity-person', 'Imogen', /^Imogen Feld/);
    await page.waitForURL(/personId=/);
    await page.locator('tbody tr', { hasText: 'approved Amber Roadster' }).waitFor();
    const stewardRows = (await (await settledRows(page)).allInnerTexts()).map((t) => t.replace(/\s+/g, ' '));
    expect(stewardRows.length).toBeGreaterThanOrEqual(3);
    expect(stewardRows.every((t) => t.includes('Imogen Feld') && !t.includes('Robin Ashcombe sent'))).toBe(true);
    await screenshot(page, 'activity-log-car-person');
    // A kind of change with nothing for this car and person (the builder sent it, not the steward): the
    // empty state, then clear everything.
    await page.locator('#activity-action').click();
    await page.locator('.p-select-overlay').getByRole('option', { name: 'Sent for review' }).click();
    await page.getByText('Nothing logged matches these filters').waitFor();
    await screenshot(page, 'activity-log-no-match');
    await page.getByRole('button', { name: 'Clear the filters' }).click();
    await page.waitForURL(`${baseUrl}/clubs/${clubId}/activity`);
    await (await settledRows(page)).first().waitFor();

    // The record link opens the cage record; the steward's name opens their row on the members page.
    await page.locator('tbody tr', { hasText: `record ${recordNumber}` }).first().getByRole('link', { name: recordNumber }).click();
    await page.waitForURL(/\/cage-records\//);
    await page.getByText(recordNumber).first().waitFor();
    await page.goBack();
    await page.locator('tbody tr', { hasText: `record ${recordNumber}` }).first().getByRole('link', { name: 'Imogen Feld' }).click();
    await page.waitForURL(/\/members#member-/);
    await page.locator('.member--shown', { hasText: 'Imogen Feld' }).waitFor();
    await screenshot(page, 'members-linked-from-log');

    // An invitation from the Members page: e-mailed through the outbox, with the link still shown to copy.
    await page.locator('#add-member-email').fill('nia.brook@tarnwick.example');
    await page.getByRole('button', { name: 'Add member' }).click();
    await page.getByText('We are e-mailing them an invitation').waitFor();
    const link = await page.locator('#invitation-link').inputValue();
    expect(link).toMatch(new RegExp(`^${baseUrl}/invitations/[\\w-]{43}$`));
    await page.getByRole('button', { name: 'Copy link' }).waitFor();
    await page.waitForTimeout(400); // the message slides in
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'members-invitation-mailed');

    await page.getByRole('link', { name: 'Mailbox' }).click();
    await page.getByRole('heading', { name: 'Mailbox', level: 1 }).waitFor();
    const mail = page.getByRole('button', { name: /Dara Quill invited you to Tarnwick Vale Motor Club.*To nia\.brook@tarnwick\.example/ });
    // The outbox sends every few seconds: refresh until it is there.
    for (let i = 0; i < 20 && (await mail.count()) === 0; i++) {
      await page.waitForTimeout(1000);
      await page.getByRole('button', { name: 'Refresh' }).click();
    }
    await mail.first().click();
    await page.locator('#mail-subject').waitFor();
    expect(await page.locator('.mail__text').innerText()).toContain(`Set your password and join: ${link}`);
    await screenshot(page, 'mailbox-invitation');

    await page.getByRole('link', { name: 'Activity log' }).click();
    const invited = page.locator('tbody tr', { hasText: 'nia.brook@tarnwick.example' });
    await invited.waitFor();
    await settledRows(page);
    expect((await invited.innerText()).replace(/\s+/g, ' ')).toContain('Dara Quill e-mailed an invitation to nia.brook@tarnwick.example to join as Builder.');
    await screenshot(page, 'activity-log-invitation');

    // A new rulebook from the rulebook list: checked in the form, then opened as a draft to fill in.
    await page.getByRole('link', { name: 'Rulebooks' }).click();
    await page.getByRole('heading', { name: 'Rulebooks', level: 1 }).waitFor();
    await page.getByRole('button', { name: 'New rulebook' }).click();
    const dialog = page.getByRole('dialog', { name: 'New rulebook' });
    await dialog.getByRole('button', { name: 'Create the rulebook' }).click();
    await dialog.getByText('Give the title').waitFor();
    await screenshot(page, 'rulebook-new-dialog');
    await dialog.getByLabel('Title').fill('Paddock Sprint Cage Rules');
    await dialog.getByRole('button', { name: 'Create the rulebook' }).click();
    await page.waitForURL(/\/ruleset-versions\//);
    await page.getByRole('heading', { name: /Paddock Sprint Cage Rules · edition/ }).waitFor();
    await page.getByText(/to fix before this draft can be put in force/).waitFor();
    await screenshot(page, 'rulebook-new-draft');

    // Its tube table gets a size, the explanation quotes it, then the size changes: a warning, not a block.
    const card = page.getByRole('article', { name: /Tube sizes/ });
    await card.getByLabel('Band 1, row 1, size 1: OD (in)').fill('1.5');
    await card.getByLabel('Band 1, row 1, size 1: wall (in)').fill('0.095');
    await card.locator('textarea').fill('Main hoops at least 1.500 × 0.095 in.');
    await expect.poll(() => card.locator('.rb-req__stale').count()).toBe(0);
    await card.getByLabel('Band 1, row 1, size 1: wall (in)').fill('0.120');
    await card.locator('.rb-req__stale').waitFor();
    expect(await card.locator('.rb-req__stale').innerText()).toContain('The explanation still quotes 1.500 × 0.095 in, which the tube table no longer lists.');
    // From the top, so the sticky app bar is drawn where a person sees it.
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'rulebook-new-explanation-warning');
    expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
  } finally {
    for (const o of others) await o.close();
  }
});
