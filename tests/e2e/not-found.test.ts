// An address that leads nowhere shows the app's not-found page, not a blank screen or a server error.
import { expect, inject } from 'vitest';
import { browserTest as test, screenshot } from './browser';

const baseUrl = inject('e2eBaseUrl');

test('an unknown URL shows the not-found page with a way back', async ({ browser }) => {
  const { page } = browser;
  const response = await page.goto(`${baseUrl}/no/such/page`);
  // The server hands every unknown page address to the single-page app, which shows its own 404.
  expect(response?.status()).toBe(200);
  await page.getByRole('heading', { level: 1 }).waitFor();
  expect(await page.getByRole('heading', { level: 1 }).innerText()).toMatch(/not found/i);
  expect(await page.getByRole('link').count()).toBeGreaterThan(0);
  await screenshot(page, 'not-found');
  expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
});
