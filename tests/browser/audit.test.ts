// The audit log page in the real built client: a safety reviewer changes the budget a venue uses (to
// none, then back) with a reason each time, through the API the venue page uses, and the audit page
// says both changes in words, reason included, with no raw JSON. The venue ends as it started.
import { describe, expect, it } from 'vitest';
import { browserForFile, openSignedIn, screenshotDir } from './support/chromium';
import { DEMO_USERS } from '../../shared/demo';
import { venueDetailSchema } from '../../shared/schemas/pipeline';

const baseUrl = process.env.LEGWORK_BASE_URL;
const reviewer = DEMO_USERS.find((u) => u.roles.includes('safety_reviewer'))!;
const browser = browserForFile();

describe('audit log', () => {
  it('says a venue’s budget change and its reason in words', async () => {
    const { page, errors, close } = await openSignedIn(browser(), reviewer.email, {
      width: 1280,
      height: 900,
    });
    try {
      const [, studioId] = /\/s\/([^/?#]+)/.exec(page.url()) ?? [];
      const api = (path: string) => new URL(`/api/studios/${studioId}${path}`, baseUrl).href;
      const { csrfToken } = (await (
        await page.request.get(new URL('/api/auth/csrf', baseUrl).href)
      ).json()) as {
        csrfToken: string;
      };
      const venues = (await (await page.request.get(api('/venues'))).json()) as {
        id: string;
        name: string;
      }[];
      const arcade = venues.find((v) => v.name !== 'Harbour Lights Dome') ?? venues[0]!;
      const before = venueDetailSchema.parse(
        await (await page.request.get(api(`/venues/${arcade.id}`))).json(),
      );
      expect(before.budgetVersion, 'the demo venue has a budget').not.toBeNull();
      const stamp = Date.now();
      const off = `Envelope re-measured after the actuator swap (${stamp}).`;
      const back = `Re-measured envelope matches the old one (${stamp}).`;
      for (const [budgetVersionId, reason] of [
        [null, off],
        [before.budgetVersion!.id, back],
      ] as const) {
        const r = await page.request.put(api(`/venues/${arcade.id}/settings`), {
          headers: { 'x-csrf-token': csrfToken },
          data: { budgetVersionId, reason },
        });
        expect(r.status(), await r.text()).toBe(200);
      }
      const label = `${before.budgetVersion!.name} v${before.budgetVersion!.version}`;

      await page.goto(new URL(`/s/${studioId}/audit`, baseUrl).href);
      const table = page.getByRole('table', { name: 'Audit events, newest first' });
      await table.waitFor({ timeout: 15_000 });
      const row = (reason: string) => table.locator('tbody tr', { hasText: reason });
      await row(back).waitFor();
      const cleared = (await row(off).textContent()) ?? '';
      const restored = (await row(back).textContent()) ?? '';
      expect(cleared).toContain(
        `${reviewer.email} changed the budget profile from ${label} to none at ${arcade.name}. Reason: ${off}`,
      );
      expect(restored).toContain(
        `changed the budget profile from none to ${label} at ${arcade.name}. Reason: ${back}`,
      );
      for (const text of [cleared, restored]) {
        expect(text).not.toMatch(/[{}]|VersionId|venue profiles changed/);
      }
      await page.screenshot({ path: `${screenshotDir}/audit-reason.png`, fullPage: false });
      const after = venueDetailSchema.parse(
        await (await page.request.get(api(`/venues/${arcade.id}`))).json(),
      );
      expect(after.budgetVersion?.id).toBe(before.budgetVersion!.id);
      expect(errors).toEqual([]);
    } finally {
      await close();
    }
  }, 60_000);
});
