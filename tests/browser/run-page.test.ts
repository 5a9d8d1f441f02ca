// A safety reviewer works through a demo run with findings on the run page, in the real built client in
// Chromium: a finding selected on the timeline, in the findings list or with the arrow keys brings
// every chart's time axis to that finding's span with a margin (read from the uPlot scale each chart
// exposes), its numbers are read out as the API gives them, the shared cursor's legend reads every
// band's value from the run's series, and "Show whole take" brings the whole take back.
import type { ConsoleMessage, Locator } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserForFile, screenshotDir, signIn } from './support/chromium';
import { DEMO_TRACK, DEMO_USERS } from '../../shared/demo';
import type { Finding } from '../../shared/schemas/findings';
import { runDetailSchema, trackDetailSchema, trackPageSchema } from '../../shared/schemas/pipeline';
import { runSeriesSchema } from '../../shared/schemas/run-series';

const baseUrl = process.env.LEGWORK_BASE_URL;
const reviewer = DEMO_USERS.find((u) => u.roles.includes('safety_reviewer'));
const browser = browserForFile();

/**
 * The window the page promises for a finding: its span with max(0.5 s, half the span) of context on
 * each side (the run page's rule, written out here again so a change to it is a deliberate one).
 */
function expectedWindow(f: Finding): { min: number; max: number } {
  const margin_s = Math.max(0.5, 0.5 * (f.end_s - f.start_s));
  return { min: f.start_s - margin_s, max: f.end_s + margin_s };
}

/** Every chart's x window as its uPlot scale reports it (data-x-min / data-x-max on the chart element). */
async function chartWindows(charts: Locator): Promise<{ chart: string; min: number; max: number }[]> {
  return charts.evaluateAll((els) =>
    els.map((el) => ({
      chart: el.getAttribute('data-chart') ?? '',
      min: Number(el.getAttribute('data-x-min')),
      max: Number(el.getAttribute('data-x-max')),
    })),
  );
}

/** Waits until every chart shows `want` (to 1 ms, the scale is set from these numbers). */
async function expectEveryChartAt(charts: Locator, want: { min: number; max: number }, what: string) {
  await expect
    .poll(
      async () =>
        (await chartWindows(charts)).filter(
          (w) => !(Math.abs(w.min - want.min) < 1e-3 && Math.abs(w.max - want.max) < 1e-3),
        ),
      { timeout: 10_000, message: `every chart at ${want.min}–${want.max} s (${what})` },
    )
    .toEqual([]);
}

/** The read-out's form of a value: four significant digits, as the page's legend and read-out print it. */
const four = (v: number) => String(Number(v.toPrecision(4)));

