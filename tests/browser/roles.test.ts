// Every demo member signs in through the real built client in Chromium, lands on the home section of
// their role, and signs out again, with no error in the browser console on the way.
import type { ConsoleMessage } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserForFile, screenshotDir } from './support/chromium';
import { DEMO_PASSWORD, DEMO_USERS } from '../../shared/demo';

const baseUrl = process.env.LEGWORK_BASE_URL;

const browser = browserForFile();

describe('each demo role signs in and sees its own home', () => {
  for (const user of DEMO_USERS) {
    const role = user.roles[0];
    it(`${user.email} (${role}) signs in, sees home-${role}, and signs out`, async () => {
      if (!baseUrl) throw new Error('LEGWORK_BASE_URL is not set; see the error of beforeAll.');
      const context = await browser().newContext({ viewport: { width: 1280, height: 800 } });
      const page = await context.newPage();
      const consoleErrors: string[] = [];
      page.on('console', (message: ConsoleMessage) => {
        if (message.type() === 'error') consoleErrors.push(`${message.text()} (${message.location().url})`);
      });
      page.on('pageerror', (error) => consoleErrors.push(`uncaught: ${error.message}`));

      try {
        await page.goto(new URL('/sign-in', baseUrl).href);
        await page.getByLabel('E-mail').fill(user.email);
        await page.getByLabel('Password').fill(DEMO_PASSWORD);
        await page.getByRole('button', { name: 'Sign in', exact: true }).click();

        const home = page.getByTestId(`home-${role}`);
        await home.waitFor({ state: 'visible', timeout: 15_000 });
        expect(page.url()).toMatch(/\/s\/[0-9a-f-]{36}$/);
        // The shell names the signed-in person and carries the safety caution on every screen.
        await expect(page.getByText(user.name, { exact: true }).isVisible()).resolves.toBe(true);
        await expect(page.getByRole('note', { name: 'Safety caution' }).textContent()).resolves.toContain(
          'Motion can injure riders and staff.',
        );
        // Wait for the section's own data (venue tables, counts, the role's lists) before taking the
        // picture: the page's load state settled on the sign-in page already, so every loading line
        // must go within the deadline.
        await page.waitForLoadState('networkidle');
        await expect.poll(() => page.getByRole('status').count(), { timeout: 15_000 }).toBe(0);
        await page.screenshot({ path: `${screenshotDir}/home-${role}.png`, fullPage: true });

        await page.getByRole('button', { name: 'Sign out', exact: true }).click();
        await page
          .getByRole('button', { name: 'Sign in', exact: true })
          .waitFor({ state: 'visible', timeout: 15_000 });
        expect(new URL(page.url()).pathname).toBe('/sign-in');
        await page.waitForLoadState('networkidle');
      } finally {
        await context.close();
      }
      expect(consoleErrors).toEqual([]);
    });
  }
});
