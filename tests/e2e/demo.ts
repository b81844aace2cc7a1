// The demo accounts the seed creates (backend/src/db/seed.ts) and the steps every journey shares.
import type { Page } from 'playwright-core';

export const demoPassword = 'cagewright-demo';

export const demoUsers = {
  builder: 'builder@tarnwick.example',
  steward: 'steward@tarnwick.example',
  admin: 'admin@tarnwick.example',
} as const;

export type DemoRole = keyof typeof demoUsers;

/** Opens the sign-in page, fills it in as a person would, and waits until the signed-in shell shows. */
export async function signIn(
  page: Page,
  baseUrl: string,
  email: string,
  password = demoPassword,
): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  try {
    await page.getByRole('navigation', { name: 'Main' }).waitFor({ timeout: 15_000 });
  } catch (err) {
    // Say what the page said instead of only "timeout".
    const alert = page.getByRole('alert');
    const shown = (await alert.count()) ? await alert.first().innerText() : 'no message on the page';
    throw new Error(`signing in as ${email} did not reach the app (${shown})`, { cause: err });
  }
}

/** The link texts of the main navigation, in order. */
export async function mainNavLabels(page: Page): Promise<string[]> {
  const links = page.getByRole('navigation', { name: 'Main' }).getByRole('link');
  return (await links.allInnerTexts()).map((text) => text.trim());
}
