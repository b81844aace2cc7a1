// The build journal in the browser: a builder follows "Build journal" from a sheet, records the
// stage the cage is fitted (a date in the future is refused at its field first), adds two photos
// and watches them arrive, records the tack-up; after the builder submits a check, the steward sees
// the journal on the review page. Screens: .artifacts/screens/journal-*.png.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { expect, inject } from 'vitest';
import type { Page } from 'playwright-core';
import { browserTest as test, openBrowser, screenshot } from './browser';
import { demoUsers, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');
const IN = 25.4;

async function jpeg(dir: string, name: string, colour: { r: number; g: number; b: number }): Promise<string> {
  const path = join(dir, name);
  await sharp({ create: { width: 800, height: 600, channels: 3, background: colour } })
    .composite([{ input: { create: { width: 300, height: 200, channels: 3, background: { r: 240, g: 240, b: 240 } } }, top: 200, left: 250 }])
    .jpeg().toFile(path);
  return path;
}

async function apiOf(page: Page) {
  const { token } = (await (await page.request.get(`${baseUrl}/api/auth/csrf`)).json()) as { token: string };
  return async <T>(path: string, data?: unknown): Promise<T> => {
    const res = data === undefined && !path.endsWith('check-runs')
      ? await page.request.get(`${baseUrl}/api${path}`)
      : await page.request.post(`${baseUrl}/api${path}`, { headers: { 'X-CSRF-Token': token }, data: data ?? {} });
    expect(res.status(), `${path}: ${await res.text()}`).toBeLessThan(300);
    return (await res.json()) as T;
  };
}

async function newSheet(page: Page): Promise<string> {
  const api = await apiOf(page);
  const { memberships } = await api<{ memberships: { club: { id: string } }[] }>('/auth/me');
  const clubId = memberships[0].club.id;
  const { rulebooks } = await api<{ rulebooks: { slug: string; versions: { id: string; status: string }[] }[] }>(`/clubs/${clubId}/rulebooks`);
  const version = rulebooks.find((r) => r.slug === 'tarnwick-vale-mc-cage-regulations-2027')!.versions.find((v) => v.status === 'published')!;
  const { car } = await api<{ car: { id: string } }>('/cars', { name: 'Green sprinter', make: 'Invented Motors', model: 'S1', year: 1988, chassisType: 'unibody', raceNumber: '88' });
  const specification = {
    vehicle: { classId: 'club-saloon', weightWithDriverKg: 1100, chassis: 'unibody' },
    members: [{ id: 'mh', kind: 'main_hoop', odMm: 1.75 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', continuousPiece: true }],
  };
  const { buildSheet } = await api<{ buildSheet: { id: string } }>(`/cars/${car.id}/build-sheets`, { name: 'Journal test', clubId, rulesetVersionId: version.id, classId: 'club-saloon', specification });
  return buildSheet.id;
}

test('a builder keeps a build journal and the steward reads it on the review page', async ({ browser }) => {
  const { page, pageErrors } = browser;
  const dir = mkdtempSync(join(tmpdir(), 'cagewright-journal-'));
  try {
    await signIn(page, baseUrl, demoUsers.builder);
    const sheetId = await newSheet(page);
    await page.goto(`${baseUrl}/build-sheets/${sheetId}`);
    await page.getByRole('link', { name: 'Build journal' }).click();
    await page.getByRole('heading', { name: 'Build journal', level: 1 }).waitFor();
    expect(await page.getByLabel('Safety notice').innerText()).toMatch(/qualified people working under local rules[\s\S]*not a substitute for measuring the car/);
    await screenshot(page, 'journal-empty-desktop');

    const fitted = page.locator('.jstage', { hasText: 'Fitted in the car' });
    await fitted.getByRole('button', { name: 'Record “Fitted in the car”' }).click();
    await fitted.getByLabel('Date reached').fill('2999-01-01');
    await fitted.getByText('A stage cannot be dated in the future').waitFor();
    await fitted.getByLabel('Date reached').fill('2026-11-07');
    await fitted.getByLabel('Note').fill('Every tube offered up and clamped; door bars clear the seat by 40 mm.');
    await fitted.getByRole('button', { name: 'Record stage' }).click();
    await fitted.locator('time').waitFor();
    expect(await fitted.locator('time').getAttribute('datetime')).toBe('2026-11-07');

    await fitted.getByLabel('Caption for photos of Fitted in the car').fill('Offered up, driver side');
    await fitted.getByLabel('Photos of Fitted in the car', { exact: true }).setInputFiles([await jpeg(dir, 'fit-1.jpg', { r: 60, g: 90, b: 130 }), await jpeg(dir, 'fit-2.jpg', { r: 150, g: 90, b: 40 })]);
    await expect.poll(() => fitted.locator('.jstage__photo img').count(), { timeout: 30_000 }).toBe(2);
    expect(await fitted.locator('.jstage__caption').first().innerText()).toBe('Offered up, driver side');

    const tacked = page.locator('.jstage', { hasText: 'Tacked' });
    await tacked.getByRole('button', { name: 'Record “Tacked”' }).click();
    await tacked.getByLabel('Date reached').fill('2026-11-14');
    await tacked.getByRole('button', { name: 'Record stage' }).click();
    await tacked.locator('time').waitFor();
    await page.getByText('2 of 5 stages reached · 2 of 60 journal photos').waitFor();
    await screenshot(page, 'journal-two-stages-desktop');

    // Submit a check of the sheet, as the builder would from the check run page.
    const api = await apiOf(page);
    const { checkRun } = await api<{ checkRun: { id: string } }>(`/build-sheets/${sheetId}/check-runs`);
    const submitted = await api<{ id?: string; submission?: { id: string } }>('/submissions', { checkRunId: checkRun.id, note: 'Journal attached.' });
    const submissionId = submitted.submission?.id ?? submitted.id!;
    expect(pageErrors).toEqual([]);

    const steward = await openBrowser();
    try {
      await signIn(steward.page, baseUrl, demoUsers.steward);
      await steward.page.goto(`${baseUrl}/submissions/${submissionId}`);
      const section = steward.page.locator('section', { has: steward.page.getByRole('heading', { name: 'Build journal' }) });
      await section.getByText('Fitted in the car').waitFor();
      await expect.poll(() => section.locator('.jstage__photo img').count(), { timeout: 30_000 }).toBe(2);
      expect(await section.getByRole('button').count()).toBe(0);
      expect(await section.innerText()).toMatch(/door bars clear the seat by 40 mm/);
      await section.scrollIntoViewIfNeeded();
      await screenshot(steward.page, 'journal-review-steward-desktop');
      expect(steward.pageErrors).toEqual([]);
    } finally {
      await steward.close();
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}, 180_000);

test('on a phone the journal reads as one column', async () => {
  const session = await openBrowser({ width: 390, height: 844 });
  try {
    const { page } = session;
    await signIn(page, baseUrl, demoUsers.builder);
    const sheetId = await newSheet(page);
    await page.goto(`${baseUrl}/build-sheets/${sheetId}/journal`);
    const fitted = page.locator('.jstage', { hasText: 'Fitted in the car' });
    await fitted.getByRole('button', { name: 'Record “Fitted in the car”' }).click();
    await fitted.getByLabel('Date reached').fill('2026-11-07');
    await fitted.getByRole('button', { name: 'Record stage' }).click();
    await fitted.locator('time').waitFor();
    await screenshot(page, 'journal-phone');
    expect(session.pageErrors).toEqual([]);
  } finally {
    await session.close();
  }
}, 120_000);
