// Journeys through signing in and out: each demo role sees the menu its roles allow, a wrong password
// is refused with the API's message, and signing out lands on the sign-in page.
import { expect, inject } from 'vitest';
import { browserTest as test, screenshot } from './browser';
import { demoUsers, mainNavLabels, signIn, type DemoRole } from './demo';

const baseUrl = inject('e2eBaseUrl');

test.for<[DemoRole, string[]]>([
  ['builder', ['Overview', 'Garage', 'Tube stock', 'Bench tools', 'Account']],
  ['steward', ['Overview', 'Review queue', 'Cage records', 'Bench tools', 'Account']],
  // The demo admin is a steward too.
  ['admin', ['Overview', 'Tube stock', 'Review queue', 'Cage records', 'Members', 'Rulebooks', 'Activity log', 'Mailbox', 'Bench tools', 'Account']],
])('signed in as the demo %s, the menu shows exactly %j', async ([role, expected], { browser }) => {
  const { page } = browser;
  await signIn(page, baseUrl, demoUsers[role]);
  // The Mailbox entry appears once GET /api/meta has answered (the e2e server runs its fake SMTP).
  if (expected.includes('Mailbox')) await page.getByRole('link', { name: 'Mailbox' }).waitFor();
  expect(new URL(page.url()).pathname).toBe('/');
  expect(await mainNavLabels(page)).toEqual(expected);
  await screenshot(page, `overview-${role}`);
  expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
});

test('a wrong password is refused with a clear message and the user stays on the sign-in page', async ({
  browser,
}) => {
  const { page } = browser;
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(demoUsers.builder);
  await page.getByLabel('Password').fill('not-the-password');
  await page.getByRole('button', { name: 'Sign in' }).click();
  const alert = page.getByRole('alert');
  await alert.waitFor();
  expect(await alert.innerText()).toContain('E-mail or password is wrong.');
  expect(new URL(page.url()).pathname).toBe('/sign-in');
  expect(await page.getByRole('navigation', { name: 'Main' }).count()).toBe(0);
  await screenshot(page, 'sign-in-wrong-password');
});

test('signing out lands on the sign-in page, and the app is closed until signing in again', async ({
  browser,
}) => {
  const { page } = browser;
  await signIn(page, baseUrl, demoUsers.steward);
  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.waitForURL((url) => url.pathname === '/sign-in');
  await page.getByRole('button', { name: 'Sign in' }).waitFor();
  await screenshot(page, 'signed-out');
  // The session is gone on the server too: a signed-in page sends the user back to sign in.
  await page.goto(`${baseUrl}/account`);
  await page.waitForURL((url) => url.pathname === '/sign-in');
  expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
});
