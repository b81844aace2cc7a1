// Journeys through the admin's plumbing pages: a mail sent to the server's fake SMTP server shows up in
// the Mailbox (text and HTML), a member change shows up in the Activity log, and a builder sees neither.
import { createTransport } from 'nodemailer';
import { expect, inject } from 'vitest';
import { browserTest as test, screenshot } from './browser';
import { demoUsers, mainNavLabels, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');
const smtpPort = inject('e2eSmtpPort');

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
