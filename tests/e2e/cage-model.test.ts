// The cage as a model, walked in the browser (issue 10): the demo builder's garage shows the seeded
// sheet with a full model; a new sheet starts from a shape with six tape dimensions; the drawing
// marks the backstay that fails the angle rule; moving its landing in the node table, then a wall
// fixed in the member table, changes the mark; the 3D view opens (or says plainly that it cannot);
// the check's PDF carries the views; the steward sees the same drawing and the specification table.
// Desktop (1280) and phone (390) screens land in .artifacts/screens/cage-*.png, the PDF's cage page
// as cage-pdf-*.png. Frame timing after an edit is measured in `npm run bench`, not here.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync, copyFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';
import { expect, inject } from 'vitest';
import type { Page, Response } from 'playwright-core';
import { browserTest as test, openBrowser, screenshot as fullPageShot, type BrowserSession } from './browser';
import { api, demoUsers, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');
const screensDir = fileURLToPath(new URL('../../.artifacts/screens', import.meta.url));
const carName = 'Green hill roadster';
const DEMO_CAR = 'Heron grey hillclimb saloon'; // backend/src/db/seed-garage.ts

/** A full-page shot from the top, so the sticky bars are drawn where a person sees them. */
async function screenshot(page: Page, name: string): Promise<void> {
  await page.evaluate(() => window.scrollTo(0, 0));
  await fullPageShot(page, name);
}

/** The verdict a member is drawn with in the side view (data-verdict of its group). */
const verdictOf = (page: Page, memberName: string) =>
  page.locator('[data-view="side"] g[data-member-id]', { has: page.locator('title', { hasText: new RegExp(`^${memberName} ·`) }) }).first().getAttribute('data-verdict');

/** The member drawn as failing in the side view, by the name in its hover title. */
async function failingMembers(page: Page): Promise<string[]> {
  const titles = await page.locator('[data-view="side"] g[data-verdict="fail"] > title').allTextContents();
  return [...new Set(titles.map((t) => t.split(' · ')[0]!))];
}

/** 404s the page asked for, other than the API answers a journey expects. */
function notFound(page: Page): string[] {
  const seen: string[] = [];
  page.on('response', (r: Response) => {
    if (r.status() === 404) seen.push(r.url());
  });
  return seen;
}

test('a builder starts a cage from a shape, fixes the failing backstay, and the steward reviews the same drawing', async ({ browser }) => {
  const { page } = browser;
  const others: BrowserSession[] = [];
  const dir = mkdtempSync(join(tmpdir(), 'cagewright-cage-'));
  const missing = notFound(page);
  try {
    await signIn(page, baseUrl, demoUsers.builder);

    // The demo garage (seeded by npm start's seed): a hillclimb sheet with a full cage model. Another
    // journey may have archived the builder's cars; bring it back as the builder could.
    const { cars } = await api<{ cars: { id: string; name: string; archivedAt: string | null; buildSheets: { id: string; name: string }[] }[] }>(page, 'GET', '/cars?show=all');
    const demoCar = cars.find((c) => c.name === DEMO_CAR);
    expect(demoCar, 'the seed gives the demo builder a car with a modelled sheet').toBeDefined();
    if (demoCar!.archivedAt) await api(page, 'POST', `/cars/${demoCar!.id}/unarchive`);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Garage' }).click();
    const demoCard = page.getByRole('article', { name: DEMO_CAR });
    await demoCard.waitFor();
    await demoCard.getByRole('link', { name: 'Open car' }).click();
    await page.getByRole('link', { name: /Hill cage, drawn/ }).first().click();
    await page.waitForURL(/\/build-sheets\//);
    await page.locator('[data-view="side"] svg[role="img"]').waitFor();
    expect(await page.locator('[data-view="side"] g[data-member-id]').count()).toBeGreaterThanOrEqual(10);
    expect(await page.locator('.cage__view svg[role="img"] > title').allTextContents()).toHaveLength(3);
    await screenshot(page, 'cage-demo-sheet-desktop');
    expect(missing, 'the build sheet page asks for nothing that is not there').toEqual([]);

    // A new car and a sheet for the hillclimb class, made in the browser.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Garage' }).click();
    await page.getByRole('button', { name: /Add (your first )?car/ }).first().click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Name').fill(carName);
    await dialog.getByLabel('Race number').fill('58');
    await page.getByRole('dialog').getByRole('button', { name: 'Add car' }).click();
    await page.getByRole('article', { name: carName }).getByRole('link', { name: 'Open car' }).click();
    await page.getByRole('button', { name: 'New build sheet' }).click();
    const version = page.locator('#sheet-version');
    await version.locator('option').first().waitFor({ state: 'attached' });
    const hill = (await version.locator('option').allInnerTexts()).find((t) => t.includes('Hillclimb'))!;
    await version.selectOption({ label: hill });
    await page.locator('#sheet-class').selectOption('hill-saloon');
    await page.getByRole('button', { name: 'Create sheet' }).click();
    await page.waitForURL(/\/build-sheets\//);
    const sheetUrl = page.url();
    await page.getByRole('heading', { name: 'No drawing yet' }).waitFor();
    await page.getByLabel('Race weight without driver').fill('2100');

    // Start from a shape, offered where the drawing will be: front hoop, no door bars, a diagonal in the
    // main hoop; six tape dimensions in the builder's units (inches). The backstays land only 14 in
    // behind the hoop: too steep.
    const form = page.locator('.sheet__drawing').getByRole('form', { name: 'Start from a shape' });
    await form.waitFor();
    await form.getByLabel('Door bars').selectOption('none');
    await form.getByLabel('Diagonal').selectOption('main_hoop');
    const dims: [string, string][] = [
      ['Main hoop width at the feet (centre to centre)', '48'],
      ['Main hoop width at the top corners', '42'],
      ['Main hoop height, floor to top', '44'],
      ['Main hoop lean back from vertical', '5'],
      ['Backstays land this far behind the hoop', '14'],
      ['Front hoop (or A-pillar) feet this far forward', '52'],
    ];
    expect(await form.locator('.qty__input').count(), 'six dimensions for this shape').toBe(dims.length);
    for (const [label, value] of dims) await form.getByLabel(label).fill(value);
    await screenshot(page, 'cage-start-shape-desktop');
    await form.getByRole('button', { name: 'Make the cage' }).click();

    // The cage is drawn, and the steeper backstay is marked as failing (§ H3.1.1: 30° from vertical).
    await page.locator('[data-view="side"] svg[role="img"]').waitFor();
    await expect.poll(() => failingMembers(page), { timeout: 15_000 }).toEqual(expect.arrayContaining([expect.stringMatching(/^Backstay (left|right)$/i)]));
    const failing = (await failingMembers(page)).find((n) => /backstay/i.test(n))!;
    const angleFinding = page.locator('[aria-labelledby="live-findings-heading"] .finding', { hasText: 'Backstays at 30° or more from vertical' });
    expect(await angleFinding.innerText()).toContain('§ H3.1.1');
    expect(await angleFinding.innerText()).toMatch(/Does not meet it/);
    // The failing symbol and its dashes, not only its colour (the legend says what each means).
    expect(await page.locator('[data-view="side"] g[data-verdict="fail"]').count()).toBeGreaterThan(0);
    await page.locator('.sheet__drawing').screenshot({ path: join(screensDir, 'cage-backstay-failing-desktop.png') });
    await screenshot(page, 'cage-sheet-failing-desktop');

    // Hovering the failing tube names it, its size and the rule it fails.
    const tube = page.locator('[data-view="side"] g[data-verdict="fail"] path').first();
    await tube.hover({ force: true });
    await expect.poll(() => page.locator('[data-test="cage-about"]').innerText()).toMatch(/Backstay (left|right).*Fails a rule.*H3\.1\.1/i);
    // Clicking it opens its row and shows its findings; a failing finding can show its member in the drawing.
    await tube.click({ force: true });
    await expect.poll(() => page.locator('[data-test="findings-member"]').innerText()).toContain(failing);
    expect(await page.getByRole('listitem', { name: new RegExp(`^${failing}$`, 'i') }).evaluate((li) => li.classList.contains('cw-sheet-row--picked'))).toBe(true);
    await page.locator('[data-test="findings-member"]').getByRole('button', { name: 'show every member' }).click();
    const show = angleFinding.locator('.finding__show');
    await show.click();
    await expect.poll(() => show.getAttribute('aria-pressed')).toBe('true');
    expect(await show.innerText()).toContain('Shown in the drawing');
    await show.click();

    // Fix it in the node table: both backstay feet 30 in behind the hoop instead (x −14 → −30 in).
    await page.locator('summary', { hasText: 'Cage model' }).first().evaluate((s) => ((s.parentElement as HTMLDetailsElement).open = true));
    for (const side of ['left', 'right']) {
      const x = page.getByLabel(`x, forward of backstay foot ${side}`);
      const was = Number(await x.inputValue());
      await x.fill(String(Math.round((was - 16) * 100) / 100));
    }
    await expect.poll(() => verdictOf(page, failing), { timeout: 15_000 }).not.toBe('fail');
    expect(await angleFinding.innerText()).toMatch(/Meets (it|the rule)/);
    await page.locator('.sheet__drawing').screenshot({ path: join(screensDir, 'cage-backstay-fixed-desktop.png') });

    // A thinner wall typed in the member table fails § H2.1.1 and marks that backstay; fixing it back clears the mark.
    const row = page.getByRole('listitem', { name: /^Backstay left$/i });
    const wall = row.locator('[id$="-wallMm"]');
    const wallWas = await wall.inputValue();
    // The starting shape took § H2.1.1's lightest size: 50 × 2.0 mm (computed: A = π/4 (D² − d²) is
    // 301.6 mm² against 333.8 mm² for 45 × 2.5), shown in the builder's inches (F-UNIT-1: 1 in = 25.4 mm).
    expect(Number(wallWas)).toBeCloseTo(2 / 25.4, 4);
    // A thinner stock tube typed with its unit, as read off the tube: 50 × 1.5 mm is not a listed size.
    await wall.fill('1.5 mm');
    await expect.poll(() => verdictOf(page, 'backstay left')).toBe('fail');
    await wall.fill('2 mm');
    await expect.poll(() => verdictOf(page, 'backstay left')).not.toBe('fail');

    // What the model gives is shown, not asked: the backstay's length and side, the brace angle.
    expect((await row.locator('[data-test="model-value"]').allInnerTexts()).map((t) => t.trim())).toEqual(expect.arrayContaining(['Left', expect.stringMatching(/ in$/)]));
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    await page.getByText(/Saved as revision 2/).waitFor();
    await screenshot(page, 'cage-sheet-fixed-desktop');

    // The orbiting 3D view, from its own chunk: drawn, or a plain message where WebGL is missing.
    await page.getByRole('group', { name: 'Which views' }).getByRole('button', { name: '3D' }).click();
    const canvas = page.locator('[data-test="cage-3d"] canvas');
    const unavailable = page.locator('[data-test="cage-3d-unavailable"]');
    await Promise.race([canvas.waitFor(), unavailable.waitFor()]);
    if (await canvas.count()) {
      await page.waitForTimeout(500);
      const shot = join(screensDir, 'cage-3d-desktop.png');
      await page.locator('.sheet__drawing').screenshot({ path: shot });
      // Drawn, not blank: the canvas has many colours (tubes, marks, the grid), not one.
      const { data, info } = await sharp(await canvas.screenshot()).raw().toBuffer({ resolveWithObject: true });
      const colours = new Set<number>();
      for (let i = 0; i < data.length; i += info.channels * 7) colours.add((data[i]! << 16) | (data[i + 1]! << 8) | data[i + 2]!);
      expect(colours.size).toBeGreaterThan(50);
    } else {
      expect(await unavailable.innerText()).toContain('side, top and front views show the same cage');
      await page.locator('.sheet__drawing').screenshot({ path: join(screensDir, 'cage-3d-desktop.png') });
    }
    await page.getByRole('group', { name: 'Which views' }).getByRole('button', { name: 'Three views' }).click();

    // The kept check and its PDF, with the views on their own page.
    await page.getByRole('button', { name: 'Run check' }).click();
    await page.waitForURL(/\/check-runs\//);
    await page.getByText('Verification code').waitFor();
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download PDF' }).click()]);
    const pdf = join(dir, 'report.pdf');
    await download.saveAs(pdf);
    const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toContain('The cage, drawn from its model');
    expect(text).toContain('Side view');
    expect(text).toContain('backstay left');
    expect(text.toLowerCase()).toContain('pre-check');
    const pages = text.split('The cage, drawn from its model');
    expect(pages.length).toBe(2);
    // The cage page as an image, for a person to look at.
    const pageNo = Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [pdf], { encoding: 'utf8' }))![1]);
    let cagePage = 0;
    for (let p = 1; p <= pageNo && !cagePage; p++) {
      if (execFileSync('pdftotext', ['-f', String(p), '-l', String(p), pdf, '-'], { encoding: 'utf8' }).includes('The cage, drawn from its model')) cagePage = p;
    }
    expect(cagePage).toBeGreaterThan(0);
    execFileSync('pdftoppm', ['-png', '-r', '100', '-f', String(cagePage), '-l', String(cagePage), pdf, join(dir, 'cage')]);
    mkdirSync(screensDir, { recursive: true });
    for (const f of readdirSync(dir).filter((f) => f.startsWith('cage') && f.endsWith('.png'))) copyFileSync(join(dir, f), join(screensDir, 'cage-pdf-page.png'));
    const { data: png, info: pngInfo } = await sharp(join(screensDir, 'cage-pdf-page.png')).raw().toBuffer({ resolveWithObject: true });
    let inked = 0;
    for (let i = 0; i < png.length; i += pngInfo.channels) if (png[i]! < 200) inked++;
    expect(inked / (pngInfo.width * pngInfo.height), 'the cage page carries drawings, not only words').toBeGreaterThan(0.02);

    expect(missing, 'no page of the journey asked for something that is not there').toEqual([]);

    // Submit for review, with a note.
    await page.locator('#submit-note').fill('Backstays moved back to 30 in; please look at the drawing.');
    await page.locator('[data-test="submit-review"]').click();
    await page.waitForURL(/\/submissions\//);
    expect(browser.pageErrors.map((e) => e.message)).toEqual([]);

    // The steward sees the same drawing and the specification table.
    const stewardSession = await openBrowser();
    others.push(stewardSession);
    const steward = stewardSession.page;
    await signIn(steward, baseUrl, demoUsers.steward);
    await steward.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Review queue' }).click();
    const item = steward.locator('.ql__item', { hasText: carName });
    await item.first().waitFor();
    await item.first().getByRole('link').click();
    await steward.waitForURL(/\/submissions\//);
    await steward.locator('[data-view="side"] svg[role="img"]').waitFor();
    expect(await steward.locator('.cage__view svg[role="img"]').count()).toBe(3);
    expect(await steward.locator('[data-view="side"] g[data-member-id]').count()).toBeGreaterThanOrEqual(8);
    const specTable = steward.getByRole('region', { name: 'Specification' });
    expect(await specTable.innerText()).toContain('backstay left');
    // Findings: not met first, then those that need a measurement, then those met.
    const groups = await steward.locator('[aria-label="Findings"] section[data-group]').evaluateAll((els) => els.map((e) => e.getAttribute('data-group')));
    const order = ['not_met', 'needs_information', 'met', 'not_applicable'];
    expect(groups).toEqual([...groups].sort((a, b) => order.indexOf(a!) - order.indexOf(b!)));
    await screenshot(steward, 'cage-review-desktop');
    await steward.setViewportSize({ width: 390, height: 844 });
    await steward.waitForTimeout(200);
    await screenshot(steward, 'cage-review-phone');
    expect(await steward.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
    expect(stewardSession.pageErrors.map((e) => e.message)).toEqual([]);

    // The builder's sheet on a phone: the drawing first.
    const phone = await openBrowser({ width: 390, height: 844 });
    others.push(phone);
    await signIn(phone.page, baseUrl, demoUsers.builder);
    await phone.page.goto(sheetUrl);
    await phone.page.locator('[data-view="side"] svg[role="img"]').waitFor();
    const drawingTop = await phone.page.locator('.sheet__drawing').evaluate((e) => e.getBoundingClientRect().top);
    const findingsTop = await phone.page.locator('.sheet__panel').evaluate((e) => e.getBoundingClientRect().top);
    expect(drawingTop).toBeLessThan(findingsTop);
    await phone.page.screenshot({ path: join(screensDir, 'cage-sheet-phone-viewport.png') });
    await screenshot(phone.page, 'cage-sheet-phone');
    expect(await phone.page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
    expect(phone.pageErrors.map((e) => e.message)).toEqual([]);
  } finally {
    for (const s of others) await s.close();
    rmSync(dir, { recursive: true, force: true });
  }
}, 240_000);

test('without WebGL the 3D view says so plainly and points to the flat views', async () => {
  const noGl = await openBrowser({ width: 1280, height: 800 }, ['--disable-3d-apis']);
  try {
    await signIn(noGl.page, baseUrl, demoUsers.builder);
    const { cars } = await api<{ cars: { name: string; buildSheets: { id: string }[] }[] }>(noGl.page, 'GET', '/cars?show=all');
    const sheetId = cars.find((c) => c.name === DEMO_CAR)!.buildSheets[0]!.id;
    await noGl.page.goto(`${baseUrl}/build-sheets/${sheetId}`);
    await noGl.page.locator('[data-view="side"] svg[role="img"]').waitFor();
    await noGl.page.getByRole('group', { name: 'Which views' }).getByRole('button', { name: '3D' }).click();
    const message = noGl.page.locator('[data-test="cage-3d-unavailable"]');
    await message.waitFor();
    expect(await message.innerText()).toContain('cannot draw the 3D view here');
    expect(await noGl.page.locator('[data-test="cage-3d"] canvas').count()).toBe(0);
    await noGl.page.locator('.sheet__drawing').screenshot({ path: join(screensDir, 'cage-3d-unavailable-desktop.png') });
    expect(noGl.pageErrors.map((e) => e.message)).toEqual([]);
  } finally {
    await noGl.close();
  }
}, 90_000);
