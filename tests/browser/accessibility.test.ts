// The signed-in screens through the real built client in Chromium, checked with axe-core (Deque's
// rules for WCAG 2.1 A and AA): no serious or critical violation on any of them. Also the keyboard
// path every screen shares: a skip link first in the tab order, and after a navigation the focus on
// the new page's heading.
import { mkdirSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserForFile, screenshotDir, signIn } from './support/chromium';
import { DEMO_PASSWORD, DEMO_TRACK, DEMO_USERS } from '../../shared/demo';
import { trackDetailSchema, trackPageSchema } from '../../shared/schemas/pipeline';
import { appPaths } from '../../shared/app-paths';

const baseUrl = process.env.LEGWORK_BASE_URL;
const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');
const browser = browserForFile();

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
    if (!baseUrl) throw new Error('LEGWORK_BASE_URL is not set; see the error of beforeAll.');
    const producer = DEMO_USERS.find((u) => u.roles.includes('producer'))!;
    const context = await browser().newContext({ viewport: { width: 1280, height: 800 } });
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

  it('every screen, for the role that works it, has no serious or critical violation; each is kept as a screenshot', async () => {
    if (!baseUrl) throw new Error('LEGWORK_BASE_URL is not set; see the error of beforeAll.');
    const dir = `${screenshotDir}/screens`;
    mkdirSync(dir, { recursive: true });
    const found: string[] = [];
    const url = (path: string) => new URL(path, baseUrl).href;
    /** One screen: open it (a path or steps), let it settle, scan it, keep a full-page screenshot. */
    const check = async (page: Page, name: string, open: string | (() => Promise<void>)) => {
      if (typeof open === 'string') await page.goto(url(open));
      else await open();
      await page.getByRole('heading', { level: 1 }).first().waitFor({ timeout: 15_000 });
      await settle(page);
      found.push(...(await seriousViolations(page)).map((v) => `${name}: ${v}`));
      await page.screenshot({ path: `${dir}/${name}.png`, fullPage: true });
    };
    const as = async (role: string, walk: (page: Page, studioId: string) => Promise<void>) => {
      const user = DEMO_USERS.find((u) => (u.roles as readonly string[]).includes(role))!;
      const context = await browser().newContext({ viewport: { width: 1280, height: 800 } });
      const page = await context.newPage();
      try {
        await signIn(page, user.email);
        const [, studioId] = /\/s\/([^/?#]+)/.exec(page.url()) ?? [];
        await walk(page, studioId!);
      } finally {
        await context.close();
      }
    };

    // Before signing in.
    {
      const context = await browser().newContext({ viewport: { width: 1280, height: 800 } });
      const page = await context.newPage();
      try {
        await check(page, 'sign-in', '/sign-in');
        await check(page, 'forgot-password', '/forgot-password');
        await check(page, 'reset-password-no-token', '/reset-password');
        await check(page, 'invitation-unknown', '/invitations/not-a-real-invitation');
      } finally {
        await context.close();
      }
    }

    await as('studio_admin', async (page, studioId) => {
      await check(page, 'admin-home', `/s/${studioId}`);
      await check(page, 'venues', `/s/${studioId}/venues`);
      await check(page, 'members', `/s/${studioId}/members`);
      await check(page, 'audit', `/s/${studioId}/audit`);
      await check(page, 'tokens', `/s/${studioId}/tokens`);
      await check(page, 'releases', `/s/${studioId}/releases`);
      await check(page, 'release', async () => {
        await page
          .getByRole('table')
          .first()
          .getByRole('link', { name: /, take \d+$/ })
          .first()
          .click();
      });
      await check(page, 'account', '/account');
      await check(page, 'mailbox', '/mailbox');
      await check(page, 'not-found', `/s/${studioId}/no-such-page`);
    });

    await as('producer', async (page, studioId) => {
      await check(page, 'producer-home', `/s/${studioId}`);
      await check(page, 'tracks', `/s/${studioId}/tracks`);
    });

    await as('motion_engineer', async (page, studioId) => {
      await check(page, 'engineer-home', `/s/${studioId}`);
      await check(page, 'venue-base-editor', async () => {
        await page.goto(url(`/s/${studioId}/venues`));
        await page.getByRole('link', { name: 'Harbour Lights Dome' }).click();
        await page.getByRole('form', { name: 'Motion base of Harbour Lights Dome' }).waitFor();
      });
      await check(page, 'profiles', `/s/${studioId}/profiles`);
      await check(page, 'cueing-profile-editor', async () => {
        await page
          .getByRole('button', { name: /^New version of / })
          .first()
          .click();
        await page.getByRole('heading', { level: 1 }).first().waitFor();
      });
    });

    await as('safety_reviewer', async (page, studioId) => {
      await check(page, 'reviewer-home', `/s/${studioId}`);
      const api = (path: string) => url(`/api/studios/${studioId}${path}`);
      const tracks = trackPageSchema.parse(await (await page.request.get(api('/tracks'))).json());
      const demo = tracks.items.find((t) => t.title === DEMO_TRACK.title)!;
      const detail = trackDetailSchema.parse(
        await (await page.request.get(api(`/tracks/${demo.id}`))).json(),
      );
      await check(page, 'track', appPaths.track(studioId, demo.id));
      const dome = detail.runs.filter((r) => r.venueName === 'Harbour Lights Dome');
      const run = detail.runs.find((r) => (r.findingCount ?? 0) > 0) ?? detail.runs[0]!;
      await check(page, 'run', async () => {
        await page.goto(url(appPaths.run(studioId, run.id)));
        await page.getByTestId('base-view').locator('canvas').waitFor({ timeout: 20_000 });
      });
      await check(page, 'run-spectra-open', async () => {
        await page.locator('details', { hasText: 'Spectra' }).locator('summary').first().click();
        await page.locator('details[open] .uplot').first().waitFor({ timeout: 15_000 });
      });
      // The spectra, unfolded, are tall enough to read.
      const spectraHeight = await page
        .locator('details[open] .uplot')
        .first()
        .evaluate((el) => el.getBoundingClientRect().height);
      expect(spectraHeight).toBeGreaterThanOrEqual(200);
      // Two runs of one take (the comparison's purpose), at the dome where the demo has them.
      const byTake = new Map<string, string[]>();
      for (const r of detail.runs) byTake.set(r.takeId, [...(byTake.get(r.takeId) ?? []), r.id]);
      const pair =
        [...byTake.values()].find((ids) => ids.length >= 2)?.slice(0, 2) ?? dome.slice(0, 2).map((r) => r.id);
      await check(page, 'compare', async () => {
        await page.goto(url(appPaths.compareRuns(studioId, demo.id, pair)));
        await page.getByTestId('compare-charts').locator('canvas').first().waitFor({ timeout: 15_000 });
      });
      await check(page, 'budget-editor', async () => {
        await page.goto(url(`/s/${studioId}/profiles`));
        await page.getByRole('button', { name: 'New version of DEMO budget (invented values)' }).click();
        await page.getByTestId('budget-editor').locator('.uplot').first().waitFor({ timeout: 15_000 });
      });
      await check(page, 'reviewer-audit', `/s/${studioId}/audit`);
    });

    await as('venue_operator', async (page, studioId) => {
      await check(page, 'operator-home', `/s/${studioId}`);
      await check(page, 'operator-releases', `/s/${studioId}/releases`);
    });

    expect(found).toEqual([]);
  }, 240_000);
});
