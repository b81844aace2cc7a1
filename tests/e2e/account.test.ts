// Journey through the account page: a builder opens it from the menu, switches the units shown on
// screen, saves, and finds the choice kept after reloading (it is stored on the server, not the tab).
import { expect, inject } from 'vitest';
import type { Page } from 'playwright-core';
import { browserTest as test, screenshot } from './browser';
import { demoUsers, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');

const unitLabels = { imperial: 'Inches / pounds', metric: 'Millimetres / kilograms' } as const;

function unitsGroup(page: Page) {
  return page.getByRole('group', { name: 'Units on screen' });
}

async function selectedUnits(page: Page): Promise<keyof typeof unitLabels> {
  const group = unitsGroup(page);
  await group.waitFor();
  const imperialPressed = await group
    .getByRole('button', { name: unitLabels.imperial })
    .getAttribute('aria-pressed');
  const metricPressed = await group
    .getByRole('button', { name: unitLabels.metric })
    .getAttribute('aria-pressed');
  // Exactly one choice is ever selected.
  expect([imperialPressed, metricPressed].sort()).toEqual(['false', 'true']);
  return imperialPressed === 'true' ? 'imperial' : 'metric';
}

test('a builder changes the units shown on screen and the choice is kept', async ({ browser }) => {
  const { page } = browser;
  await signIn(page, baseUrl, demoUsers.builder);
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Account' }).click();
  await page.waitForURL((url) => url.pathname === '/account');

  const before = await selectedUnits(page);
  const wanted = before === 'imperial' ? 'metric' : 'imperial';
  await unitsGroup(page).getByRole('button', { name: unitLabels[wanted] }).click();
  await page.getByRole('button', { name: 'Save profile' }).click();
  await page.getByText('Account saved').waitFor();
  await screenshot(page, 'account-units-saved');

  await page.reload();
  expect(await selectedUnits(page)).toBe(wanted);
  expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
});
