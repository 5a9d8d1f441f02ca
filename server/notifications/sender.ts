// Sending the outbox: the worker takes due rows under `FOR UPDATE SKIP LOCKED` (so two workers never
// take the same row), sends each through the Mailer with its link completed from PUBLIC_URL, and marks
// it sent, or counts the failure, keeps the error and waits longer before the next try (doubling from
// MAIL_RETRY_DELAY_S, at most an hour). After MAIL_MAX_ATTEMPTS tries the row is left with its last
// error and no longer tried. A row's lock is held until its outcome is committed; a worker that dies
// after the SMTP server accepted a mail and before the commit sends it again (at least once).
import { and, asc, eq, isNull, lt, lte } from 'drizzle-orm';
import type { Db } from '../db/client';
import { mailOutbox } from '../db/schema';
import type { Mailer } from '../mail';

export interface SenderDeps {
  db: Db;
  mailer: Mailer;
  /** PUBLIC_URL (no trailing slash needed): the start of every link. */
  baseUrl: string;
  log: (msg: string) => void;
  now: () => Date;
  maxAttempts: number;
  retryDelayS: number;
  /** Rows taken per transaction (default 20). */
  batchSize?: number;
}

/** The longest wait between two tries of one mail. */
export const MAIL_MAX_RETRY_DELAY_S = 3600;

/** The wait after the n-th failed try (n from 1): the first delay doubled each time, capped. */
export function retryDelayS(firstDelayS: number, failures: number): number {
  return Math.min(firstDelayS * 2 ** Math.max(0, failures - 1), MAIL_MAX_RETRY_DELAY_S);
}

/** The text as sent: the queued text, then the full link to its page. */
export function mailText(baseUrl: string, row: { text: string; path: string | null }): string {
  if (!row.path) return row.text;
  return `${row.text.trimEnd()}\n\n${baseUrl.replace(/\/+$/, '')}${row.path}\n`;
}

/** One pass: sends the mail now due (up to the batch size) and answers what happened. */
export async function sendDueMail(deps: SenderDeps): Promise<{ sent: number; failed: number }> {
  const at = deps.now();
  const batch = deps.batchSize ?? 20;
  return deps.db.transaction(async (tx) => {
    const due = await tx
      .select()
      .from(mailOutbox)
      .where(
        and(
          isNull(mailOutbox.sentAt),
          lte(mailOutbox.nextAttemptAt, at),
          lt(mailOutbox.attempts, deps.maxAttempts),
        ),
      )
      .orderBy(asc(mailOutbox.nextAttemptAt), asc(mailOutbox.createdAt))
      .limit(batch)
      .for('update', { skipLocked: true });
    let sent = 0;
    let failed = 0;
    for (const row of due) {
      const attempts = row.attempts + 1;
      try {
        await deps.mailer.send({ to: row.toEmail, subject: row.subject, text: mailText(deps.baseUrl, row) });
        await tx
          .update(mailOutbox)
          .set({ sentAt: deps.now(), attempts, lastError: null })
          .where(eq(mailOutbox.id, row.id));
        sent++;
      } catch (e) {
        const message = (e instanceof Error ? e.message : String(e)).slice(0, 1000) || 'unknown error';
        await tx
          .update(mailOutbox)
          .set({
            attempts,
            lastError: message,
            nextAttemptAt: new Date(at.getTime() + retryDelayS(deps.retryDelayS, attempts) * 1000),
          })
          .where(eq(mailOutbox.id, row.id));
        failed++;
        deps.log(
          attempts >= deps.maxAttempts
            ? `mail ${row.id} (${row.kind}) to ${row.toEmail}: gave up after ${attempts} tries: ${message}`
            : `mail ${row.id} (${row.kind}) to ${row.toEmail}: try ${attempts} failed, will retry: ${message}`,
        );
      }
    }
    return { sent, failed };
  });
}

/**
 * Drains the outbox every `pollMs` until stopped: pass after pass while full batches come back, then
 * a pause. A pass that throws (the database away) is logged and tried again after the pause.
 */
export function startMailSender(deps: SenderDeps, pollMs: number): { stop: () => Promise<void> } {
  let stopped = false;
  let wake: (() => void) | null = null;
  const batch = deps.batchSize ?? 20;
  const loop = (async () => {
    while (!stopped) {
      try {
        let r: { sent: number; failed: number };
        do r = await sendDueMail(deps);
        while (!stopped && r.sent + r.failed === batch);
      } catch (e) {
        deps.log(`mail sender: ${e instanceof Error ? e.message : String(e)}`);
      }
      if (stopped) break;
      await new Promise<void>((resolve) => {
        const timer = setTimeout(resolve, pollMs);
        wake = () => {
          clearTimeout(timer);
          resolve();
        };
      });
      wake = null;
    }
  })();
  return {
    stop: async () => {
      stopped = true;
      (wake as (() => void) | null)?.();
      await loop;
    },
  };
}
