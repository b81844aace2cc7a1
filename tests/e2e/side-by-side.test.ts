// A builder with two clubs sees the side-by-side matrix (issue 13 §5): the demo builder races under
// the demo club and a second one (backend/src/db/seed-second-club.ts). From the demo hillclimb sheet
// they open "Rulebooks side by side": the sheet's own schedule is the home column, the second club's
// schedule has a class of the same name and is compared at once; the demo club's cage regulations has
// none, so the builder picks one and compares again. Every cell has a verdict and a section, the
// strictest demands are marked, and one line says what satisfies all. Desktop 1280 and phone 390.
// Screens: .artifacts/screens/side-by-side-*.png.
import { expect, inject } from 'vitest';
import type { Page } from 'playwright-core';
import { browserTest as test, openBrowser, screenshot } from './browser';
import { demoUsers, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');
const DEMO_CAR = 'Heron grey hillclimb saloon'; // backend/src/db/seed-garage.ts

/** The demo sheet's id (another journey may have archived the car: it is brought back as the builder could). */
async function demoSheetId(page: Page): Promise<string> {
  const { token } = (await (await page.request.get(`${baseUrl}/api/auth/csrf`)).json()) as { token: string };
  const { cars } = (await (await page.request.get(`${baseUrl}/api/cars?show=all`)).json()) as { cars: { id: string; name: string; archivedAt: string | null; buildSheets: { id: string; name: string }[] }[] };
  const car = cars.find((c) => c.name === DEMO_CAR);
  expect(car, 'the seed gives the demo builder a car with a sheet').toBeDefined();
  if (car!.archivedAt) await page.request.post(`${baseUrl}/api/cars/${car!.id}/unarchive`, { headers: { 'X-CSRF-Token': token } });
  return car!.buildSheets.find((s) => s.name === 'Hill cage, drawn')!.id;
}

test('a builder with two clubs sees the side-by-side matrix', async ({ browser }) => {
  const { page, pageErrors } = browser;
  await signIn(page, baseUrl, demoUsers.builder);
  const sheetId = await demoSheetId(page);
  await page.goto(`${baseUrl}/build-sheets/${sheetId}`);
  await page.getByRole('link', { name: 'Rulebooks side by side' }).click();
  await page.getByRole('heading', { name: 'Rulebooks side by side' }).waitFor();
  expect(await page.getByLabel('Safety notice').innerText()).toMatch(/pre-check only[\s\S]*inspector decides/);

  // The second club's schedule has a "Hillclimb Saloon" class too: ticked and compared at once.
  const matrix = page.getByRole('region', { name: 'Rule areas by rulebook' });
  await matrix.waitFor();
  const heads = matrix.locator('thead th');
  // A first check of a rulebook compiles it in the worker: allow a busy machine its seconds.
  await expect.poll(() => heads.count(), { timeout: 20_000 }).toBe(3);
  expect(await heads.nth(1).innerText()).toMatch(/Home rulebook[\s\S]*Tarnwick Vale MC Hillclimb Cage Schedule/i);
  expect(await heads.nth(2).innerText()).toMatch(/Wexcombe Safety Cage Schedule 2027[\s\S]*Wexcombe Hill & Sprint Association · Hillclimb Saloon/);
  const hoop = matrix.locator('tbody tr', { has: page.getByRole('rowheader', { name: /main hoop/i }) });
  // Each cell: a verdict in the shared words and its governing section.
  expect(await hoop.locator('td').nth(0).innerText()).toMatch(/(Meets the rule|Does not meet it|Needs a measurement)[\s\S]*§ H2\.1\.1/);
  expect(await hoop.locator('td').nth(1).innerText()).toMatch(/(Meets the rule|Does not meet it|Needs a measurement)[\s\S]*§ W-12\.1/);
  expect(await hoop.getByText('strictest').count()).toBeGreaterThan(0);
  const line = page.getByRole('status').filter({ hasText: 'rulebooks' });
  expect(await line.innerText()).toMatch(/(To satisfy all 2 rulebooks at once: [\d.]+ × [\d.]+ in for the main hoop|Nothing in the listed sizes satisfies all 2 rulebooks at once for the main hoop)/);
  await screenshot(page, 'side-by-side-two-desktop');

  // The demo club's cage regulations: no class like the sheet's, so the builder is asked to pick one.
  const cage = page.locator('li', { hasText: 'Tarnwick Vale MC Cage Regulations' });
  await cage.getByRole('checkbox').check();
  await cage.getByText('pick the one you would enter').waitFor();
  await cage.getByRole('combobox').selectOption('club-saloon');
  await page.getByRole('button', { name: 'Compare' }).click();
  await expect.poll(() => heads.count(), { timeout: 20_000 }).toBe(4);
  // Columns follow the picker's order (by club, then title): the demo club's second rulebook comes before Wexcombe's.
  expect(await heads.nth(2).innerText()).toMatch(/Tarnwick Vale MC Cage Regulations[\s\S]*Club Saloon \(full cage\)/);
  expect(await heads.nth(3).innerText()).toMatch(/Wexcombe Safety Cage Schedule/);
  // The demo sheet gives its weight without driver only; the saloon class reads it with driver, so
  // that rulebook's tube table cannot be read and the line says so.
  expect(await line.innerText()).toMatch(/(all 3 rulebooks at once|all 2 rulebooks that give a size for this car at once[\s\S]*Tarnwick Vale MC Cage Regulations cannot be read without the car's weight)/);
  await screenshot(page, 'side-by-side-three-desktop');
  expect(pageErrors).toEqual([]);
}, 120_000);

test('on a phone the matrix scrolls sideways with the areas kept in view', async () => {
  const session = await openBrowser({ width: 390, height: 844 });
  try {
    const { page } = session;
    await signIn(page, baseUrl, demoUsers.builder);
    const sheetId = await demoSheetId(page);
    await page.goto(`${baseUrl}/build-sheets/${sheetId}/side-by-side`);
    const matrix = page.getByRole('region', { name: 'Rule areas by rulebook' });
    await matrix.waitFor();
    // The page itself does not scroll sideways; the matrix does.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    expect(await matrix.evaluate((el) => el.scrollWidth > el.clientWidth)).toBe(true);
    await screenshot(page, 'side-by-side-phone');
    await matrix.evaluate((el) => el.scrollBy({ left: 400 }));
    await screenshot(page, 'side-by-side-phone-scrolled');
    expect(session.pageErrors).toEqual([]);
  } finally {
    await session.close();
  }
}, 120_000);
