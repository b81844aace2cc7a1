// The accessibility check every browser journey runs (issue 13, section 6): axe-core in the page, and a
// finding of impact "serious" or "critical" fails the journey. browser.ts calls it on every screenshot
// and once more on the last page a session showed, so a journey is checked without remembering to.
// DEVELOPERS.md, "Accessibility checks", says how to read a failure.
import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';

/** The impacts that fail a journey; "minor" and "moderate" findings are printed nowhere and pass. */
export const FAILING_IMPACTS: ReadonlySet<string> = new Set(['serious', 'critical']);

/**
 * Markup the app does not write and cannot change, left out of the check. Each entry names its owner
 * and why; keep the selectors as narrow as the markup allows. Empty today: every finding so far was
 * the app's own and was fixed.
 */
export const THIRD_PARTY_EXCLUSIONS: readonly { selector: string; why: string }[] = [];

export interface AxeFinding {
  id: string;
  impact: string;
  help: string;
  helpUrl: string;
  /** One line per element: its selector, and what axe measured there (a contrast ratio, say). */
  targets: string[];
}

/** What was last thrown per page, so the check at close does not repeat a screenshot's failure. */
const lastThrown = new WeakMap<Page, string>();

function signature(url: string, findings: readonly AxeFinding[]): string {
  return JSON.stringify([url, findings.map((f) => [f.id, f.targets])]);
}

/** True when these findings were already thrown for this page at this address. */
export function alreadyReported(page: Page, findings: readonly AxeFinding[]): boolean {
  return lastThrown.get(page) === signature(page.url(), findings);
}

/** Waits (up to 2 s) for finite animations to end, so a toast fading in is judged as a person sees it. */
export async function settleAnimations(page: Page): Promise<void> {
  await page
    .waitForFunction(() => document.getAnimations().every((a) => a.effect?.getTiming().iterations === Infinity), undefined, { timeout: 2000 })
    .catch(() => undefined);
}

/** The serious and critical findings of axe on the page as it is now. */
export async function seriousFindings(page: Page): Promise<AxeFinding[]> {
  // Legacy mode runs axe in the page itself: the default mode opens a blank tab in the context to
  // merge frame results, which a journey waiting for a new tab (a PDF link) would take for its own.
  // The app has no iframes, so nothing is lost.
  let builder = new AxeBuilder({ page }).setLegacyMode(true);
  for (const { selector } of THIRD_PARTY_EXCLUSIONS) builder = builder.exclude(selector);
  const results = await builder.analyze();
  return results.violations
    .filter((v) => FAILING_IMPACTS.has(v.impact ?? ''))
    .map((v) => ({
      id: v.id,
      impact: v.impact ?? 'unknown',
      help: v.help,
      helpUrl: v.helpUrl,
      targets: v.nodes.map((n) => {
        const detail = n.any[0]?.message ?? n.all[0]?.message ?? n.none[0]?.message;
        return `${n.target.map(String).join(' >>> ')}${detail ? ` — ${detail}` : ''}`;
      }),
    }));
}

/** The findings as a failure message: one block per rule with its impact, help text and targets. */
export function describeFindings(where: string, url: string, findings: readonly AxeFinding[]): string {
  const blocks = findings.map((f) => {
    const shown = f.targets.slice(0, 8).map((t) => `      ${t}`);
    if (f.targets.length > shown.length) shown.push(`      … and ${f.targets.length - shown.length} more`);
    return [`  [${f.impact}] ${f.id}: ${f.help}`, `    ${f.helpUrl}`, '    on:', ...shown].join('\n');
  });
  return `axe found ${findings.length} serious or critical accessibility problem${findings.length === 1 ? '' : 's'} at ${where} (${url}):\n${blocks.join('\n')}`;
}

/**
 * The serious and critical findings on the page once it is still. A message can start leaving
 * (a toast fading out at the end of its life) between the wait for animations and axe's run, and axe
 * then measures the half-faded text. So a page with findings is let settle and checked once more, and
 * only what is still found then counts: a steady problem is found both times.
 */
export async function steadyFindings(page: Page): Promise<AxeFinding[]> {
  await settleAnimations(page);
  const first = await seriousFindings(page);
  if (first.length === 0) return first;
  await page.waitForTimeout(250);
  await settleAnimations(page);
  return seriousFindings(page);
}

/** Fails (throws) when axe finds a serious or critical problem on the page as it is now. */
export async function expectAccessible(page: Page, where: string): Promise<void> {
  const findings = await steadyFindings(page);
  if (findings.length === 0) return;
  lastThrown.set(page, signature(page.url(), findings));
  throw new Error(describeFindings(where, page.url(), findings));
}
