// The motion base editor and the budget editor in the real built client: a motion engineer edits the
// demo dome's parametric layout and sees the workspace table follow (checked against the closed form
// of pure heave), a bad value shows the shared parser's problem beside its field; a safety reviewer
// opens the demo budget as a form with its envelope charts. Nothing is saved, so the demo stays as it
// is for the other walks. Screenshots of both editors go to test-output/screenshots.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { ConsoleMessage, Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { browserForFile, screenshotDir } from './support/chromium';
import { DEMO_PASSWORD } from '../../shared/demo';
import { MotionBaseError, demoHexapodInput, parseMotionBase } from '../../shared/schemas/motion-base';

const baseUrl = process.env.LEGWORK_BASE_URL;
const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');
const browser = browserForFile();

async function signedIn(
  email: string,
): Promise<{ page: Page; errors: string[]; close: () => Promise<void> }> {
  if (!baseUrl) throw new Error('LEGWORK_BASE_URL is not set; see the error of beforeAll.');
  const context = await browser().newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on('console', (message: ConsoleMessage) => {
    if (message.type() === 'error') errors.push(`${message.text()} (${message.location().url})`);
  });
  page.on('pageerror', (error) => errors.push(`uncaught: ${error.message}`));
  await page.goto(new URL('/sign-in', baseUrl).href);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.getByRole('navigation', { name: 'Studio pages' }).waitFor({ state: 'visible', timeout: 15_000 });
  return { page, errors, close: () => context.close() };
}

/** axe-core's (Deque) serious and critical WCAG 2.1 A/AA violations on the page as it is now. */
async function seriousViolations(page: Page): Promise<string[]> {
  await page.evaluate(axeSource);
  const violations = (await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (o: unknown) => Promise<{ violations: unknown[] }> } })
      .axe;
    return (await axe.run({ runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] } }))
      .violations;
  })) as { id: string; impact: string | null; nodes: { target: string[] }[] }[];
  return violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map(
      (v) =>
        `${v.impact} ${v.id} at ${v.nodes
          .map((n) => n.target.join(' '))
          .slice(0, 3)
          .join('; ')}`,
    );
}

/** The heave-up reach of the demo layout with neutral height h0 (m), by hand from the leg geometry. */
function heaveUp(h0: number): number {
  // Every leg spans d = 60 - a_b - a_p deg between its joints, so its horizontal projection r obeys
  // r^2 = R_b^2 + R_p^2 - 2 R_b R_p cos d (law of cosines); at heave z, L = sqrt(r^2 + (h0 + z)^2),
  // and L reaches leg.max_m at z = sqrt(L_max^2 - r^2) - h0.
  const d = ((60 - 10 - 10) * Math.PI) / 180;
  const r2 = 1.5 ** 2 + 1 ** 2 - 2 * 1.5 * 1 * Math.cos(d);
  return Math.sqrt(2.3 ** 2 - r2) - h0;
}

