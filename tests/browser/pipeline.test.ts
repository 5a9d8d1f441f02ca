// A producer takes a track from nothing to a finished cue run through the real built client in
// Chromium: create the track, upload a refused take and a good one, queue runs for both venues, wait
// for the worker, and read the run page's charts and budget, with no error in the browser console.
import type { ConsoleMessage } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserForFile, screenshotDir, signIn } from './support/chromium';
import { gentleVehicleCsv } from './support/takes';
import { DEMO_USERS } from '../../shared/demo';
import { runDetailSchema } from '../../shared/schemas/pipeline';
import { runSeriesSchema } from '../../shared/schemas/run-series';

const baseUrl = process.env.LEGWORK_BASE_URL;
const BAD_FILE = 'reef-dive-bad.csv';

/** The same take with a word where a number belongs on data line 12 (file line 13), column 4. */
function badVehicleCsv(): string {
  const lines = gentleVehicleCsv(1).trimEnd().split('\n');
  const cells = (lines[12] ?? '').split(',');
  cells[3] = 'abc';
  lines[12] = cells.join(',');
  return `${lines.join('\n')}\n`;
}

const producer = DEMO_USERS.find((u) => u.roles.includes('producer'));
const browser = browserForFile();

describe('pipeline screens', () => {
  it('a producer creates a track, uploads takes, queues runs and reads a finished run', async () => {
    if (!baseUrl || !producer) throw new Error('LEGWORK_BASE_URL is not set; see the error of beforeAll.');
    const context = await browser().newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    const consoleErrors: string[] = [];
    page.on('console', (message: ConsoleMessage) => {
      if (message.type() !== 'error') return;
      const where = message.location().url;
      // Chromium logs every 4xx answer as a console error; the refused take below is the one 400 this
      // test asks for on purpose, so only that answer is let through.
      if (/status of 400/.test(message.text()) && where.includes(`fileName=${BAD_FILE}`)) return;
      consoleErrors.push(`${message.text()} (${where})`);
    });
    page.on('pageerror', (error) => consoleErrors.push(`uncaught: ${error.message}`));

    try {
      await signIn(page, producer.email);
      await page
        .getByRole('navigation', { name: 'Studio pages' })
        .getByRole('link', { name: 'Tracks' })
        .click();
      await page.getByRole('heading', { name: 'Tracks', level: 1 }).waitFor();

      const title = `Lantern Reef dive ${Date.now()}`;
      await page.getByLabel('Track title').fill(title);
      await page.getByLabel('Ride film').fill('The Lantern Reef (fictional)');
      await page.getByRole('button', { name: 'Create track' }).click();
      await page.getByRole('heading', { name: title, level: 1 }).waitFor({ timeout: 15_000 });

      // A refused file: the server's message names the line and the column, and it is shown as sent.
      const fileInput = page.getByLabel('Take file (.csv or .csv.gz)');
      await fileInput.setInputFiles({
        name: BAD_FILE,
        mimeType: 'text/csv',
        buffer: Buffer.from(badVehicleCsv()),
      });
      await page.getByRole('button', { name: 'Upload take' }).click();
      const refusal = page.getByRole('form', { name: 'Upload a take' }).getByRole('alert');
      await refusal.waitFor({ timeout: 15_000 });
      const refusalText = (await refusal.textContent()) ?? '';
      expect(refusalText).toContain(BAD_FILE);
      expect(refusalText).toMatch(/line \d+, column \d+/);
      await expect(page.getByText('No takes yet.', { exact: false }).isVisible()).resolves.toBe(true);

      await fileInput.setInputFiles({
        name: 'reef-dive.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from(gentleVehicleCsv()),
      });
      await page.getByRole('button', { name: 'Upload take' }).click();
      await page.getByText(/^Take 1 stored: reef-dive\.csv, 2001 samples\.$/).waitFor({ timeout: 30_000 });
      await expect(
        page.getByRole('progressbar', { name: 'Upload progress' }).getAttribute('aria-valuenow'),
      ).resolves.toBe('100');
      await page.getByRole('table', { name: 'Takes' }).getByText('reef-dive.csv').waitFor();

      await page.getByRole('button', { name: 'Cue for venues' }).click();
      const cueForm = page.getByRole('form', { name: 'Cue take 1 for venues' });
      for (const box of await cueForm.getByRole('checkbox').all()) await box.check();
      expect(await cueForm.getByRole('checkbox').count()).toBe(2);
      await cueForm.getByRole('button', { name: 'Queue cue runs' }).click();
      await cueForm.getByText('2 runs queued for take 1.').waitFor({ timeout: 15_000 });

      // The page polls every second while a run is queued or cueing; wait for a finished state.
      const finishedRow = page
        .getByRole('table', { name: /^Runs at / })
        .getByRole('row')
        .filter({ hasText: /Awaiting review|Held by budget|Failed/ })
        .first();
      await finishedRow.waitFor({ timeout: 90_000 });
      await page.screenshot({ path: `${screenshotDir}/track-page.png`, fullPage: true });
      await finishedRow.getByRole('link', { name: /^Open run/ }).click();

      await page.getByRole('heading', { name: 'Cue run', level: 1 }).waitFor();
      const failed = await page.getByText('This run failed.').isVisible();
      expect(failed ? await page.getByRole('alert').first().textContent() : 'not failed').toBe('not failed');
      await page.getByRole('table', { name: 'Budget uses, largest first' }).waitFor({ timeout: 15_000 });
      const canvases = page.getByTestId('run-charts').locator('canvas');
      await canvases.nth(5).waitFor({ timeout: 15_000 });
      // Three force charts, two pose charts and the legs chart.
      expect(await page.getByTestId('run-charts').locator('.uplot').count()).toBe(6);
      // The last cued sample is drawn at the end of the ramp out after the take: the chart's last finite
      // sample of each cued force band and of every leg lies within one bucket of the take's duration
      // plus the venue's ramp out (the take starts at 0 s). The run and its series come from the same API the page reads, parsed with its schemas.
      const [, studioId, runId] = /\/s\/([^/]+)\/runs\/([^/?#]+)/.exec(page.url()) ?? [];
      const apiBase = new URL(`/api/studios/${studioId}/runs/${runId}`, baseUrl).href;
      const run = runDetailSchema.parse(await (await page.request.get(apiBase)).json());
      const series = runSeriesSchema.parse(await (await page.request.get(`${apiBase}/series`)).json());
      const end_s = run.take.duration_s + (run.ramp?.out_s ?? 0);
      // Buckets are of equal width from the first sample on.
      const bucket_s = (series.time_s[1] ?? Number.NaN) - (series.time_s[0] ?? Number.NaN);
      expect(bucket_s).toBeGreaterThan(0);
      expect(end_s).toBeGreaterThan(19);
      const lastXOf = async (chart: string, band: string) => {
        const el = page.locator(`[data-chart="${chart}"]`);
        const labels = ((await el.getAttribute('data-bands')) ?? '').split('|');
        const lastX = ((await el.getAttribute('data-last-x')) ?? '').split(' ');
        const k = labels.indexOf(band);
        expect(k, `${band} on ${chart}`).toBeGreaterThanOrEqual(0);
        return Number(lastX[k]);
      };
      for (const axis of ['x (surge)', 'y (sway)', 'z (heave)']) {
        const last = await lastXOf(`Specific force ${axis}`, 'cued (seat 1)');
        expect(Math.abs(last - end_s), `cued ${axis} ends at ${last} s`).toBeLessThanOrEqual(bucket_s);
      }
      expect(series.legs.length).toBeGreaterThan(0);
      for (let i = 1; i <= series.legs.length; i++) {
        const last = await lastXOf('Leg lengths inside the stroke band', `leg${i}`);
        expect(Math.abs(last - end_s), `leg${i} ends at ${last} s`).toBeLessThanOrEqual(bucket_s);
      }
      // The spectra file is drawn too, on a log axis, in its section folded away below the charts.
      await page.locator('summary', { hasText: 'Spectra' }).click();
      await page.getByText('Power spectral density up to 5 Hz').waitFor({ timeout: 15_000 });
      // The 3-D preview draws with three.js once it has loaded; its slider moves the instant shown.
      const preview = page.getByTestId('base-preview');
      await preview.locator('canvas[data-engine^="three.js"]').waitFor({ timeout: 15_000 });
      await preview.getByRole('slider').fill('1000');
      await preview.getByText('10.00 s').waitFor();
      const rows = await page
        .getByRole('table', { name: 'Budget uses, largest first' })
        .getByRole('row')
        .count();
      expect(rows).toBeGreaterThan(1);
      await page.waitForLoadState('networkidle');
      await page.screenshot({ path: `${screenshotDir}/run-page.png`, fullPage: true });
      // The run's times read in the venue's own zone, labelled with it.
      await expect(
        page
          .getByText(/Europe\/|America\/|Asia\/|Australia\/|UTC/)
          .first()
          .isVisible(),
      ).resolves.toBe(true);

      // The tracks table with the runs just made, as a producer sees it.
      await page.goto(page.url().replace(/\/runs\/[^/]+$/, '/tracks'));
      const tracksTable = page.getByRole('table', { name: /Tracks/ });
      await tracksTable.waitFor({ timeout: 15_000 });
      await page.waitForLoadState('networkidle');
      await page.screenshot({ path: `${screenshotDir}/tracks-table.png`, fullPage: true });
    } finally {
      await context.close();
    }
    expect(consoleErrors).toEqual([]);
  });
});
