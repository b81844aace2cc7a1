// The journey of someone who forgot their password: "Forgot your password?" on the sign-in page, the
// mail through the outbox to the server's fake SMTP (read in the admin's Mailbox), the link, a new
// password, signing in with it. Their other device is signed out; the link is refused a second time,
// and a link an hour old is refused too.
import pg from 'pg';
import { request as playwrightRequest, type APIRequestContext, type Page } from 'playwright-core';
import { expect, inject } from 'vitest';
import { browserTest as test, openBrowser, screenshot } from './browser';
import { demoUsers, mainNavLabels, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');
const databaseUrl = inject('e2eDatabaseUrl');
// An invented member of the demo club, invited by the admin for this journey.
const person = { email: 'tove.rennick@tarnwick.example', firstPassword: 'tove-first-password', newPassword: 'tove-brand-new-password' };
const subject = 'Choose a new Cagewright password';
const linkPattern = /http:\/\/[^\s]+\/reset-password\/[A-Za-z0-9_-]{43}/;

async function csrf(api: APIRequestContext | Page['request']): Promise<string> {
  return ((await (await api.get(`${baseUrl}/api/auth/csrf`)).json()) as { token: string }).token;
}

/** The admin adds the person to the club; their invitation is accepted on "their other device" (an API client). */
async function invitePerson(admin: Page): Promise<APIRequestContext> {
  const token = await csrf(admin.request);
  const me = (await (await admin.request.get(`${baseUrl}/api/auth/me`)).json()) as { memberships: { club: { id: string } }[] };
  const added = await admin.request.post(`${baseUrl}/api/clubs/${me.memberships[0]!.club.id}/members`, {
    headers: { 'X-CSRF-Token': token },
    data: { email: person.email, roles: ['builder'] },
  });
  expect(added.status()).toBe(201);
  const { invitationUrl } = (await added.json()) as { invitationUrl: string };
  const device = await playwrightRequest.newContext();
  const accepted = await device.post(`${baseUrl}/api/invitations/${invitationUrl.split('/').at(-1)}/accept`, {
    headers: { 'X-CSRF-Token': await csrf(device) },
    data: { password: person.firstPassword, displayName: 'Tove Rennick' },
  });
  expect(accepted.status()).toBe(200);
  return device;
}

/** Waits in the admin's Mailbox for the newest reset mail to the person, opens it and returns its link. */
async function linkFromMailbox(admin: Page, seen: Set<string>): Promise<string> {
  await admin.getByRole('link', { name: 'Mailbox' }).click();
  await admin.getByRole('heading', { name: 'Mailbox', level: 1 }).waitFor();
  // The outbox dispatcher sends every few seconds.
  for (let i = 0; i < 30; i++) {
    const items = admin.getByRole('button', { name: new RegExp(`${subject}.*To ${person.email.replace('.', '\\.')}`) });
    for (const item of await items.all()) {
      await item.click();
      await admin.locator('#mail-subject').waitFor();
      const link = linkPattern.exec(await admin.locator('.mail__text').innerText())?.[0];
      if (link && !seen.has(link)) {
        seen.add(link);
        return link;
      }
    }
    await new Promise((r) => setTimeout(r, 1000));
    await admin.getByRole('button', { name: 'Refresh' }).click();
  }
  throw new Error(`no new "${subject}" mail to ${person.email} in the Mailbox`);
}

test('a person who forgot their password gets a link by mail, sets a new one and signs in; the link works once and for an hour', async ({ browser }) => {
  const admin = await openBrowser();
  const links = new Set<string>();
  let otherDevice: APIRequestContext | undefined;
  try {
    await signIn(admin.page, baseUrl, demoUsers.admin);
    otherDevice = await invitePerson(admin.page);
    expect((await otherDevice.get(`${baseUrl}/api/auth/me`)).status()).toBe(200);

    // Signed out, on the sign-in page: the way to a new password.
    const { page } = browser;
    await page.goto(`${baseUrl}/sign-in`);
    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await page.getByRole('heading', { name: 'Forgot your password?' }).waitFor();
    await page.getByLabel('E-mail').fill(person.email);
    await screenshot(page, 'reset-ask');
    await page.getByRole('button', { name: 'Send the link' }).click();
    // The connection banner is a status region too (empty while online): take the one with the answer.
    const sent = page.getByRole('status').filter({ hasText: 'If an account uses this' });
    await sent.waitFor();
    expect(await sent.innerText()).toContain('If an account uses this address, a link to choose a new password is on its way.');
    await screenshot(page, 'reset-asked');

    // The mail, as the fake SMTP server caught it.
    const link = await linkFromMailbox(admin.page, links);
    expect(await admin.page.locator('.mail__text').innerText()).toContain('The link works once, within an hour.');
    await screenshot(admin.page, 'reset-mail');

    // The link: the account it is for, the password rules, then back to sign-in.
    await page.goto(link);
    await page.getByRole('heading', { name: 'Choose a new password' }).waitFor();
    await page.getByText(person.email).waitFor();
    await page.getByLabel('New password', { exact: true }).fill('too-short');
    await page.getByLabel('Repeat new password').fill('too-short');
    await page.getByRole('button', { name: 'Set the new password' }).click();
    await page.getByText('Use at least 10 characters.').waitFor();
    await screenshot(page, 'reset-form-too-short');
    await page.getByLabel('New password', { exact: true }).fill(person.newPassword);
    await page.getByLabel('Repeat new password').fill(person.newPassword);
    await page.getByRole('button', { name: 'Set the new password' }).click();
    await page.waitForURL((url) => url.pathname === '/sign-in');
    expect(await page.getByRole('status').filter({ hasText: 'Your new password is set' }).innerText()).toContain('Your new password is set');
    await screenshot(page, 'reset-done');

    // The other device was signed out; the old password is gone, the new one works.
    expect((await otherDevice.get(`${baseUrl}/api/auth/me`)).status()).toBe(401);
    await page.getByLabel('E-mail').fill(person.email);
    await page.getByLabel('Password').fill(person.firstPassword);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('E-mail or password is wrong.').waitFor();
    await signIn(page, baseUrl, person.email, person.newPassword);
    expect(await mainNavLabels(page)).toContain('Garage');

    // The same link a second time.
    await page.goto(link);
    const used = page.getByRole('alert');
    await used.waitFor();
    expect(await used.innerText()).toContain('This link has expired or was already used.');
    await screenshot(page, 'reset-link-used');

    // A new link, an hour and a second old: refused too.
    const asked = await otherDevice.post(`${baseUrl}/api/auth/password-reset`, {
      headers: { 'X-CSRF-Token': await csrf(otherDevice) },
      data: { email: person.email },
    });
    expect(asked.status()).toBe(202);
    const second = await linkFromMailbox(admin.page, links);
    const token = second.split('/').at(-1)!;
    expect((await otherDevice.get(`${baseUrl}/api/auth/password-reset/${token}`)).status()).toBe(200);
    const db = new pg.Client({ connectionString: databaseUrl });
    await db.connect();
    try {
      await db.query(
        `UPDATE password_resets SET expires_at = now() - interval '1 second', created_at = now() - interval '3601 seconds'
         WHERE used_at IS NULL AND user_id = (SELECT id FROM users WHERE email = $1)`,
        [person.email],
      );
    } finally {
      await db.end();
    }
    await page.goto(second);
    const expired = page.getByRole('alert');
    await expired.waitFor();
    expect(await expired.innerText()).toContain('This link has expired or was already used.');
    await screenshot(page, 'reset-link-expired');
    expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
    expect(admin.pageErrors.map((e) => e.message)).toEqual([]);
  } finally {
    await otherDevice?.dispose();
    await admin.close();
  }
});