describe('editors', () => {
  it('a motion engineer edits the dome: the workspace follows and a bad value is named beside its field', async () => {
    const { page, errors, close } = await signedIn('eli.engineer@lanternfish.example');
    try {
      await page
        .getByRole('navigation', { name: 'Studio pages' })
        .getByRole('link', { name: 'Venues' })
        .click();
      await page.getByRole('link', { name: 'Harbour Lights Dome' }).click();
      const form = page.getByRole('form', { name: 'Motion base of Harbour Lights Dome' });
      await form.waitFor({ timeout: 15_000 });
      const heaveRow = form.getByTestId('base-workspace').locator('tr[data-axis="heave"]');
      // Stored joints open as the demo's parametric layout; heave up 0.483 m by hand.
      await expect(form.getByLabel('Base joint circle radius (m)').inputValue()).resolves.toBe('1.5');
      await expect
        .poll(() => heaveRow.locator('td').nth(2).textContent(), { timeout: 10_000 })
        .toContain(`${heaveUp(1.6).toFixed(3)} m`);
      await page.screenshot({ path: `${screenshotDir}/editor-base.png`, fullPage: true });
      expect(await seriousViolations(page)).toEqual([]);

      // Pressing a reach shows that pose in the 3-D view.
      const up = heaveRow.locator('td').nth(2).getByRole('button');
      await up.click();
      await expect(up.getAttribute('aria-pressed')).resolves.toBe('true');
      await expect(form.getByTestId('base-static-view').textContent()).resolves.toContain('heave extreme');
      await form
        .getByTestId('base-static-view')
        .screenshot({ path: `${screenshotDir}/editor-base-heave-up.png` });

      // Changing the cueing profile asks for a confirmation and a reason; Back leaves it as it was.
      const cueing = page.getByRole('form', { name: 'Cueing profile of Harbour Lights Dome' });
      await cueing.getByRole('combobox').selectOption('');
      await cueing.getByRole('button', { name: 'Save' }).click();
      const confirm = cueing.getByRole('group', { name: 'Confirm the cueing profile change' });
      await expect(confirm.textContent()).resolves.toContain('to none?');
      await cueing.getByRole('button', { name: 'Confirm change' }).click();
      await expect
        .poll(() => confirm.textContent())
        .toContain('Say why the venue changes profile; the audit log keeps the reason.');
      await cueing.screenshot({ path: `${screenshotDir}/editor-profile-confirm.png` });
      await cueing.getByRole('button', { name: 'Back' }).click();
      await confirm.waitFor({ state: 'detached' });

      // A higher neutral height leaves less stroke for heave up: 0.383 m.
      const view = form.getByTestId('base-static-view');
      const canvasBox = form.getByTestId('base-static-canvas');
      const centroidZ = async () =>
        Number(((await canvasBox.getAttribute('data-platform-centroid-mm')) ?? '').split(' ')[2]);
      await form.getByLabel('Neutral height (m)').fill('1.7');
      await expect
        .poll(() => heaveRow.locator('td').nth(2).textContent(), { timeout: 10_000 })
        .toContain(`${heaveUp(1.7).toFixed(3)} m`);
      expect(heaveUp(1.7).toFixed(3)).toBe('0.383');
      // The view draws the platform at the new height: its joints (centred on the platform origin
      // in the demo layout) sit at z = h0 at neutral.
      await expect.poll(centroidZ, { timeout: 10_000 }).toBeCloseTo(1700, 3);
      const framesBefore = Number(await canvasBox.getAttribute('data-frames'));

      // A half angle of 75 deg is outside the schema's (0, 60): its message stands under the field.
      const bad = { ...demoHexapodInput, neutralHeight_m: 1.7, baseHalfAngle_deg: 75 };
      let expected = '';
      try {
        parseMotionBase(bad);
      } catch (e) {
        if (e instanceof MotionBaseError)
          expected = e.issues.find((i) => i.path === 'baseHalfAngle_deg')?.message ?? '';
      }
      expect(expected).not.toBe('');
      const angle = form.getByLabel('Base pair half angle (deg)');
      await angle.fill('75');
      const field = form.locator('[data-path="baseHalfAngle_deg"]');
      await expect.poll(() => field.textContent(), { timeout: 10_000 }).toContain(expected);
      await expect(angle.getAttribute('aria-invalid')).resolves.toBe('true');
      await expect
        .poll(() => form.getByTestId('base-workspace').textContent())
        .toContain('Shown once the base has no problems.');
      // The 3-D view keeps the last base without problems (drawn, marked as such), not a blank box.
      await expect.poll(() => view.getAttribute('data-shows')).toBe('last-valid');
      expect(await canvasBox.locator('canvas').count()).toBe(1);
      expect(await centroidZ()).toBeCloseTo(1700, 3);
      expect(Number(await canvasBox.getAttribute('data-frames'))).toBeGreaterThanOrEqual(framesBefore);
      await expect(view.textContent()).resolves.toContain('The last base without problems');
      await page.screenshot({ path: `${screenshotDir}/editor-base-problem.png`, fullPage: true });
      // Fixed again, the view follows the form once more.
      await angle.fill('12');
      await expect.poll(() => view.getAttribute('data-shows'), { timeout: 10_000 }).toBe('current');
      await expect.poll(() => angle.getAttribute('aria-invalid')).toBeNull();
      expect(errors).toEqual([]);
    } finally {
      await close();
    }
  }, 60_000);

  it('a safety reviewer opens the demo budget as a form with its envelope charts and demo labels', async () => {
    const { page, errors, close } = await signedIn('rosa.reviewer@lanternfish.example');
    try {
      await page
        .getByRole('navigation', { name: 'Studio pages' })
        .getByRole('link', { name: 'Profiles' })
        .click();
      await page.getByRole('button', { name: 'New version of DEMO budget (invented values)' }).click();
      const editor = page.getByTestId('budget-editor');
      await editor.waitFor({ timeout: 15_000 });
      await expect(editor.getByRole('note').textContent()).resolves.toContain('demo value, not a standard');
      await expect(editor.getByLabel(/^Jerk limit \(m\/s³\)/).inputValue()).resolves.toBe('25');
      // One uPlot chart per axis.
      await expect.poll(() => editor.locator('.uplot canvas').count(), { timeout: 10_000 }).toBe(3);
      // A lower bound above the at-rest value is named in its row.
      await editor.getByLabel('z row 2 lower bound (g)').fill('1.2');
      await expect
        .poll(() => editor.locator('[data-path="envelope.z[1]"]').textContent())
        .toContain('must contain the at-rest value 1 g strictly');
      await page.screenshot({ path: `${screenshotDir}/editor-budget.png`, fullPage: true });
      expect(await seriousViolations(page)).toEqual([]);
      await editor.getByRole('button', { name: 'Cancel' }).click();
      expect(errors).toEqual([]);
    } finally {
      await close();
    }
  }, 60_000);
});
