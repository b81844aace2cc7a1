// The builder's bench: the cope tool (a bad branch refused at its field, the depth of a published
// saddle example, the 1:1 template downloaded and its 100 mm and 4 in rulers measured in pixels on a
// render at 254 dpi), the hoop leg trim (a pad out of reach refused), a bender die calibrated once,
// and a sheet with a cage model giving its cut and bend schedule, copes, leg cuts and buying list.
// Screens in .artifacts/screens/fabrication-*.png.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { expect, inject } from 'vitest';
import type { Page } from 'playwright-core';
import { browserTest as test, screenshot } from './browser';
import { demoUsers, signIn } from './demo';
import { modelSpec } from '../fixtures/fabrication-model';

const baseUrl = inject('e2eBaseUrl');

/** Lengths of the dark horizontal runs on a page rendered to greyscale PGM (pdftoppm -gray). */
function darkRuns(pgm: Buffer): number[] {
  const header = pgm.toString('latin1', 0, 64).match(/^P5\s+(\d+)\s+(\d+)\s+(\d+)\s/);
  if (!header) throw new Error('not a PGM');
  const [width, height] = [Number(header[1]), Number(header[2])];
  const data = pgm.subarray(header[0].length);
  const runs: number[] = [];
  for (let y = 0; y < height; y++) {
    let run = 0;
    for (let x = 0; x <= width; x++) {
      const dark = x < width && data[y * width + x]! < 128;
      if (dark) run++;
      else if (run) {
        if (run > 200) runs.push(run);
        run = 0;
      }
    }
  }
  return runs;
}

async function download(page: Page, click: () => Promise<void>, dir: string, name: string): Promise<string> {
  const [file] = await Promise.all([page.waitForEvent('download'), click()]);
  const path = join(dir, name);
  await file.saveAs(path);
  return path;
}

