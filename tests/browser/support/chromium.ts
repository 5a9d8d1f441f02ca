// Debian's Chromium driven by playwright-core (never a downloaded browser), against the built app that
// `npm test` serves at LEGWORK_BASE_URL.
import { mkdirSync } from 'node:fs';
import { chromium } from 'playwright-core';
import type { Browser, Page } from 'playwright-core';
import { DEMO_PASSWORD } from '../../../shared/demo';

export const screenshotDir = 'test-output/screenshots';

/** The app's address; a clear failure when the tests run outside `npm test`. */
export function requireBaseUrl(): string {
  const url = process.env.LEGWORK_BASE_URL;
  if (!url) {
    throw new Error(
      'LEGWORK_BASE_URL is not set: run the browser tests through `npm test`, or start `npm start` and set LEGWORK_BASE_URL=http://127.0.0.1:5480.',
    );
  }
  return url;
}

/** Headless Chromium with the flags that work as root on a machine with no network beyond loopback. */
export async function launchChromium(): Promise<Browser> {
  mkdirSync(screenshotDir, { recursive: true });
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/lib/chromium/chromium',
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}

/** Signs `email` in with the demo password through the sign-in page; waits for the studio navigation. */
export async function signIn(page: Page, email: string): Promise<void> {
  await page.goto(new URL('/sign-in', requireBaseUrl()).href);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.getByRole('navigation', { name: 'Studio pages' }).waitFor({ state: 'visible', timeout: 15_000 });
}
