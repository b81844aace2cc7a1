// An address that leads nowhere shows the app's not-found page, not a blank screen or a server error.
import { afterEach, beforeEach, expect, inject, test } from 'vitest';
import { openBrowser, screenshot, type BrowserSession } from './browser';

const baseUrl = inject('e2eBaseUrl');
let browser: BrowserSession;

beforeEach(async () => {
  browser = await openBrowser();
});
afterEach(async () => {
  await browser.close();
});

test('an unknown URL shows the not-found page with a way back', async () => {
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
