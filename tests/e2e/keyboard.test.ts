// Keyboard use (issue 13, section 6): from a fresh page load the first Tab reaches the skip link, which
// shows itself and, pressed, puts focus in <main> past the top bar and the menu; a move to another page
// puts focus on that page's h1, and the browser tab's title names the page.
import { expect, inject } from 'vitest';
import type { Page } from 'playwright-core';
import { browserTest as test, screenshot } from './browser';
import { demoUsers, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');

/** What has focus: its tag, its text and whether it sits inside <main>. */
const focused = (page: Page) =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    return { tag: el?.tagName.toLowerCase() ?? null, text: el?.innerText.trim() ?? '', inMain: !!el?.closest('main') };
  });

test('Tab from a fresh load reaches the skip link first; Enter puts focus in main, and the next Tab stays there', async ({ browser }) => {
  const { page } = browser;
  await signIn(page, baseUrl, demoUsers.builder);
  await page.goto(`${baseUrl}/garage`);
  await page.getByRole('heading', { level: 1, name: 'Garage' }).waitFor();

  await page.keyboard.press('Tab');
  expect(await focused(page)).toEqual({ tag: 'a', text: 'Skip to the page content', inMain: false });
  // Out of sight until focused; on focus it is drawn inside the window, above the top bar.
  const box = await page.getByRole('link', { name: 'Skip to the page content' }).boundingBox();
  expect(box && box.y >= 0 && box.height > 10).toBe(true);
  await screenshot(page, 'keyboard-skip-link');

  await page.keyboard.press('Enter');
  expect(await focused(page)).toMatchObject({ tag: 'main', inMain: true });
  // The next Tab goes to the page's own controls, not back to the top bar or the menu.
  await page.keyboard.press('Tab');
  expect((await focused(page)).inMain).toBe(true);
  expect(new URL(page.url()).pathname).toBe('/garage');
  expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
});

test('the skip link comes first on the sign-in page too, and lands in its card', async ({ browser }) => {
  const { page } = browser;
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByRole('heading', { level: 1, name: 'Sign in' }).waitFor();
  await page.keyboard.press('Tab');
  expect((await focused(page)).text).toBe('Skip to the page content');
  await page.keyboard.press('Enter');
  expect(await focused(page)).toMatchObject({ tag: 'main' });
  await page.keyboard.press('Tab');
  expect(await page.evaluate(() => document.activeElement?.id)).toBe('sign-in-email');
});

test('moving to another page puts focus on its h1 and names it in the title', async ({ browser }) => {
  const { page } = browser;
  await signIn(page, baseUrl, demoUsers.builder);
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Garage' }).click();
  await page.waitForURL((url) => url.pathname === '/garage');
  await page.waitForFunction(() => document.activeElement?.tagName === 'H1');
  expect(await focused(page)).toEqual({ tag: 'h1', text: 'Garage', inMain: true });
  expect(await page.title()).toBe('Garage · Cagewright');

  // By keyboard: a link in the menu, Enter, and focus is on the new page's heading.
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Account' }).focus();
  await page.keyboard.press('Enter');
  await page.waitForURL((url) => url.pathname === '/account');
  await page.waitForFunction(() => document.activeElement?.tagName === 'H1');
  expect(await focused(page)).toEqual({ tag: 'h1', text: 'Account', inMain: true });
  expect(await page.title()).toBe('Account · Cagewright');
  await screenshot(page, 'keyboard-focus-on-heading');
  expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
});
