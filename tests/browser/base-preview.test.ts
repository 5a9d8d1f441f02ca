// The run page's 3-D view of the motion base in the real built client in Chromium, checked on what it
// draws: every frame stamps the instant and pose it shows, and the platform's centroid as placed in the
// scene, onto the view's element (data-pose-*, data-platform-centroid-mm). Scrubbing a chart moves the
// platform to the pose the run's series gives for that bucket (and the canvas's pixels change); Play
// moves the marked instant across the charts; the arrow keys turn the camera on the focused canvas; a
// take's proxy video (a WebM recorded from a canvas by Chromium's own MediaRecorder, uploaded through
// the API) seeks to motion time + film offset when a chart is scrubbed, and plays in step.
import type { Locator, Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { browserForFile, openSignedIn, screenshotDir } from './support/chromium';
import { gentleVehicleCsv } from './support/takes';
import { DEMO_TRACK, DEMO_USERS } from '../../shared/demo';
import { parseMotionBase } from '../../shared/schemas/motion-base';
import {
  runDetailSchema,
  runSummarySchema,
  trackDetailSchema,
  trackPageSchema,
  uploadedTakeSchema,
  venueDetailSchema,
} from '../../shared/schemas/pipeline';
import { runSeriesSchema } from '../../shared/schemas/run-series';
import type { RunSeries } from '../../shared/schemas/run-series';

const baseUrl = process.env.LEGWORK_BASE_URL;
const reviewer = DEMO_USERS.find((u) => u.roles.includes('safety_reviewer'))!;
const producer = DEMO_USERS.find((u) => u.roles.includes('producer'))!;
const browser = browserForFile();

/** A page signed in as `email` in a context of its own. */
const openPage = (email: string) => openSignedIn(browser(), email);

/** The middle of bucket `i` of a pose band, as the page computes the pose it draws. */
const mid = (band: { min: (number | null)[]; max: (number | null)[] } | undefined, i: number) =>
  band ? ((band.min[i] ?? 0) + (band.max[i] ?? 0)) / 2 : 0;

/** Hovers `chart` (a [data-chart] element) at motion time `t_s`, from the x window it reports. */
async function hoverAt(page: Page, chart: Locator, t_s: number): Promise<number> {
  const over = chart.locator('.u-over');
  await over.evaluate((el) => el.scrollIntoView({ block: 'center' }));
  const min = Number(await chart.getAttribute('data-x-min'));
  const max = Number(await chart.getAttribute('data-x-max'));
  const box = (await over.boundingBox())!;
  const x = box.x + ((t_s - min) / (max - min)) * box.width;
  await page.mouse.move(x - 2, box.y + box.height / 2);
  await page.mouse.move(x, box.y + box.height / 2);
  const figure = page.locator('figure', { has: chart });
  await expect.poll(() => figure.getAttribute('data-cursor-index')).not.toBeNull();
  // Off every chart, so scrolling for a screenshot cannot move the cursor.
  const index = Number(await figure.getAttribute('data-cursor-index'));
  await page.mouse.move(4, 4);
  return index;
}

/** Waits until the 3-D view has drawn bucket `i` of `series`; returns what it stamped. */
async function waitForDrawn(page: Page, series: RunSeries, i: number) {
  const t = series.time_s[i]!;
  await page.waitForFunction(
    (want) => {
      const el = document.querySelector('[data-testid="base-view"]');
      return el !== null && Math.abs(Number(el.getAttribute('data-pose-t')) - want) < 1e-9;
    },
    t,
    { timeout: 10_000 },
  );
  return page.getByTestId('base-view').evaluate((el) => ({
    heave_mm: Number(el.getAttribute('data-pose-heave-mm')),
    surge_mm: Number(el.getAttribute('data-pose-surge-mm')),
    centroid_mm: (el.getAttribute('data-platform-centroid-mm') ?? '').split(' ').map(Number),
    frames: Number(el.getAttribute('data-frames')),
  }));
}

async function csrfHeader(page: Page): Promise<Record<string, string>> {
  const r = (await (await page.request.get(new URL('/api/auth/csrf', baseUrl).href)).json()) as {
    csrfToken: string;
  };
  return { 'x-csrf-token': r.csrfToken };
}

describe('3-D view of the run', () => {
  it('scrubbing a chart moves the platform, Play moves the marked instant on the charts, arrow keys turn the view', async () => {
    const { page, errors, close } = await openPage(reviewer.email);
    try {
      const [, studioId] = /\/s\/([^/?#]+)/.exec(page.url()) ?? [];
      const api = (path: string) => new URL(`/api/studios/${studioId}${path}`, baseUrl).href;
      const tracks = trackPageSchema.parse(await (await page.request.get(api('/tracks'))).json());
      const track = tracks.items.find((t) => t.title === DEMO_TRACK.title)!;
      const detail = trackDetailSchema.parse(
        await (await page.request.get(api(`/tracks/${track.id}`))).json(),
      );
      const summary = detail.runs.find(
        (r) => r.venueName === 'Harbour Lights Dome' && (r.findingCount ?? 0) > 0,
      )!;
      expect(summary, 'a finished demo run at the dome').toBeDefined();
      const series = runSeriesSchema.parse(
        await (await page.request.get(api(`/runs/${summary.id}/series`))).json(),
      );
      const venue = venueDetailSchema.parse(
        await (await page.request.get(api(`/venues/${summary.venueId}`))).json(),
      );
      const base = parseMotionBase(venue.base);
      if (base.kind !== 'hexapod') throw new Error('The dome is a hexapod in the demo.');
      // The demo's platform joints are centred on the platform origin (z = 0), so the centroid the
      // scene draws is the platform origin: (x, y, h0 + z) of the pose (docs/motion-conventions.md).
      const n = base.platformJoints_m.length;
      const jointCentre = [0, 1, 2].map((k) => base.platformJoints_m.reduce((s, j) => s + j[k]!, 0) / n);
      for (const c of jointCentre) expect(Math.abs(c)).toBeLessThan(1e-9);

      await page.goto(new URL(`/s/${studioId}/runs/${summary.id}`, baseUrl).href);
      const view = page.getByTestId('base-view');
      await view.locator('canvas').waitFor({ timeout: 20_000 });

      // 1. Scrub the pose chart to two instants; the platform drawn is the series' pose there.
      const chart = page.locator('[data-chart="Pose offset, translation"]');
      const t0 = series.time_s[0]!;
      const t1 = series.time_s[series.time_s.length - 1]!;
      const shots: Buffer[] = [];
      const drawn: { i: number; heave_mm: number; centroid_mm: number[] }[] = [];
      for (const share of [0.3, 0.62]) {
        const i = await hoverAt(page, chart, t0 + share * (t1 - t0));
        const got = await waitForDrawn(page, series, i);
        const heave_mm = mid(series.pose.z_m, i) * 1000;
        const surge_mm = mid(series.pose.x_m, i) * 1000;
        expect(Math.abs(got.heave_mm - heave_mm), `heave at bucket ${i}`).toBeLessThan(0.001);
        expect(Math.abs(got.surge_mm - surge_mm), `surge at bucket ${i}`).toBeLessThan(0.001);
        // The platform as placed in the scene: its origin at (x, y, h0 + z), to 1 µm.
        expect(Math.abs(got.centroid_mm[2]! - (base.neutralHeight_m * 1000 + heave_mm))).toBeLessThan(0.001);
        expect(Math.abs(got.centroid_mm[0]! - surge_mm)).toBeLessThan(0.001);
        // Every chart marks the instant the view shows.
        const markers = await page
          .getByTestId('run-charts')
          .locator('[data-chart]')
          .evaluateAll((els) => els.map((el) => Number(el.getAttribute('data-marker-s'))));
        expect(new Set(markers)).toEqual(new Set([series.time_s[i]]));
        shots.push(await view.locator('canvas').screenshot());
        drawn.push({ i, heave_mm, centroid_mm: got.centroid_mm });
      }
      // Two different poses (the demo moves in heave between these instants) draw different pixels.
      expect(Math.abs(drawn[0]!.heave_mm - drawn[1]!.heave_mm)).toBeGreaterThan(1);
      expect(shots[0]!.equals(shots[1]!)).toBe(false);
      await view.screenshot({ path: `${screenshotDir}/run-base-view.png` });

      // 2. Play at 2x: the view's time runs on, and the charts' marked instant and read-outs follow it.
      const preview = page.getByTestId('base-preview');
      await preview.getByLabel('Speed').selectOption('2');
      const startT = Number(await view.getAttribute('data-pose-t'));
      await preview.getByRole('button', { name: 'Play' }).click();
      await page.waitForFunction(
        (from) =>
          Number(document.querySelector('[data-testid="base-view"]')?.getAttribute('data-pose-t')) > from + 1,
        startT,
        { timeout: 10_000 },
      );
      await preview.getByRole('button', { name: 'Pause' }).click();
      const pausedT = Number(await view.getAttribute('data-pose-t'));
      const pausedIndex = series.time_s.findIndex((t) => t === pausedT);
      expect(pausedIndex).toBeGreaterThan(drawn[1]!.i);
      await expect
        .poll(() =>
          page
            .getByTestId('run-charts')
            .locator('[data-chart]')
            .evaluateAll((els) => els.map((el) => Number(el.getAttribute('data-marker-s')))),
        )
        .toEqual(expect.arrayContaining([pausedT]));
      const cursorIndices = await page
        .getByTestId('run-charts')
        .locator('figure:has([data-chart])')
        .evaluateAll((els) => els.map((el) => el.getAttribute('data-cursor-index')));
      expect(new Set(cursorIndices)).toEqual(new Set([String(pausedIndex)]));
      await expect(page.getByTestId('cursor-readout').textContent()).resolves.toContain(
        `t = ${pausedT.toFixed(3)} s`,
      );

      // 3. The arrow keys on the focused canvas turn the camera 5 deg a press and leave the page where it is.
      const canvas = view.locator('canvas');
      await canvas.focus();
      const camera = async () => ({
        azimuth: Number(await view.getAttribute('data-camera-azimuth-deg')),
        elevation: Number(await view.getAttribute('data-camera-elevation-deg')),
      });
      const before = await camera();
      const scrollY = await page.evaluate(() => window.scrollY);
      for (let k = 0; k < 3; k++) await page.keyboard.press('ArrowRight');
      await expect
        .poll(async () => ((((await camera()).azimuth - before.azimuth) % 360) + 360) % 360)
        .toBeCloseTo(15, 2);
      await page.keyboard.press('ArrowUp');
      await expect.poll(async () => (await camera()).elevation - before.elevation).toBeCloseTo(5, 2);
      await page.keyboard.press('ArrowDown');
      await page.keyboard.press('ArrowDown');
      await expect.poll(async () => (await camera()).elevation - before.elevation).toBeCloseTo(-5, 2);
      expect(await page.evaluate(() => window.scrollY)).toBe(scrollY);
      // The pose is unchanged by turning the camera.
      expect(Number(await view.getAttribute('data-pose-t'))).toBe(pausedT);
      expect(errors).toEqual([]);
    } finally {
      await close();
    }
  }, 60_000);

  it('a take’s proxy video seeks to motion time + film offset when a chart is scrubbed, and plays in step', async () => {
    const { page, errors, close } = await openPage(producer.email);
    try {
      const [, studioId] = /\/s\/([^/?#]+)/.exec(page.url()) ?? [];
      const api = (path: string) => new URL(`/api/studios/${studioId}${path}`, baseUrl).href;
      const headers = await csrfHeader(page);
      // A take with film sync at 25 fps and the motion 25 frames (1 s) after the picture, cued at the dome.
      const FPS = 25;
      const OFFSET_FRAMES = 25;
      const offset_s = OFFSET_FRAMES / FPS;
      const track = z
        .object({ id: z.string() })
        .parse(
          await (
            await page.request.post(api('/tracks'), { headers, data: { title: `Proxy sync ${Date.now()}` } })
          ).json(),
        );
      const uploaded = await page.request.post(
        api(
          `/tracks/${track.id}/takes?fileName=proxy-sync.csv&frameRate=${FPS}&offset_frames=${OFFSET_FRAMES}`,
        ),
        { headers: { ...headers, 'content-type': 'text/csv' }, data: gentleVehicleCsv(6) },
      );
      expect(uploaded.status(), await uploaded.text()).toBe(201);
      const take = uploadedTakeSchema.parse(await uploaded.json());
      const venues = z
        .array(z.object({ id: z.string(), name: z.string() }))
        .parse(await (await page.request.get(api('/venues'))).json());
      const dome = venues.find((v) => v.name === 'Harbour Lights Dome')!;
      const queued = await page.request.post(api(`/takes/${take.id}/runs`), {
        headers,
        data: { venueIds: [dome.id] },
      });
      expect(queued.status(), await queued.text()).toBeLessThan(300);
      const [run] = z.array(runSummarySchema).parse(await queued.json());

      // A 4 s WebM made here, by Chromium's MediaRecorder from a canvas (nothing downloaded), uploaded
      // as the take's proxy while the worker cues the run. A string, so it runs in the page as written.
      const video = await page.evaluate(`(async () => {
        const canvas = document.createElement('canvas');
        canvas.width = 160;
        canvas.height = 90;
        const ctx = canvas.getContext('2d');
        const recorder = new MediaRecorder(canvas.captureStream(${FPS}), { mimeType: 'video/webm;codecs=vp8' });
        const chunks = [];
        recorder.ondataavailable = (e) => chunks.push(e.data);
        const started = performance.now();
        let on = true;
        const draw = () => {
          const t = (performance.now() - started) / 1000;
          ctx.fillStyle = 'hsl(' + Math.round(t * 90) + ', 60%, 45%)';
          ctx.fillRect(0, 0, 160, 90);
          if (on) requestAnimationFrame(draw);
        };
        draw();
        recorder.start(250);
        await new Promise((r) => setTimeout(r, 4000));
        const stopped = new Promise((r) => (recorder.onstop = r));
        recorder.stop();
        on = false;
        await stopped;
        const blob = new Blob(chunks, { type: 'video/webm' });
        const put = await fetch(${JSON.stringify(api(`/takes/${take.id}/proxy-video`))}, {
          method: 'PUT',
          headers: { 'content-type': 'video/webm', 'x-csrf-token': ${JSON.stringify(headers['x-csrf-token'])} },
          body: blob,
        });
        return { status: put.status, bytes: blob.size };
      })()`);
      expect(video).toMatchObject({ status: 200 });

      const runUrl = api(`/runs/${run!.id}`);
      await expect
        .poll(async () => runDetailSchema.parse(await (await page.request.get(runUrl)).json()).state, {
          timeout: 90_000,
        })
        .toMatch(/awaiting_review|held_by_budget|held|cleared/);
      const series = runSeriesSchema.parse(await (await page.request.get(`${runUrl}/series`)).json());

      await page.goto(new URL(`/s/${studioId}/runs/${run!.id}`, baseUrl).href);
      const film = page.locator('video');
      await page.getByTestId('base-view').locator('canvas').waitFor({ timeout: 20_000 });
      await page.waitForFunction(() => (document.querySelector('video')?.readyState ?? 0) >= 1, null, {
        timeout: 10_000,
      });

      // Scrubbing a chart seeks the picture to motion time + offset, to the millisecond.
      const chart = page.locator('[data-chart="Specific force x (surge)"]');
      // Both well inside the 4 s picture (motion t + 1 s), with room left to play on.
      for (const t_s of [0.5, 1.2]) {
        const i = await hoverAt(page, chart, t_s);
        const want = series.time_s[i]! + offset_s;
        await page.waitForFunction(
          (w) => {
            const v = document.querySelector('video');
            return v !== null && !v.seeking && Math.abs(v.currentTime - w) < 1e-3;
          },
          want,
          { timeout: 20_000 },
        );
      }
      await film.screenshot({ path: `${screenshotDir}/run-proxy-video.png` });

      // Play: the picture runs, and is found within the page's 0.1 s re-sync of the motion's time (one
      // frame of 25 fps more for the moment between the two readings) once both have run on 0.5 s.
      // Polled frame by frame rather than read once: a busy machine may catch the picture mid-seek.
      await page.getByTestId('base-preview').getByRole('button', { name: 'Play' }).click();
      const startT = Number(await page.getByTestId('base-view').getAttribute('data-pose-t'));
      const startVideo_s = await page.evaluate(() => document.querySelector('video')!.currentTime);
      const tolerance_s = 0.1 + 1 / FPS;
      const sync = (await (
        await page.waitForFunction(
          ([from, offset, tolerance]) => {
            const v = document.querySelector('video');
            const t = Number(
              document.querySelector('[data-testid="base-view"]')?.getAttribute('data-pose-t'),
            );
            if (!v || v.paused || !(t > from + 0.5)) return false;
            const drift = v.currentTime - (t + offset);
            return Math.abs(drift) < tolerance ? { video_s: v.currentTime, motion_s: t, drift } : false;
          },
          [startT, offset_s, tolerance_s] as const,
          { timeout: 20_000, polling: 'raf' },
        )
      ).jsonValue()) as { video_s: number; motion_s: number; drift: number };
      await page.getByTestId('base-preview').getByRole('button', { name: 'Pause' }).click();
      // The picture itself ran on (not only the motion), from where the scrub had put it.
      expect(sync.video_s - startVideo_s, JSON.stringify(sync)).toBeGreaterThan(0.4);
      await expect.poll(() => page.evaluate(() => document.querySelector('video')!.paused)).toBe(true);
      expect(errors).toEqual([]);
    } finally {
      await close();
    }
  }, 150_000);
});
