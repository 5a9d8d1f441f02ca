// A producer compares two runs of one take from the demo track: the first cut cued for both venues.
// The track page offers the comparison only for runs of one take, and the comparison names both runs,
// overlays both in every chart's read-out, sets both columns in the budget table and keeps the caution.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { ConsoleMessage, Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserForFile, screenshotDir, signIn } from './support/chromium';
import { DEMO_TRACK, DEMO_USERS } from '../../shared/demo';
import { z } from 'zod';
import { appPaths } from '../../shared/app-paths';
import { runSummarySchema, trackDetailSchema } from '../../shared/schemas/pipeline';
import { CAUTION_TEXT } from '../../src/components/layout/caution-strip';

const baseUrl = process.env.LEGWORK_BASE_URL;
const producer = DEMO_USERS.find((u) => u.roles.includes('producer'));
const browser = browserForFile();
const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

/** axe-core's (Deque's WCAG 2.1 A/AA rules) serious and critical violations on the page as it is now. */
async function seriousViolations(page: Page): Promise<string[]> {
  await page.evaluate(axeSource);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (o: unknown) => Promise<{ violations: unknown[] }> } })
      .axe;
    const r = await axe.run({
      runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] },
    });
    return r.violations;
  });
  return (violations as { id: string; impact: string | null; nodes: { target: string[] }[] }[])
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map(
      (v) =>
        `${v.impact} ${v.id} at ${v.nodes
          .map((n) => n.target.join(' '))
          .slice(0, 3)
          .join('; ')}`,
    );
}

