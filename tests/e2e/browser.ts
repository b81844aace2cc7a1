// Debian's Chromium driven by playwright-core, one fresh profile per browser, for the journeys in
// tests/e2e. Screenshots land in .artifacts/screens/ so a person can look at what the tests saw.
// Every screenshot, and the last page of every session, is also checked with axe-core
// (accessibility.ts): a serious or critical finding fails the journey.
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { test } from 'vitest';
import { alreadyReported, describeFindings, expectAccessible, settleAnimations, steadyFindings } from './accessibility';

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

/**
 * Findings of the check a session runs on its last page when it closes. close() runs in `finally`
 * blocks, where throwing would hide a journey's own failure, so it keeps them here and the
 * `browserTest` fixture fails the journey with them once the journey has ended.
 */
const findingsAtClose: string[] = [];

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
      await checkLastPage(page);
      await context.close();
      rmSync(profileDir, { recursive: true, force: true });
    },
  };
}

/** axe on the page a session ends on, unless it is closed or never left about:blank. */
async function checkLastPage(page: Page): Promise<void> {
  if (page.isClosed() || !/^https?:/.test(page.url())) return;
  try {
    const findings = await steadyFindings(page);
    if (findings.length > 0 && !alreadyReported(page, findings)) findingsAtClose.push(describeFindings('the last page of a browser session', page.url(), findings));
  } catch {
    // The page was navigating or crashed as the journey ended: nothing stable to check.
  }
}

/**
 * Saves a full-page PNG as .artifacts/screens/<name>.png and returns its path. Waits (up to 2 s) for
 * finite animations to end first, so a message that slides in is pictured whole; spinners run forever
 * and are not waited for. Parts the browser skips drawing until they are scrolled to
 * (content-visibility: auto on long lists) are drawn for the shot, as a person scrolling down sees them.
 */
export async function screenshot(page: Page, name: string): Promise<string> {
  await settleAnimations(page);
  mkdirSync(screensDir, { recursive: true });
  const path = join(screensDir, `${name}.png`);
  const all = await page.addStyleTag({ content: '* { content-visibility: visible !important; }' });
  try {
    await page.screenshot({ path, fullPage: true });
  } finally {
    await all.evaluate((el) => (el as Element).remove());
  }
  // The shot is saved first, so a failure below can be looked at.
  await expectAccessible(page, `screenshot "${name}" (${path})`);
  return path;
}

/**
 * `test` with a fresh browser per test (`async ({ browser }) => …`), closed afterwards. The journey
 * fails afterwards when the last page of any session it opened has a serious accessibility finding.
 */
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
    const late = findingsAtClose.splice(0);
    if (late.length > 0) throw new Error(late.join('\n\n'));
  },
});