test('a builder copes a tube, trims hoop legs, calibrates a die and reads a sheet’s fabrication', async ({ browser }) => {
  const { page } = browser;
  const dir = mkdtempSync(join(tmpdir(), 'cagewright-fab-'));
  try {
    await signIn(page, baseUrl, demoUsers.builder);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Bench tools' }).click();
    await page.getByRole('heading', { name: 'Cope template' }).waitFor();
    expect(await page.getByRole('complementary', { name: 'Safety notice' }).innerText()).toContain('Welding and fabrication belong to qualified people');

    // The demo builder works in inches. A branch wider than its run is refused at the field, with no drawing.
    await page.locator('#cope-branch').fill('7');
    await page.locator('#cope-run').fill('6');
    await page.locator('#cope-angle').fill('90');
    await page.locator('#cope-offset').fill('0');
    await page.getByText('The branch cannot be wider than the tube it meets.').waitFor();
    expect(await page.getByRole('button', { name: 'Download 1:1 template (PDF)' }).count()).toBe(0);
    await screenshot(page, 'fabrication-cope-refused');
    // 2 in on 6 in at 90°: 0.172 in (published pipe-saddle worked example, ±0.001 in).
    await page.locator('#cope-branch').fill('2');
    await expect.poll(() => page.locator('[data-test="cope-depth"]').innerText()).toBe('0.172 in');
    await page.locator('#cope-branch').fill('1.5');
    await page.locator('#cope-run').fill('1.75');
    await page.locator('#cope-angle').fill('55');
    await page.locator('#cope-name').fill('backstay left, top end');
    await screenshot(page, 'fabrication-cope');
    const pdf = await download(page, () => page.getByRole('button', { name: 'Download 1:1 template (PDF)' }).click(), dir, 'cope.pdf');
    const text = execFileSync('pdftotext', [pdf, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toContain('Print at actual size, then check the ruler.');
    expect(text).toContain('backstay left, top end');
    expect(text).toContain('Welding and fabrication belong to qualified people working under local rules.');
    expect(execFileSync('pdfinfo', [pdf], { encoding: 'utf8' })).toMatch(/Page size:\s+792 x 612 pts/);
    // Printed and checked with a ruler: at 254 dpi a millimetre is 10 px, so the 100 mm ruler is 1,000 px
    // long and the 4 in ruler 1,016 px (1 in = 25.4 mm, F-UNIT-1).
    execFileSync('pdftoppm', ['-f', '1', '-l', '1', '-r', '254', '-gray', pdf, join(dir, 'page')]);
    const runs = darkRuns(readFileSync(join(dir, 'page-1.pgm')));
    expect(runs.some((r) => Math.abs(r - 1000) <= 3)).toBe(true);
    expect(runs.some((r) => Math.abs(r - 1016) <= 3)).toBe(true);
    execFileSync('pdftoppm', ['-f', '1', '-l', '1', '-r', '60', '-png', pdf, join(process.cwd(), '.artifacts/screens/fabrication-cope-pdf')]);

    // Hoop leg trim with uneven pads; a top too high for the legs is refused at the pad.
    await page.getByRole('button', { name: 'Hoop leg trim' }).click();
    await page.locator('#trim-lean').fill('8');
    await page.locator('#trim-od').fill('1.75');
    await page.locator('#trim-uncut-0').fill('50');
    await page.locator('#trim-uncut-1').fill('50');
    await page.locator('#trim-pad-0').fill('0');
    await page.locator('#trim-pad-1').fill('0.5');
    await page.locator('[data-test="trim-leg-1"]').waitFor();
    // The lower left pad sets the top; the right leg loses 0.5 / cos 8° = 0.505 in (computed).
    expect(await page.locator('[data-test="trim-leg-1"]').innerText()).toContain('0.505 in');
    await screenshot(page, 'fabrication-leg-trim');
    await page.locator('#trim-top').fill('60');
    await page.getByText('The left leg cannot reach this pad').waitFor();
    await screenshot(page, 'fabrication-leg-trim-refused');

    // A die calibrated once: negative springback is refused at its field and nothing is saved.
    await page.getByRole('button', { name: 'My bender and stock' }).click();
    await page.getByRole('button', { name: 'Add a die' }).click();
    await page.locator('#die-name-0').fill('5.25 in die');
    await page.locator('#die-clr-0').fill('5.25');
    await page.locator('#die-set-0').fill('88');
    await page.locator('#die-held-0').fill('90');
    await page.getByRole('button', { name: 'Save settings' }).click();
    await page.getByText('negative springback').waitFor();
    await screenshot(page, 'fabrication-settings-refused');
    await page.locator('#die-set-0').fill('93');
    await page.getByRole('button', { name: 'Save settings' }).click();
    await page.getByText('Fabrication settings saved').waitFor();
    await screenshot(page, 'fabrication-settings');

    // A sheet with a cage model.
    const { token } = (await (await page.request.get(`${baseUrl}/api/auth/csrf`)).json()) as { token: string };
    const me = (await (await page.request.get(`${baseUrl}/api/auth/me`)).json()) as { memberships: { club: { id: string } }[] };
    const clubId = me.memberships[0]!.club.id;
    const { rulebooks } = (await (await page.request.get(`${baseUrl}/api/clubs/${clubId}/rulebooks`)).json()) as { rulebooks: { versions: { id: string; status: string; classes: { id: string }[] }[] }[] };
    const version = rulebooks.flatMap((r) => r.versions).find((v) => v.status === 'published' && v.classes.some((c) => c.id === 'club-saloon'))!;
    const headers = { 'X-CSRF-Token': token };
    const car = (await (await page.request.post(`${baseUrl}/api/cars`, { headers, data: { name: 'Bench saloon', chassisType: 'unibody' } })).json()) as { car: { id: string } };
    const sheetRes = await page.request.post(`${baseUrl}/api/cars/${car.car.id}/build-sheets`, { headers, data: { name: 'Modelled cage', clubId, rulesetVersionId: version.id, classId: 'club-saloon', specification: modelSpec } });
    expect(sheetRes.status()).toBe(201);
    const sheet = (await sheetRes.json()) as { buildSheet: { id: string } };
    await page.goto(`${baseUrl}/build-sheets/${sheet.buildSheet.id}`);
    await page.locator('summary', { hasText: 'Fabrication' }).click();
    const hb = page.locator('[data-test="fab-hb"]');
    await hb.waitFor();
    expect(await hb.innerText()).toContain('cope onto main hoop');
    expect(await page.locator('[data-test="fab-br"]').innerText()).toContain('at a bend: not a two-tube saddle');
    expect(await page.locator('[data-test="fab-mh"]').innerText()).toContain('Set bender to');
    expect(await page.locator('[data-test="leg-cut"]').innerText()).toContain('below the top’s centreline');
    await page.locator('[data-test="buying-total"]').waitFor();
    await page.locator('details', { has: page.locator('summary', { hasText: 'Fabrication' }) }).screenshot({ path: join(process.cwd(), '.artifacts/screens/fabrication-sheet-section.png') });
    await screenshot(page, 'fabrication-sheet');
    const csv = await download(page, () => page.getByRole('link', { name: 'Buying list (CSV)' }).click(), dir, 'buying.csv');
    expect(readFileSync(csv, 'utf8')).toContain('harness bar');
    const tpl = await download(page, () => hb.getByRole('button', { name: 'Template, start end' }).click(), dir, 'hb.pdf');
    expect(execFileSync('pdftotext', [tpl, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ')).toContain('harness bar, start end onto main hoop');
    expect(browser.pageErrors.map((e) => e.message)).toEqual([]);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
