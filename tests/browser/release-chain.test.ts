// The review half of the chain through the real built client in Chromium: a producer uploads a take
// and cues it for the operator's venue, the run page refuses its release until it is cleared, a safety
// reviewer opens it from their queue and clears it with a reason, and the producer then reads the
// review with its reason and is no longer refused the release for the run's state. No error in any
// browser console on the way.
import type { Browser, BrowserContext, ConsoleMessage, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchChromium, requireBaseUrl, screenshotDir } from './support/chromium';
import { DEMO_PASSWORD, DEMO_USERS, DEMO_VENUES } from '../../shared/demo';
import { gentleVehicleCsv } from './support/takes';

const baseUrl = process.env.LEGWORK_BASE_URL;
const person = (role: string) => {
  const user = DEMO_USERS.find((u) => u.roles.includes(role as never));
  if (!user) throw new Error(`No demo member with the role ${role}.`);
  return user;
};
const producer = person('producer');
const reviewer = person('safety_reviewer');
const operator = person('venue_operator');
const operatorVenue = DEMO_VENUES[operator.venues?.[0] ?? 'dome'].name;

let browser: Browser | undefined;
const consoleErrors: string[] = [];

beforeAll(async () => {
  requireBaseUrl();
  browser = await launchChromium();
});

afterAll(async () => {
  await browser?.close();
});

async function signedIn(email: string): Promise<{ context: BrowserContext; page: Page }> {
  if (!browser || !baseUrl) throw new Error('The browser did not start; see the error of beforeAll.');
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  page.on('console', (message: ConsoleMessage) => {
    if (message.type() === 'error')
      consoleErrors.push(`${email}: ${message.text()} (${message.location().url})`);
  });
  page.on('pageerror', (error) => consoleErrors.push(`${email}: uncaught: ${error.message}`));
  await page.goto(new URL('/sign-in', baseUrl).href);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.getByRole('navigation', { name: 'Studio pages' }).waitFor({ state: 'visible', timeout: 15_000 });
  return { context, page };
}

async function shot(page: Page, name: string) {
  await page.waitForLoadState('networkidle');
  await page.screenshot({ path: `${screenshotDir}/${name}.png`, fullPage: true });
}

describe('review of a new take', () => {
  it('takes a new take from upload to a cleared run, reviewed from the queue', async () => {
    const title = `Harbour lantern run ${Date.now()}`;

    // 1. The producer uploads a take and cues it for the operator's venue only.
    let runPath: string | undefined;
    {
      const { context, page } = await signedIn(producer.email);
      try {
        await page
          .getByRole('navigation', { name: 'Studio pages' })
          .getByRole('link', { name: 'Tracks' })
          .click();
        await page.getByLabel('Track title').fill(title);
        await page.getByRole('button', { name: 'Create track' }).click();
        await page.getByRole('heading', { name: title, level: 1 }).waitFor({ timeout: 15_000 });
        await page.getByLabel('Take file (.csv or .csv.gz)').setInputFiles({
          name: 'harbour-lantern.csv',
          mimeType: 'text/csv',
          buffer: Buffer.from(gentleVehicleCsv()),
        });
        await page.getByRole('button', { name: 'Upload take' }).click();
        await page.getByText(/^Take 1 stored: harbour-lantern\.csv/).waitFor({ timeout: 30_000 });
        await page.getByRole('button', { name: 'Cue for venues' }).click();
        const cueForm = page.getByRole('form', { name: 'Cue take 1 for venues' });
        await cueForm.getByRole('checkbox', { name: new RegExp(operatorVenue) }).check();
        await cueForm.getByRole('button', { name: 'Queue cue runs' }).click();
        const finished = page
          .getByRole('table', { name: /^Runs at / })
          .getByRole('row')
          .filter({ hasText: /Awaiting review|Held by budget|Failed/ })
          .first();
        await finished.waitFor({ timeout: 90_000 });
        expect(await finished.textContent()).toContain('Awaiting review');
        await finished.getByRole('link', { name: /^Open run/ }).click();
        const panel = page.getByTestId('decision-panel');
        await panel.getByRole('button', { name: 'Release to the venue' }).waitFor({ timeout: 15_000 });
        // Not cleared yet: the release is refused, and the panel says why in plain words.
        await expect(panel.getByRole('button', { name: 'Release to the venue' }).isDisabled()).resolves.toBe(
          true,
        );
        runPath = new URL(page.url()).pathname;
        await shot(page, 'chain-1-awaiting-review');
      } finally {
        await context.close();
      }
    }

    // 2. The reviewer finds it in their queue and clears it with a reason.
    {
      const { context, page } = await signedIn(reviewer.email);
      try {
        const queue = page.getByRole('table', { name: 'Review queue' });
        await queue.getByRole('link', { name: `${title}, take 1` }).click();
        expect(new URL(page.url()).pathname).toBe(runPath);
        const panel = page.getByTestId('decision-panel');
        await panel.getByLabel(/^Reason/).fill('Within the venue budget; seat forces gentle throughout.');
        await panel.getByRole('button', { name: 'Clear for release' }).click();
        await panel.getByText('The run is cleared.').waitFor({ timeout: 15_000 });
        await panel.getByText('Within the venue budget; seat forces gentle throughout.').waitFor();
        await shot(page, 'chain-2-cleared');
      } finally {
        await context.close();
      }
    }

    // 3. The producer reads the review; the clear is not theirs to give, and the release is either
    // offered or refused for a reason other than the run's state.
    {
      const { context, page } = await signedIn(producer.email);
      try {
        await page.goto(new URL(runPath!, baseUrl).href);
        const panel = page.getByTestId('decision-panel');
        await panel
          .getByText('Within the venue budget; seat forces gentle throughout.')
          .waitFor({ timeout: 15_000 });
        await expect(panel.getByRole('button', { name: 'Clear for release' }).isDisabled()).resolves.toBe(
          true,
        );
        const release = panel.getByRole('button', { name: 'Release to the venue' });
        if (await release.isDisabled()) {
          const why = (await release.locator('xpath=following-sibling::p[1]').textContent()) ?? '';
          expect(why.length).toBeGreaterThan(0);
          expect(why).not.toBe('Only a cleared run can be released.');
        }
        await shot(page, 'chain-3-producer-reads-review');
      } finally {
        await context.close();
      }
    }
    expect(consoleErrors).toEqual([]);
  }, 240_000);
});
