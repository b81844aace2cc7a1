// Debian's Chromium driven by playwright-core, one fresh profile per browser, for the journeys in
// tests/e2e. Screenshots land in .artifacts/screens/ so a person can look at what the tests saw.
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { test } from 'vitest';

const screensDir = fileURLToPath(new URL('../../.artifacts/screens', import.meta.url));

// Without the networking flags Chromium keeps calling home, and this network is closed.
const chromiumArgs = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  /** Uncaught errors the page threw; a journey should end with none. */
  pageErrors: Error[];
  close(): Promise<void>;
}

/**
 * A fresh Chromium profile at this viewport. `extraArgs` add switches for one journey, e.g.
 * `--disable-3d-apis` to see what a browser without WebGL gets.
 */
export async function openBrowser(viewport = { width: 1280, height: 800 }, extraArgs: readonly string[] = []): Promise<BrowserSession> {
  const profileDir = mkdtempSync(join(tmpdir(), 'cagewright-e2e-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: [...chromiumArgs, ...extraArgs],
    viewport,
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const pageErrors: Error[] = [];
  page.on('pageerror', (err) => pageErrors.push(err));
  return {
    context,
    page,
    pageErrors,
    async close() {
      await context.close();
      rmSync(profileDir, { recursive: true, force: true });
    },
  };
}

/**
 * Saves a full-page PNG as .artifacts/screens/<name>.png and returns its path. Waits (up to 2 s) for
 * finite animations to end first, so a message that slides in is pictured whole; spinners run forever
 * and are not waited for. Parts the browser skips drawing until they are scrolled to
 * (content-visibility: auto on long lists) are drawn for the shot, as a person scrolling down sees them.
 */
export async function screenshot(page: Page, name: string): Promise<string> {
  await page
    .waitForFunction(() => document.getAnimations().every((a) => a.effect?.getTiming().iterations === Infinity), undefined, { timeout: 2000 })
    .catch(() => undefined);
  mkdirSync(screensDir, { recursive: true });
  const path = join(screensDir, `${name}.png`);
  const all = await page.addStyleTag({ content: '* { content-visibility: visible !important; }' });
  try {
    await page.screenshot({ path, fullPage: true });
  } finally {
    await all.evaluate((el) => (el as Element).remove());
  }
  return path;
}

/** `test` with a fresh browser per test (`async ({ browser }) => …`), closed afterwards. */
export const browserTest = test.extend<{ browser: BrowserSession }>({
  // vitest reads the fixtures a fixture needs from this first parameter's pattern; this one needs none.
  // eslint-disable-next-line no-empty-pattern
  browser: async ({}, use) => {
    const session = await openBrowser();
    try {
      await use(session);
    } finally {
      await session.close();
    }
  },
});