describe('run page', () => {
  it('brings every chart to a selected finding, reads out its numbers and the cursor, and shows the whole take again', async () => {
    if (!baseUrl || !reviewer) throw new Error('LEGWORK_BASE_URL is not set; see the error of beforeAll.');
    const context = await browser().newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const consoleErrors: string[] = [];
    page.on('console', (message: ConsoleMessage) => {
      if (message.type() === 'error') consoleErrors.push(`${message.text()} (${message.location().url})`);
    });
    page.on('pageerror', (error) => consoleErrors.push(`uncaught: ${error.message}`));
    try {
      await signIn(page, reviewer.email);
      const [, studioId] = /\/s\/([^/?#]+)/.exec(page.url()) ?? [];
      expect(studioId).toBeTruthy();
      const api = (path: string) => new URL(`/api/studios/${studioId}${path}`, baseUrl).href;

      // The demo track's hot cut: held for its hard finding (leg stroke in the drop) and with comfort findings.
      const tracks = trackPageSchema.parse(await (await page.request.get(api('/tracks'))).json());
      const track = tracks.items.find((t) => t.title === DEMO_TRACK.title);
      expect(track, `the demo track ${DEMO_TRACK.title}`).toBeDefined();
      const detail = trackDetailSchema.parse(
        await (await page.request.get(api(`/tracks/${track!.id}`))).json(),
      );
      const runs = await Promise.all(
        detail.runs
          .filter((r) => (r.findingCount ?? 0) > 1)
          .map(async (r) =>
            runDetailSchema.parse(await (await page.request.get(api(`/runs/${r.id}`))).json()),
          ),
      );
      const run = runs.find((r) => r.result?.findings.some((f) => f.severity === 'hard'));
      expect(run, 'a demo run with a hard finding').toBeDefined();
      const findings = run!.result!.findings;
      const series = runSeriesSchema.parse(
        await (await page.request.get(api(`/runs/${run!.id}/series`))).json(),
      );
      const whole = { min: series.time_s[0]!, max: series.time_s[series.time_s.length - 1]! };

      await page.goto(new URL(`/s/${studioId}/runs/${run!.id}`, baseUrl).href);
      await page.getByRole('heading', { name: 'Cue run', level: 1 }).waitFor();
      // The decision leads the page, with the findings beside it and the timeline below.
      await page.getByTestId('decision-panel').getByTestId('verdict').waitFor({ timeout: 15_000 });
      const timeline = page.getByTestId('take-timeline');
      await timeline.waitFor();
      expect(await timeline.locator('[data-finding]').count()).toBe(findings.length);
      const charts = page.getByTestId('run-charts').locator('[data-chart]');
      await page.getByTestId('run-charts').locator('canvas').nth(5).waitFor({ timeout: 15_000 });
      expect(await charts.count()).toBeGreaterThanOrEqual(6);
      // Large enough to read: every plot at least 260 px tall.
      for (const box of await page
        .getByTestId('run-charts')
        .locator('.uplot')
        .evaluateAll((els) => els.map((el) => el.getBoundingClientRect().height)))
        expect(box).toBeGreaterThanOrEqual(260);
      await expectEveryChartAt(charts, whole, 'the whole take at first');
      // Folded away until asked for.
      for (const name of ['Spectra', 'Comfort and motion sickness (ISO 2631-1)'])
        expect(await page.locator('details', { hasText: name }).first().getAttribute('open')).toBeNull();
      await page.screenshot({ path: `${screenshotDir}/run-page-1440.png`, fullPage: true });

      // 1. The hard finding, selected on the timeline.
      const hardIndex = findings.findIndex((f) => f.severity === 'hard');
      const hard = findings[hardIndex]!;
      await timeline.locator(`[data-finding="${hardIndex}"]`).click();
      await expectEveryChartAt(charts, expectedWindow(hard), `${hard.check} ${hard.subject}`);
      const readout = page.getByTestId('finding-readout');
      await expect
        .poll(() => readout.locator('[data-readout="value"]').textContent())
        .toContain(four(hard.value));
      expect(await readout.locator('[data-readout="limit"]').textContent()).toContain(four(hard.limit));
      expect(await readout.locator('[data-readout="ratio"]').textContent()).toContain(hard.ratio.toFixed(3));
      expect(await readout.locator('[data-readout="span"]').textContent()).toContain(
        `${hard.start_s.toFixed(3)}–${hard.end_s.toFixed(3)} s`,
      );
      expect(await readout.locator('[data-readout="check"]').textContent()).toMatch(/Leg \d/);
      await expect(readout.textContent()).resolves.toContain('Hard limit');
      await page.screenshot({ path: `${screenshotDir}/run-page-finding-1440.png` });

      // 2. The earliest finding, selected in the findings list, then the next one with the arrow key on the timeline.
      const byTime = findings
        .map((f, i) => ({ f, i }))
        .sort((a, b) => a.f.start_s - b.f.start_s || b.f.ratio - a.f.ratio);
      const first = byTime[0]!;
      await page
        .getByRole('table', { name: 'Findings' })
        .getByRole('button', {
          name: new RegExp(`${first.f.start_s.toFixed(2)}–${first.f.end_s.toFixed(2)} s$`),
        })
        .first()
        .click();
      await expectEveryChartAt(charts, expectedWindow(first.f), 'the earliest finding, from the list');
      await timeline.locator(`[data-finding="${first.i}"]`).focus();
      await page.keyboard.press('ArrowRight');
      const second = byTime[1]!;
      await expectEveryChartAt(charts, expectedWindow(second.f), 'the next finding, by the arrow key');
      await expect
        .poll(() => timeline.locator(`[data-finding="${second.i}"]`).getAttribute('aria-pressed'))
        .toBe('true');

      // 3. The shared cursor: hovering the leg chart reads every band of every chart at that bucket.
      const legs = page.locator('[data-chart="Leg lengths inside the stroke band"]');
      const over = legs.locator('.u-over');
      // In the middle of the screen, clear of the sticky chart toolbar.
      await over.evaluate((el) => el.scrollIntoView({ block: 'center' }));
      const box = (await over.boundingBox())!;
      await page.mouse.move(box.x + box.width * 0.3, box.y + box.height / 2);
      await page.mouse.move(box.x + box.width * 0.3 + 1, box.y + box.height / 2);
      const legsFigure = page.locator('figure', { has: legs });
      await expect.poll(() => legsFigure.getAttribute('data-cursor-index')).not.toBeNull();
      const index = Number(await legsFigure.getAttribute('data-cursor-index'));
      // The bucket under the pointer: 30 % across the window shown, within a bucket's width.
      const shown = expectedWindow(second.f);
      const pointer_s = shown.min + 0.3 * (shown.max - shown.min);
      const bucket_s = (series.time_s[1] ?? 0) - (series.time_s[0] ?? 0);
      expect(Math.abs(series.time_s[index]! - pointer_s)).toBeLessThanOrEqual(1.5 * bucket_s);
      await expect(page.getByTestId('cursor-readout').textContent()).resolves.toContain(
        `t = ${series.time_s[index]!.toFixed(3)} s`,
      );
      for (let leg = 0; leg < series.legs.length; leg++) {
        const text = (await legsFigure.locator(`[data-series="leg${leg + 1}"]`).textContent()) ?? '';
        expect(text.startsWith(four(series.legs[leg]!.min[index]!)), `leg${leg + 1} reads ${text}`).toBe(
          true,
        );
        expect(text).toContain(four(series.legs[leg]!.max[index]!));
      }
      // Every other chart follows the same cursor and reads a value for each of its bands.
      const figures = page.getByTestId('run-charts').locator('figure:has([data-chart])');
      const cursorIndices = await figures.evaluateAll((els) =>
        els.map((el) => el.getAttribute('data-cursor-index')),
      );
      expect(new Set(cursorIndices)).toEqual(new Set([String(index)]));
      const cuedZ = (await page
        .locator('figure', { has: page.locator('[data-chart="Specific force z (heave)"]') })
        .locator('[data-series="cued (seat 1)"]')
        .textContent())!;
      expect(cuedZ.startsWith(four(series.force.z.cued.min[index]!))).toBe(true);
      await page.screenshot({ path: `${screenshotDir}/run-page-cursor-1440.png` });

      // 4. The whole take again.
      await page.getByRole('button', { name: 'Show whole take' }).click();
      await expectEveryChartAt(charts, whole, 'the whole take again');
      await expect(readout.textContent()).resolves.toContain('No finding selected');
      expect(await timeline.locator('[aria-pressed="true"]').count()).toBe(0);

      // The same page 1024 px wide: the decision still first, the charts still tall enough to read.
      await page.setViewportSize({ width: 1024, height: 800 });
      await timeline.locator(`[data-finding="${hardIndex}"]`).click();
      await expectEveryChartAt(charts, expectedWindow(hard), 'at 1024 px');
      for (const h of await page
        .getByTestId('run-charts')
        .locator('.uplot')
        .evaluateAll((els) => els.map((el) => el.getBoundingClientRect().height)))
        expect(h).toBeGreaterThanOrEqual(260);
      await page.screenshot({ path: `${screenshotDir}/run-page-1024.png`, fullPage: true });
    } finally {
      await context.close();
    }
    expect(consoleErrors).toEqual([]);
  });
});
