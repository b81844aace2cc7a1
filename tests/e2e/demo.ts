// The demo accounts the seed creates (backend/src/db/seed.ts) and the steps every journey shares.
import type { Page } from 'playwright-core';
import { inject } from 'vitest';

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

/**
 * A call to the API in the page's own session (its cookies), with a fresh CSRF token: how a journey
 * sets up what is not the point of it. A refusal throws with the server's answer; 204 gives undefined.
 */
export async function api<T>(page: Page, method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE', path: string, data?: unknown): Promise<T> {
  const baseUrl = inject('e2eBaseUrl');
  const token = ((await (await page.request.get(`${baseUrl}/api/auth/csrf`)).json()) as { token: string }).token;
  const res = await page.request.fetch(`${baseUrl}/api${path}`, { method, data, headers: { 'X-CSRF-Token': token } });
  if (!res.ok()) throw new Error(`${method} ${path}: ${res.status()} ${await res.text()}`);
  return (res.status() === 204 ? undefined : await res.json()) as T;
}

export { demoSaloon } from '../fixtures/demo-saloon';
