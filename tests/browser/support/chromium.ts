// Debian's Chromium driven by playwright-core (never a downloaded browser), against the built app that
// `npm test` serves at LEGWORK_BASE_URL.
import { mkdirSync } from 'node:fs';
import { chromium } from 'playwright-core';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';
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

/**
 * One Chromium for a test file: launched before its tests, closed after them. Call at the top of
 * the file; the returned function gives the browser inside a test.
 */
export function browserForFile(): () => Browser {
  let browser: Browser | undefined;
  beforeAll(async () => {
    requireBaseUrl();
    browser = await launchChromium();
  });
  afterAll(async () => {
    await browser?.close();
  });
  return () => {
    if (!browser) throw new Error('The browser did not start; see the error of beforeAll.');
    return browser;
  };
}

/**
 * A new browser context signed in as `email`, collecting console errors and uncaught exceptions
 * (with the script's address) so a test can require that there were none.
 */
export async function openSignedIn(
  browser: Browser,
  email: string,
  viewport: { width: number; height: number } = { width: 1440, height: 900 },
): Promise<{ page: Page; errors: string[]; close: () => Promise<void> }> {
  const context = await browser.newContext({ viewport });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on('console', (message) => {
    if (message.type() === 'error') errors.push(`${message.text()} (${message.location().url})`);
  });
  page.on('pageerror', (error) => errors.push(`uncaught: ${error.message}`));
  await signIn(page, email);
  return { page, errors, close: () => context.close() };
}
