// Equivalence by strength on the check screen: a builder's 2.000 × 0.083 in main hoop is not a size the
// demo saloon table lists (1.500 × 0.120 or 1.750 × 0.095 in, and 1.750 in or larger only with a
// 0.095 in wall), so it fails; the finding says, as advice only, that it is equivalent by section
// modulus (Z 0.2300 against 0.1664 in³, F-ENG-1/F-ENG-4) and shows every step in the builder's units.
// Screens: .artifacts/screens/equivalence-*.png.
import { expect, inject } from 'vitest';
import { browserTest as test, screenshot } from './browser';
import { demoUsers, signIn } from './demo';

const baseUrl = inject('e2eBaseUrl');
const IN = 25.4;

test('a failing tube that would be equivalent by strength is told so as advice, with every step', async ({ browser }) => {
  const { page, pageErrors } = browser;
  await signIn(page, baseUrl, demoUsers.builder);
  const { token } = (await (await page.request.get(`${baseUrl}/api/auth/csrf`)).json()) as { token: string };
  const headers = { 'X-CSRF-Token': token };
  const me = (await (await page.request.get(`${baseUrl}/api/auth/me`)).json()) as { memberships: { club: { id: string } }[] };
  const clubId = me.memberships[0]!.club.id;
  const { rulebooks } = (await (await page.request.get(`${baseUrl}/api/clubs/${clubId}/rulebooks`)).json()) as { rulebooks: { slug: string; versions: { id: string; status: string; versionNumber: number }[] }[] };
  // The seeded edition: another journey may put a stricter one in force first.
  const version = rulebooks.find((r) => r.slug === 'tarnwick-vale-mc-cage-regulations-2027')!.versions.find((v) => v.versionNumber === 1)!;
  const car = (await (await page.request.post(`${baseUrl}/api/cars`, { headers, data: { name: 'Wide-tube saloon', chassisType: 'unibody' } })).json()) as { car: { id: string } };
  const specification = {
    vehicle: { classId: 'club-saloon', weightWithDriverKg: 1200, chassis: 'unibody' },
    members: [{ id: 'mh', kind: 'main_hoop', label: 'Main hoop', odMm: 2 * IN, wallMm: 0.083 * IN, material: 'mild_steel', process: 'dom', continuousPiece: true, bends: [] }],
  };
  const res = await page.request.post(`${baseUrl}/api/cars/${car.car.id}/build-sheets`, { headers, data: { name: 'Wide hoop', clubId, rulesetVersionId: version.id, classId: 'club-saloon', specification } });
  expect(res.status()).toBe(201);
  const { buildSheet } = (await res.json()) as { buildSheet: { id: string } };
  await page.goto(`${baseUrl}/build-sheets/${buildSheet.id}`);
  const finding = page.locator('.finding', { hasText: 'Advisory only' }).first();
  await finding.waitFor({ timeout: 30_000 });
  expect(await finding.locator('.finding__reason').innerText()).toMatch(/Advisory only: by section modulus this tube is equivalent to 1\.500 × 0\.120 in: Z 0\.2300 in³ \(at least 0\.1664 in³\)\. This rulebook does not accept equivalents by strength, so the finding stands/);
  await finding.getByText('Advice: equivalence by section modulus, step by step').click();
  const steps = finding.locator('.feq__steps li');
  await steps.first().waitFor();
  expect(await steps.allInnerTexts()).toEqual(expect.arrayContaining([
    'Listed size: 1.500 × 0.120 in. Inside diameter d = D − 2t = 1.500 in − 2 × 0.120 in = 1.260 in.',
    expect.stringMatching(/^Ratio: Z of the alternative ÷ Z of the listed size = 0\.2300 in³ ÷ 0\.1664 in³ = 1\.38 \(at least 1\.00\)\.$/),
  ]));
  // The findings panel scrolls on its own: bring the steps into view and take what the builder sees.
  await steps.last().scrollIntoViewIfNeeded();
  await page.screenshot({ path: `${process.cwd()}/.artifacts/screens/equivalence-finding.png` });
  await screenshot(page, 'equivalence-sheet');
  expect(pageErrors).toEqual([]);
}, 120_000);
