// The release chain through the real built client in Chromium, with four demo users: a producer
// uploads a take and cues it for the operator's venue, the run page refuses its release until it is
// cleared, a safety reviewer mailed about it opens it from the mail (it is on their queue too) and
// clears it with a reason, the producer releases it from the run page and follows the link to the
// release page, which updates itself until the package is ready; the venue operator reads the
// "package ready" mail from the local mailbox, follows its link, finds the release on their home,
// downloads the package (its SHA-256, computed here by node:crypto, must equal the one the page
// shows) and marks it installed; a problem they then report reaches the producer by mail, whose link
// opens the release with the problem on it. No error in any browser console on the way.
import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import type { BrowserContext, ConsoleMessage, Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { mailMessageSchema } from '../../shared/schemas/api';
import type { MailMessage } from '../../shared/schemas/api';
import { browserForFile, screenshotDir } from './support/chromium';
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

const browser = browserForFile();
const consoleErrors: string[] = [];

async function signedIn(email: string): Promise<{ context: BrowserContext; page: Page }> {
  if (!baseUrl) throw new Error('LEGWORK_BASE_URL is not set; see the error of beforeAll.');
  const context = await browser().newContext({ viewport: { width: 1440, height: 900 } });
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

const mailboxSchema = z.object({ enabled: z.literal(true), messages: z.array(mailMessageSchema) });

/**
 * The first captured mail to `email` whose subject matches, read from the app's local mailbox
 * (GET /api/dev/mailbox, what the SMTP capture received), polled until `timeout_ms` passes: the worker
 * sends the outbox every few seconds.
 */
async function mailTo(email: string, subject: RegExp, timeout_ms = 60_000): Promise<MailMessage> {
  const until = Date.now() + timeout_ms;
  let seen: string[] = [];
  while (Date.now() < until) {
    const answer = await fetch(new URL('/api/dev/mailbox', baseUrl).href);
    const { messages } = mailboxSchema.parse(await answer.json());
    const mine = messages.filter((m) => m.to.some((to) => to.toLowerCase() === email.toLowerCase()));
    const found = mine.find((m) => subject.test(m.subject));
    if (found) return found;
    seen = mine.map((m) => m.subject);
    await new Promise((resolve) => setTimeout(resolve, 500));
  }
  throw new Error(
    `No mail to ${email} matching ${String(subject)} within ${timeout_ms} ms; saw: ${seen.join(' | ')}`,
  );
}

/** The link to the app in a mail's text: the app's own address followed by a page path. */
function appLinkIn(mail: MailMessage): URL {
  const origin = new URL(baseUrl!).origin;
  const match = mail.text.match(new RegExp(`${origin.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}/\\S+`));
  if (!match) throw new Error(`The mail "${mail.subject}" carries no link to ${origin}:\n${mail.text}`);
  return new URL(match[0]);
}

async function shot(page: Page, name: string) {
  await page.waitForLoadState('networkidle');
  await page.screenshot({ path: `${screenshotDir}/${name}.png`, fullPage: true });
}

describe('the release chain', () => {
  it('takes a new take from upload to a package installed at the venue, with its mails followed', async () => {
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

    // 2. The reviewer is mailed that the run awaits review and finds it in their queue; the mail's
    // link and the queue's both open the run page, where they clear it with a reason.
    const reviewMail = await mailTo(
      reviewer.email,
      new RegExp(`^Legwork: ${title} take 1 at .* awaits review$`),
    );
    expect(reviewMail.subject).toBe(`Legwork: ${title} take 1 at ${operatorVenue} awaits review`);
    const reviewLink = appLinkIn(reviewMail);
    expect(reviewLink.pathname).toBe(runPath);
    {
      const { context, page } = await signedIn(reviewer.email);
      try {
        const queue = page.getByRole('table', { name: 'Review queue' });
        await queue.getByRole('link', { name: `${title}, take 1` }).waitFor({ timeout: 15_000 });
        await page.goto(new URL(`/mailbox?id=${encodeURIComponent(reviewMail.id)}`, baseUrl).href);
        await page.getByRole('link', { name: reviewLink.href }).click();
        await page.getByTestId('decision-panel').waitFor({ timeout: 15_000 });
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

    // 3. The producer reads the review, releases the run from the run page and follows the link to
    // the release page, which asks again until the package is built.
    let releasePath: string | undefined;
    let shownSha256: string;
    {
      const { context, page } = await signedIn(producer.email);
      try {
        await page.goto(new URL(runPath!, baseUrl).href);
        const panel = page.getByTestId('decision-panel');
        await panel
          .getByText('Within the venue budget; seat forces gentle throughout.')
          .waitFor({ timeout: 15_000 });
        // Clearing is a reviewer's work; the producer is not offered it.
        await expect(panel.getByRole('button', { name: 'Clear for release' }).isDisabled()).resolves.toBe(
          true,
        );
        const release = panel.getByRole('button', { name: 'Release to the venue' });
        await expect(release.isEnabled()).resolves.toBe(true);
        await release.click();
        await panel.getByText('The package is being built.').waitFor({ timeout: 15_000 });
        await panel.getByRole('link', { name: 'Open the release' }).click();
        await page.getByTestId('release-summary').waitFor({ timeout: 15_000 });
        releasePath = new URL(page.url()).pathname;
        expect(releasePath).toMatch(/^\/s\/[0-9a-f-]{36}\/releases\/[0-9a-f-]{36}$/);
        const summary = page.getByTestId('release-summary');
        // The page polls while the package is building; no reload here.
        await summary.getByText('Ready', { exact: true }).waitFor({ timeout: 90_000 });
        shownSha256 = (await page.getByTestId('package-sha256').textContent()) ?? '';
        expect(shownSha256).toMatch(/^[0-9a-f]{64}$/);
        expect(await page.getByTestId('release-caution').textContent()).toContain('never replaces them');
        await page.getByRole('table', { name: 'Files in the package' }).waitFor();
        await shot(page, 'chain-3-released-ready');
      } finally {
        await context.close();
      }
    }

    // 4. The operator reads the "package ready" mail in the local mailbox and follows its link.
    const readyMail = await mailTo(operator.email, new RegExp(`^Package ready: ${title}, take 1, for `));
    expect(readyMail.subject).toBe(`Package ready: ${title}, take 1, for ${operatorVenue}`);
    expect(readyMail.text).toContain(shownSha256);
    expect(readyMail.text).toContain("Load a package only after the venue's own checks");
    const readyLink = appLinkIn(readyMail);
    expect(readyLink.pathname).toBe(releasePath);
    {
      const { context, page } = await signedIn(operator.email);
      try {
        // The mailbox page shows the same mail.
        await page.goto(new URL(`/mailbox?id=${encodeURIComponent(readyMail.id)}`, baseUrl).href);
        await page.getByText(readyMail.subject).first().waitFor({ timeout: 15_000 });
        await shot(page, 'chain-4-operator-mailbox');

        // Following the link as a reader would: clicking it in the mail.
        await page.getByRole('link', { name: readyLink.href }).click();
        await page.getByTestId('release-summary').waitFor({ timeout: 15_000 });
        expect(new URL(page.url()).pathname).toBe(releasePath);
        await expect(page.getByTestId('package-sha256').textContent()).resolves.toBe(shownSha256);

        // 5. Their home lists it as new; they download it there and mark it installed.
        await page
          .getByRole('navigation', { name: 'Studio pages' })
          .getByRole('link', { name: 'Home' })
          .click();
        const home = page.getByTestId('home-venue_operator');
        await home.getByTestId('operator-caution').waitFor({ timeout: 15_000 });
        const row = home
          .getByRole('table', { name: 'New releases' })
          .getByRole('row')
          .filter({ hasText: `${title}, take 1` });
        await row.waitFor({ timeout: 15_000 });
        await shot(page, 'chain-5-operator-home-new');
        const [download] = await Promise.all([
          page.waitForEvent('download', { timeout: 30_000 }),
          row.getByRole('link', { name: 'Download package' }).click(),
        ]);
        const zip = await readFile(await download.path());
        // A zip file starts with the local file header signature "PK\3\4" (PKWARE APPNOTE.TXT 4.3.7).
        expect(zip.subarray(0, 4)).toEqual(Buffer.from([0x50, 0x4b, 0x03, 0x04]));
        expect(createHash('sha256').update(zip).digest('hex')).toBe(shownSha256);
        await row.getByRole('button', { name: 'Mark as installed' }).click();
        await home
          .getByRole('table', { name: 'Installed releases' })
          .getByRole('row')
          .filter({ hasText: `${title}, take 1` })
          .waitFor({ timeout: 15_000 });
        await expect(
          home
            .getByRole('table', { name: 'New releases' })
            .filter({ hasText: `${title}, take 1` })
            .count(),
        ).resolves.toBe(0);
        await shot(page, 'chain-6-operator-installed');

        // The release page counts the download and names who installed it; the operator reports a problem.
        await page.goto(readyLink.href);
        const summary = page.getByTestId('release-summary');
        await summary.getByText('Installed at the venue.').waitFor({ timeout: 15_000 });
        await page.getByText(`${operator.name}, `).first().waitFor();
        await summary.getByRole('button', { name: 'Report a problem' }).click();
        await summary
          .getByLabel('What is wrong with this package?')
          .fill('Seat 3 knocks once at the first banked turn.');
        await summary.getByRole('button', { name: 'Send the report' }).click();
        await summary.getByText('The problem is reported.').waitFor({ timeout: 15_000 });
        await shot(page, 'chain-7-operator-reported');
      } finally {
        await context.close();
      }
    }

    // 6. The problem reaches the producer by mail; its link opens the release with the problem on it.
    const problemMail = await mailTo(producer.email, new RegExp(`^Problem reported: ${title}, take 1, for `));
    expect(problemMail.text).toContain('Seat 3 knocks once at the first banked turn.');
    const problemLink = appLinkIn(problemMail);
    expect(problemLink.pathname).toBe(releasePath);
    {
      const { context, page } = await signedIn(producer.email);
      try {
        await page.goto(problemLink.href);
        await page.getByText('Seat 3 knocks once at the first banked turn.').waitFor({ timeout: 15_000 });
        await page.goto(new URL(runPath!.replace(/\/runs\/.*$/, ''), baseUrl).href);
        const problem = page
          .getByRole('table', { name: 'Problems reported by venues' })
          .getByRole('row')
          .filter({ hasText: `${title}, take 1` });
        await problem.waitFor({ timeout: 15_000 });
        expect(await problem.textContent()).toContain('Seat 3 knocks once at the first banked turn.');
        expect(await problem.textContent()).toContain(operator.name);
        await shot(page, 'chain-8-producer-problem');
      } finally {
        await context.close();
      }
    }
    expect(consoleErrors).toEqual([]);
  }, 420_000);
});