describe('run comparison', () => {
  it('compares the first cut at both venues from the track page', async () => {
    if (!baseUrl || !producer) throw new Error('LEGWORK_BASE_URL is not set; see the error of beforeAll.');
    const context = await browser().newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const consoleErrors: string[] = [];
    page.on('console', (message: ConsoleMessage) => {
      if (message.type() === 'error') consoleErrors.push(`${message.text()} (${message.location().url})`);
    });
    page.on('pageerror', (error) => consoleErrors.push(`uncaught: ${error.message}`));
    try {
      await signIn(page, producer.email);
      await page
        .getByRole('navigation', { name: 'Studio pages' })
        .getByRole('link', { name: 'Tracks' })
        .click();
      await page.getByRole('link', { name: DEMO_TRACK.title }).first().click();
      await page.getByRole('heading', { name: DEMO_TRACK.title, level: 1 }).waitFor({ timeout: 15_000 });
      const [, studioId, trackId] = /\/s\/([^/]+)\/tracks\/([^/?#]+)/.exec(page.url()) ?? [];
      const track = trackDetailSchema.parse(
        await (
          await page.request.get(new URL(`/api/studios/${studioId}/tracks/${trackId}`, baseUrl).href)
        ).json(),
      );
      // The seeded runs are the oldest of take 1 at each venue (a later walk may add a touch-up run).
      const take1 = track.runs
        .filter((r) => r.takeNumber === 1)
        .sort((a, b) => a.createdAt.localeCompare(b.createdAt));
      const dome = take1.find((r) => r.venueName === 'Harbour Lights Dome');
      const arcade = take1.find((r) => r.venueName === 'Tidewater Arcade');
      const otherTake = track.runs.find((r) => r.takeNumber !== 1 && r.venueName === 'Harbour Lights Dome');
      if (!dome || !arcade || !otherTake)
        throw new Error('The demo track lacks the first cut at both venues.');

      const compare = page.getByRole('button', { name: 'Compare selected' });
      const reason = page.getByRole('group', { name: 'Compare runs' });
      // A run's checkbox, by the row that links to the run.
      const box = (runId: string) =>
        page
          .locator('tr', { has: page.locator(`a[href$="/runs/${runId}"]`) })
          .getByRole('checkbox', { name: /^Select run of take \d+ at / });
      expect(await compare.isDisabled()).toBe(true);

      // Runs of two takes: refused, and the reason is said.
      await box(dome.id).check();
      await box(otherTake.id).check();
      expect(await compare.isDisabled()).toBe(true);
      expect(await reason.textContent()).toContain('different takes');
      await box(otherTake.id).uncheck();

      await box(arcade.id).check();
      expect(await compare.isEnabled()).toBe(true);
      expect(await reason.textContent()).toContain('Compare 2 runs of take 1.');
      await page.screenshot({ path: `${screenshotDir}/compare-track-selection.png`, fullPage: true });
      await compare.click();

      await page.getByRole('heading', { name: 'Compare runs', level: 1 }).waitFor();
      expect(new URL(page.url()).searchParams.get('runs')).toBe(`${dome.id},${arcade.id}`);
      const cards = page.getByRole('list', { name: 'Compared runs' }).getByRole('listitem');
      await cards.nth(1).waitFor({ timeout: 15_000 });
      expect(await cards.count()).toBe(2);
      expect(await cards.nth(0).getAttribute('aria-label')).toBe('Run A: take 1 at Harbour Lights Dome');
      expect(await cards.nth(1).getAttribute('aria-label')).toBe('Run B: take 1 at Tidewater Arcade');
      for (const card of await cards.all())
        expect(await card.textContent()).toMatch(/Cueing.*Budget.*Verdict/);

      const charts = page.getByTestId('compare-charts');
      await charts.locator('canvas').first().waitFor({ timeout: 15_000 });
      // Three force charts and the pose axes both bases have, each with one line pair per run.
      const figures = charts.locator('[data-chart]');
      expect(await figures.count()).toBeGreaterThanOrEqual(4);
      for (const figure of await figures.all())
        expect(await figure.getAttribute('data-runs')).toBe('Run A|Run B');
      // Different bases: the legs are not overlaid, and the page says why.
      expect(await charts.getByRole('note', { name: 'Not compared' }).textContent()).toContain(
        'different motion bases',
      );

      // The shared cursor: hovering one chart gives every chart a value for both runs.
      const firstCanvas = charts.locator('.uplot .u-over').first();
      const boxAt = await firstCanvas.boundingBox();
      if (!boxAt) throw new Error('The first chart has no box.');
      await page.mouse.move(boxAt.x + boxAt.width * 0.4, boxAt.y + boxAt.height / 2);
      const readout = page.getByRole('list', { name: 'Seat specific force z (heave): values at the cursor' });
      await readout.getByText(/ s$/).waitFor();
      const items = await readout.getByRole('listitem').allTextContents();
      expect(items[0]).toMatch(/^Run A.*-?\d+\.\d+ .*m\/s²$/);
      expect(items[1]).toMatch(/^Run B.*-?\d+\.\d+ .*m\/s²$/);
      // The far chart (another axis) follows the same cursor.
      const surge = page.getByRole('list', { name: 'Seat specific force x (surge): values at the cursor' });
      expect((await surge.getByRole('listitem').allTextContents())[1]).toMatch(/^Run B.*m\/s²$/);

      const budget = page.getByRole('table', { name: 'Budget uses side by side' });
      const headers = await budget.locator('thead th').allTextContents();
      expect(headers.slice(3)).toEqual(['Run Atake 1, Harbour Lights Dome', 'Run Btake 1, Tidewater Arcade']);
      expect(await budget.locator('tbody tr').first().getByRole('meter').count()).toBe(2);
      expect(await budget.locator('[data-findings="Run A"]').textContent()).toMatch(/\d+ hard, \d+ comfort/);
      expect(await budget.locator('[data-findings="Run B"]').textContent()).toMatch(/\d+ hard, \d+ comfort/);
      expect(await page.getByRole('note', { name: 'Run caution' }).textContent()).toContain(CAUTION_TEXT);

      expect(await seriousViolations(page)).toEqual([]);
      await page.screenshot({ path: `${screenshotDir}/compare-1440.png`, fullPage: true });
      await page.setViewportSize({ width: 1024, height: 800 });
      await page.mouse.move(0, 0);
      await page.waitForTimeout(300);
      await page.screenshot({ path: `${screenshotDir}/compare-1024.png`, fullPage: true });
      expect(consoleErrors).toEqual([]);
    } finally {
      await context.close();
    }
  }, 120_000);

  it('overlays the legs of two runs at one venue: the first cut with and without a heave touch-up', async () => {
    if (!baseUrl || !producer) throw new Error('LEGWORK_BASE_URL is not set; see the error of beforeAll.');
    const context = await browser().newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const consoleErrors: string[] = [];
    page.on('console', (message: ConsoleMessage) => {
      if (message.type() === 'error') consoleErrors.push(`${message.text()} (${message.location().url})`);
    });
    page.on('pageerror', (error) => consoleErrors.push(`uncaught: ${error.message}`));
    try {
      await signIn(page, producer.email);
      await page
        .getByRole('navigation', { name: 'Studio pages' })
        .getByRole('link', { name: 'Tracks' })
        .click();
      await page.getByRole('link', { name: DEMO_TRACK.title }).first().click();
      await page.getByRole('heading', { name: DEMO_TRACK.title, level: 1 }).waitFor({ timeout: 15_000 });
      const [, studioId, trackId] = /\/s\/([^/]+)\/tracks\/([^/?#]+)/.exec(page.url()) ?? [];
      const trackUrl = new URL(`/api/studios/${studioId}/tracks/${trackId}`, baseUrl).href;
      const readTrack = async () => trackDetailSchema.parse(await (await page.request.get(trackUrl)).json());
      const first = (await readTrack()).runs
        .filter((r) => r.takeNumber === 1 && r.venueName === 'Harbour Lights Dome')
        .sort((a, b) => a.createdAt.localeCompare(b.createdAt))[0];
      if (!first) throw new Error('The demo track lacks the first cut at the dome.');
      // A second run of the same take at the same venue, asked for as the cue form does (the same
      // request again returns the same run, so the walk can be repeated).
      const csrf = (await (await page.request.get(new URL('/api/auth/csrf', baseUrl).href)).json()) as {
        csrfToken: string;
      };
      const asked = await page.request.post(
        new URL(`/api/studios/${studioId}/takes/${first.takeId}/runs`, baseUrl).href,
        {
          headers: { 'x-csrf-token': csrf.csrfToken },
          data: { venueIds: [first.venueId], touchup: { gain: { fz: 0.8 } } },
        },
      );
      expect(asked.status()).toBeLessThan(300);
      const [second] = z.array(runSummarySchema).parse(await asked.json());
      if (!second) throw new Error('No run was queued.');
      expect(second.id).not.toBe(first.id);
      await expect
        .poll(async () => (await readTrack()).runs.find((r) => r.id === second.id)?.state, {
          timeout: 90_000,
        })
        .toMatch(/awaiting_review|held_by_budget|held|cleared/);

      await page.goto(
        new URL(appPaths.compareRuns(studioId ?? '', trackId ?? '', [first.id, second.id]), baseUrl).href,
      );
      const cards = page.getByRole('list', { name: 'Compared runs' }).getByRole('listitem');
      await cards.nth(1).waitFor({ timeout: 15_000 });
      expect(await cards.nth(1).textContent()).toContain('fz × 0.8');
      const charts = page.getByTestId('compare-charts');
      await charts.locator('canvas').first().waitFor({ timeout: 15_000 });
      // One base: all six pose axes and the six legs are overlaid, nothing is left out.
      const titles = await charts
        .locator('[data-chart]')
        .evaluateAll((els) => els.map((e) => e.getAttribute('data-chart')));
      expect(titles.filter((t) => t?.startsWith('Platform'))).toHaveLength(6);
      expect(titles.filter((t) => /^Leg \d length$/.test(t ?? ''))).toHaveLength(6);
      expect(await charts.getByRole('note', { name: 'Not compared' }).count()).toBe(0);
      // Actuator rows carry their change from Run A on one base.
      const budget = page.getByRole('table', { name: 'Budget uses side by side' });
      const strokeRow = budget.locator('tbody tr').filter({ hasText: 'Leg stroke' }).first();
      expect(await strokeRow.locator('td').nth(4).textContent()).toMatch(/[▲▼=] [+−]?\d\.\d\d/);
      await page.screenshot({ path: `${screenshotDir}/compare-one-venue-1440.png`, fullPage: true });
      expect(consoleErrors).toEqual([]);
    } finally {
      await context.close();
    }
  }, 180_000);
});
