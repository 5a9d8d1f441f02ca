// A motion engineer edits a cueing profile through the real built client in Chromium: the live preview
// (Web Workers running the shared motion code) computes on a demo take and venue, a changed tilt angle
// limit changes the preview's peak pitch, a bad value is named beside its field, the take's own file
// can be opened for the full take, and saving makes a new version of the profile.
import type { ConsoleMessage, Locator, Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserForFile, screenshotDir, signIn } from './support/chromium';
import { DEMO_TRACK, DEMO_USERS } from '../../shared/demo';
import { demoRideCsv } from '../../shared/demo-ride';
import { profileSchema } from '../../shared/schemas/pipeline';

const baseUrl = process.env.LEGWORK_BASE_URL;
const engineer = DEMO_USERS.find((u) => u.roles.includes('motion_engineer'));
const browser = browserForFile();

/** The preview's state once its newest computation is shown (data attributes on the section). */
async function readPreview(preview: Locator) {
  return {
    state: await preview.getAttribute('data-state'),
    generation: Number(await preview.getAttribute('data-generation')),
    pitch: await preview.getAttribute('data-peak-pitch-deg'),
  };
}

async function cueingVersions(page: Page, studioId: string): Promise<number> {
  const body: unknown = await page.evaluate(async (id) => {
    const r = await fetch(`/api/studios/${id}/profiles?kind=cueing`);
    return r.json();
  }, studioId);
  return profileSchema
    .array()
    .parse(body)
    .reduce((n, p) => n + p.versions.length, 0);
}

describe('cueing profile editor', () => {
  it('previews a change live and saves it as a new version', async () => {
    if (!baseUrl || !engineer) throw new Error('LEGWORK_BASE_URL is not set; see the error of beforeAll.');
    const context = await browser().newContext({ viewport: { width: 1600, height: 1000 } });
    const page = await context.newPage();
    const consoleErrors: string[] = [];
    page.on('console', (message: ConsoleMessage) => {
      if (message.type() === 'error') consoleErrors.push(`${message.text()} (${message.location().url})`);
    });
    page.on('pageerror', (error) => consoleErrors.push(`uncaught: ${error.message}`));
    try {
      await signIn(page, engineer.email);
      const studioId = /\/s\/([0-9a-f-]{36})/.exec(page.url())?.[1];
      expect(studioId).toBeDefined();
      await page
        .getByRole('navigation', { name: 'Studio pages' })
        .getByRole('link', { name: 'Profiles' })
        .click();
      await page
        .getByRole('button', { name: /^New version of / })
        .first()
        .click();
      const form = page.getByRole('form', { name: /^New version of / });
      await form.waitFor();
      const preview = page.getByRole('region', { name: 'Live preview' });
      await preview.getByLabel('Track').selectOption({ label: DEMO_TRACK.title });
      await preview.getByLabel('Venue (motion base)').selectOption({ label: 'Harbour Lights Dome' });
      // The first computation, from the latest run's chart series of the newest vehicle take.
      await expect.poll(async () => (await readPreview(preview)).state, { timeout: 60_000 }).toBe('ready');
      await expect(preview.getByText(/^Samples: Run of take \d+/).isVisible()).resolves.toBe(true);
      const before = await readPreview(preview);
      expect(before.pitch).not.toBeNull();
      // The budget's checks follow from the second worker.
      await expect
        .poll(() => preview.getByRole('region', { name: 'Budget use' }).getAttribute('data-checks'), {
          timeout: 60_000,
        })
        .toBe('done');
      await page.screenshot({ path: `${screenshotDir}/profile-editor-before.png`, fullPage: true });

      // Half the tilt angle limit: the tilt coordination (the pitch that renders sustained surge) can
      // no longer reach the angle it had, so the peak pitch read-out drops.
      const angle = form.getByRole('group', { name: 'Tilt coordination' }).getByLabel(/^Angle limit/);
      const limit = Number(await angle.inputValue());
      expect(limit).toBeGreaterThan(0);
      await angle.fill(String(limit / 2));
      await expect
        .poll(
          async () => {
            const now = await readPreview(preview);
            return now.state === 'ready' && now.generation > before.generation ? now.pitch : null;
          },
          { timeout: 30_000 },
        )
        .not.toBeNull();
      const after = await readPreview(preview);
      expect(Number(after.pitch)).toBeLessThan(Number(before.pitch));
      await expect(preview.getByText(/computed in \d+ ms/).isVisible()).resolves.toBe(true);

      // A value the schema refuses is named beside its field, and nothing can be saved.
      const breakField = form
        .getByRole('group', { name: 'Translational high-pass, x (surge)' })
        .getByLabel(/^Break frequency/);
      await breakField.fill('-1');
      const problem = form.locator('[data-field="translational.x.breakFrequency_radps"]');
      await expect(problem.getByText(/greater than 0|too small/i).isVisible()).resolves.toBe(true);
      await expect(form.getByRole('button', { name: 'Save as new version' }).isDisabled()).resolves.toBe(
        true,
      );
      await page.screenshot({ path: `${screenshotDir}/profile-editor-problem.png`, fullPage: true });
      await breakField.fill('0.8');

      // The take's own file, read in the browser: the full 100 Hz take, recognised by its SHA-256.
      const cut = DEMO_TRACK.takes[DEMO_TRACK.takes.length - 1]!;
      const generation = (await readPreview(preview)).generation;
      await preview.getByLabel('or open a take file from disk:').setInputFiles({
        name: cut.file,
        mimeType: 'text/csv',
        buffer: Buffer.from(
          demoRideCsv({
            duration_s: cut.duration_s,
            rate_hz: cut.rate_hz,
            intensity: cut.intensity,
            bumps: cut.bumps,
          }),
        ),
      });
      await expect
        .poll(async () => preview.getByText('SHA-256 matches').count(), { timeout: 30_000 })
        .toBe(1);
      await expect
        .poll(
          async () => {
            const now = await readPreview(preview);
            return now.state === 'ready' && now.generation > generation;
          },
          { timeout: 30_000 },
        )
        .toBe(true);

      // The same take fetched from Legwork's store (GET .../takes/:take/file) instead of from disk.
      await preview.getByRole('button', { name: /^Load take \d+’s file from Legwork/ }).click();
      await expect
        .poll(
          async () =>
            preview.getByText(/loaded from Legwork and read in the browser.*SHA-256 matches/).count(),
          {
            timeout: 30_000,
          },
        )
        .toBe(1);

      const versionsBefore = await cueingVersions(page, studioId!);
      await form
        .getByLabel('Note (what changed and why)')
        .fill(`Tilt angle limit ${limit / 2} deg, from the preview walk`);
      await form.getByRole('button', { name: 'Save as new version' }).click();
      await form.getByText(/^Saved as .+ v\d+\.$/).waitFor({ timeout: 15_000 });
      expect(await cueingVersions(page, studioId!)).toBe(versionsBefore + 1);
      // Cueing the take again with it is one button, named after the take, the venue and the version.
      await expect(
        form.getByRole('button', { name: /^Cue take \d+ at Harbour Lights Dome with v\d+$/ }).isVisible(),
      ).resolves.toBe(true);
      await page.screenshot({ path: `${screenshotDir}/profile-editor-saved.png`, fullPage: true });
      expect(consoleErrors).toEqual([]);
    } finally {
      await context.close();
    }
  });
});
