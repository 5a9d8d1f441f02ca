// The signed-in screens through the real built client in Chromium, checked with axe-core (Deque's
// rules for WCAG 2.1 A and AA): no serious or critical violation on any of them. Also the keyboard
// path every screen shares: a skip link first in the tab order, and after a navigation the focus on
// the new page's heading.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchChromium, requireBaseUrl, screenshotDir } from './support/chromium';
import { DEMO_PASSWORD, DEMO_TRACK, DEMO_USERS } from '../../shared/demo';
import { trackDetailSchema, trackPageSchema } from '../../shared/schemas/pipeline';

const baseUrl = process.env.LEGWORK_BASE_URL;
const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');
let browser: Browser | undefined;

beforeAll(async () => {
  requireBaseUrl();
  browser = await launchChromium();
});
afterAll(async () => {
  await browser?.close();
});

interface Violation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

/** axe-core's serious and critical WCAG 2.1 A/AA violations on the page as it is now. */
async function seriousViolations(page: Page): Promise<string[]> {
  // Evaluated over the DevTools protocol: the app's content security policy (no inline scripts) stays on.
  await page.evaluate(axeSource);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (o: unknown) => Promise<{ violations: unknown[] }> } })
      .axe;
    const r = await axe.run({
      runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] },
    });
    return r.violations;
  });
  return (violations as Violation[])
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map(
      (v) =>
        `${v.impact} ${v.id}: ${v.help} at ${v.nodes
          .map((n) => n.target.join(' '))
          .slice(0, 3)
          .join('; ')}`,
    );
}

async function settle(page: Page) {
  await page.waitForLoadState('networkidle');
  await expect
    .poll(
      () =>
        page
          .getByRole('status')
          .filter({ hasText: /Loading/ })
          .count(),
      { timeout: 15_000 },
    )
    .toBe(0);
}

describe('accessibility', () => {
  it('the main screens have no serious or critical axe-core violations, and focus follows navigation', async () => {
    if (!browser || !baseUrl) throw new Error('The browser did not start; see the error of beforeAll.');
    const producer = DEMO_USERS.find((u) => u.roles.includes('producer'))!;
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    try {
      await page.goto(new URL('/sign-in', baseUrl).href);
      await settle(page);
      const found: string[] = (await seriousViolations(page)).map((v) => `sign-in: ${v}`);
      await page.getByLabel('E-mail').fill(producer.email);
      await page.getByLabel('Password').fill(DEMO_PASSWORD);
      await page.getByRole('button', { name: 'Sign in', exact: true }).click();
      const nav = page.getByRole('navigation', { name: 'Studio pages' });
      await nav.waitFor({ state: 'visible', timeout: 15_000 });
      await settle(page);
      found.push(...(await seriousViolations(page)).map((v) => `home: ${v}`));

      // The skip link is the first stop of the keyboard and leads to the page.
      // From the top of the document (the sign-in navigation may already have put the focus on the
      // home's heading), the first Tab reaches the skip link.
      await page.evaluate(() => {
        document.body.tabIndex = -1;
        document.body.focus();
        document.body.removeAttribute('tabindex');
      });
      await page.keyboard.press('Tab');
      const skip = page.getByRole('link', { name: 'Skip to the page' });
      await expect.poll(() => skip.evaluate((el) => el === document.activeElement)).toBe(true);

      for (const name of ['Tracks', 'Venues', 'Profiles']) {
        const link = nav.getByRole('link', { name, exact: true });
        if ((await link.count()) === 0) continue;
        await link.click();
        const heading = page.getByRole('heading', { level: 1 }).first();
        await heading.waitFor();
        await settle(page);
        // After the navigation the focus is on the new page's heading.
        await expect
          .poll(() => heading.evaluate((el) => el === document.activeElement), { timeout: 5_000 })
          .toBe(true);
        found.push(...(await seriousViolations(page)).map((v) => `${name}: ${v}`));
      }

      // A track page and a run page of the demo track.
      await nav.getByRole('link', { name: 'Tracks', exact: true }).click();
      await settle(page);
      const firstTrack = page.getByRole('table').first().getByRole('link').first();
      if ((await firstTrack.count()) > 0) {
        await firstTrack.click();
        await page.getByRole('heading', { level: 1 }).first().waitFor();
        await settle(page);
        found.push(...(await seriousViolations(page)).map((v) => `track: ${v}`));
        const runLink = page.getByRole('link', { name: /^Open run/ }).first();
        if ((await runLink.count()) > 0) {
          await runLink.click();
          await page.getByRole('heading', { level: 1 }).first().waitFor();
          await settle(page);
          found.push(...(await seriousViolations(page)).map((v) => `run: ${v}`));
          await page.screenshot({ path: `${screenshotDir}/run-page-a11y.png`, fullPage: true });
        }
      }

      // A run page with findings as a reviewer works it: a finding selected on the timeline (the charts
      // brought to it, its read-out shown), a chart group chosen, and every folded section opened.
      const [, studioId] = /\/s\/([^/?#]+)/.exec(page.url()) ?? [];
      const tracks = trackPageSchema.parse(
        await (await page.request.get(new URL(`/api/studios/${studioId}/tracks`, baseUrl).href)).json(),
      );
      const demo = tracks.items.find((t) => t.title === DEMO_TRACK.title);
      if (demo) {
        const detail = trackDetailSchema.parse(
          await (
            await page.request.get(new URL(`/api/studios/${studioId}/tracks/${demo.id}`, baseUrl).href)
          ).json(),
        );
        const withFindings = detail.runs.find((r) => (r.findingCount ?? 0) > 0);
        expect(withFindings, 'a demo run with findings').toBeDefined();
        await page.goto(new URL(`/s/${studioId}/runs/${withFindings!.id}`, baseUrl).href);
        await page.getByRole('heading', { level: 1 }).first().waitFor();
        await settle(page);
        await page.getByTestId('take-timeline').locator('[data-finding]').first().click();
        await page
          .getByTestId('finding-readout')
          .getByText(/finding \d+ of \d+/)
          .waitFor();
        await page.getByRole('tab', { name: 'Actuator use' }).click();
        for (const summary of await page.locator('details > summary').all()) await summary.click();
        await settle(page);
        found.push(...(await seriousViolations(page)).map((v) => `run with a finding selected: ${v}`));
        await page.screenshot({ path: `${screenshotDir}/run-page-finding-a11y.png`, fullPage: true });
      }
      expect(found).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
