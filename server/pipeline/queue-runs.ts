// Queues one cue run per target venue. The run row and its pg-boss job are written in one
// transaction (pg-boss's `db` option runs its insert on our client), so there is never a run without a
// job nor a job without a run. The job id is the run id: a second send for the same run is a no-op.
import { and, eq, inArray, isNull, sql } from 'drizzle-orm';
import type pg from 'pg';
import type PgBoss from 'pg-boss';
import { inClientTransaction } from '../db/client';
import type { Db, SqlExecutor } from '../db/client';
import { cueRuns, profileVersions, venueSettings, venues } from '../db/schema';
import type { CueRunRow, TakeRow } from '../db/schema';
import { inStudio } from '../db/scope';
import { badRequest } from '../lib/http-error';
import { QUEUES } from '../queue';
import { recordAudit } from '../audit';
import { trackName } from '../../shared/motion/track-names';
import { cueRunJobSchema } from '../../shared/schemas/run-outputs';
import { normalRunParams } from '../../shared/schemas/run-params';
import type { RunParams } from '../../shared/schemas/run-params';
import { controllerOutputSchema } from '../../shared/schemas/controller-output';
import type { Touchup, TouchupAxis } from '../../shared/schemas/touchup';
import { touchupAxesOf } from '../../shared/motion/touchup';
import { takeFilmSync } from './views';

/** pg-boss send options for a run's job: retries with backoff, id = run id. */
export const cueRunJobOptions = (
  runId: string,
  retry: { limit: number; delay_s: number },
): PgBoss.SendOptions => ({
  id: runId,
  retryLimit: retry.limit,
  retryDelay: retry.delay_s,
  retryBackoff: true,
  expireInSeconds: 15 * 60,
});

interface RunKey {
  studioId: string;
  take: TakeRow;
  venue: { id: string; name: string };
  cueingVersionId: string | null;
  budgetVersionId: string;
  params: RunParams;
}

interface QueueContext {
  /** Runs SQL on the transaction's connection: pg-boss's send joins the transaction through it. */
  sql: SqlExecutor;
  tx: Db;
  boss: PgBoss;
  actor: { id: string; email: string } | null;
  now: Date;
  retry: { limit: number; delay_s: number };
}

/**
 * Inserts the run of these inputs and queues its job, or finds the run that already has them (the
 * unique key covers take, venue, profile versions and the run's parameters).
 */
async function insertOrFindRun(
  ctx: QueueContext,
  key: RunKey,
  audit: Record<string, unknown> = {},
): Promise<{ run: CueRunRow; created: boolean }> {
  const { tx } = ctx;
  const [inserted] = await tx
    .insert(cueRuns)
    .values({
      studioId: key.studioId,
      trackId: key.take.trackId,
      takeId: key.take.id,
      venueId: key.venue.id,
      cueingVersionId: key.cueingVersionId,
      budgetVersionId: key.budgetVersionId,
      params: key.params,
      requestedBy: ctx.actor?.id ?? null,
    })
    .onConflictDoNothing()
    .returning();
  if (!inserted) {
    const [existing] = await tx
      .select()
      .from(cueRuns)
      .where(
        inStudio(
          cueRuns,
          key.studioId,
          eq(cueRuns.takeId, key.take.id),
          eq(cueRuns.venueId, key.venue.id),
          eq(cueRuns.budgetVersionId, key.budgetVersionId),
          key.cueingVersionId
            ? eq(cueRuns.cueingVersionId, key.cueingVersionId)
            : isNull(cueRuns.cueingVersionId),
          sql`${cueRuns.params} = ${JSON.stringify(key.params)}::jsonb`,
        ),
      );
    return { run: existing!, created: false };
  }
  // A version that a run used is frozen from now on.
  const used = [key.budgetVersionId, ...(key.cueingVersionId ? [key.cueingVersionId] : [])];
  await tx
    .update(profileVersions)
    .set({ usedAt: ctx.now })
    .where(and(inArray(profileVersions.id, used), isNull(profileVersions.usedAt)));
  const job = cueRunJobSchema.parse({ runId: inserted.id, studioId: key.studioId });
  await ctx.boss.send(QUEUES.cueRun, job, {
    ...cueRunJobOptions(inserted.id, ctx.retry),
    db: ctx.sql,
  });
  await recordAudit(tx, {
    studioId: key.studioId,
    actor: ctx.actor,
    action: 'run.queued',
    subjectType: 'cue_run',
    subjectId: inserted.id,
    detail: { takeId: key.take.id, venue: key.venue.name, params: key.params, ...audit },
  });
  return { run: inserted, created: true };
}

/** Runs `work` in one transaction on a client of its own (pg-boss's insert joins it). */
function inTransaction<T>(
  pool: pg.Pool,
  boss: PgBoss,
  opts: { actor: QueueContext['actor']; now: Date; retry: QueueContext['retry'] },
  work: (ctx: QueueContext) => Promise<T>,
): Promise<T> {
  return inClientTransaction(pool, (tx, sql) => work({ sql, tx, boss, ...opts }));
}

/**
 * Checks a touch-up against the take it is for, before any run is made: the axes it names must be the
 * take's, and a leg-length take takes only the offset and the trim. Throws a 400 naming the field.
 */
export function checkTouchupFits(take: Pick<TakeRow, 'kind' | 'layout' | 'number'>, touchup: Touchup): void {
  const axes = touchupAxesOf(take.kind, take.layout);
  const what = `take ${take.number} (${trackName(take.kind, take.layout)})`;
  const issues: { path: string; message: string }[] = [];
  for (const setting of ['gain', 'smoothing_hz'] as const) {
    for (const k of Object.keys(touchup[setting])) {
      if (!axes.includes(k as TouchupAxis)) {
        issues.push({
          path: `touchup.${setting}.${k}`,
          message: axes.length
            ? `${what} has no ${k} axis (it has ${axes.join(', ')})`
            : `${what} takes only offset_s and the trim`,
        });
      }
    }
  }
  if (take.kind === 'legs') {
    for (const k of ['fadeIn_s', 'fadeOut_s'] as const) {
      if (touchup[k] > 0) {
        issues.push({ path: `touchup.${k}`, message: `${what} takes only offset_s and the trim` });
      }
    }
  }
  if (issues.length) {
    throw badRequest(
      `The touch-up does not fit take ${take.number}: ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`,
      issues,
    );
  }
}

/** Creates (or finds) the run of `take` for each venue and queues the new ones; returns every run. */
export async function queueRuns(
  pool: pg.Pool,
  boss: PgBoss,
  opts: {
    studioId: string;
    take: TakeRow;
    venueIds: string[];
    /** Applied before cueing, recorded in each run's parameters. */
    touchup?: Touchup;
    actor: { id: string; email: string } | null;
    now: Date;
    retry: { limit: number; delay_s: number };
  },
): Promise<{ run: CueRunRow; created: boolean }[]> {
  if (opts.touchup) checkTouchupFits(opts.take, opts.touchup);
  // A take with film sync records its offset on every run, so a nudge back to it finds this run.
  const params = normalRunParams({
    filmOffset_frames: takeFilmSync(opts.take)?.offset_frames,
    touchup: opts.touchup,
  });
  return inTransaction(pool, boss, opts, async (ctx) => {
    const found = await ctx.tx
      .select({
        id: venues.id,
        name: venues.name,
        base: venues.base,
        controller: venues.controller,
        cueing: venueSettings.cueingVersionId,
        budget: venueSettings.budgetVersionId,
      })
      .from(venues)
      .leftJoin(venueSettings, eq(venueSettings.venueId, venues.id))
      .where(inStudio(venues, opts.studioId, inArray(venues.id, opts.venueIds)));
    const missing = opts.venueIds.filter((id) => !found.some((v) => v.id === id));
    if (missing.length)
      throw badRequest('Unknown venue.', [
        { path: 'venueIds', message: `not a venue of this studio: ${missing.join(', ')}` },
      ]);
    const out: { run: CueRunRow; created: boolean }[] = [];
    for (const v of found) {
      if (!v.budget) {
        throw badRequest(`${v.name} has no budget profile yet; a safety reviewer sets one on the venue.`, [
          { path: 'venueIds', message: `${v.name}: no budget profile` },
        ]);
      }
      const kind = (v.base as { kind: string }).kind;
      if (opts.take.kind !== 'vehicle' && opts.take.layout !== kind) {
        throw badRequest(
          `Take ${opts.take.number} is a ${trackName(opts.take.kind, opts.take.layout)}; ${v.name} is a ${kind} base.`,
          [{ path: 'venueIds', message: `${v.name}: the take's columns are for another kind of base` }],
        );
      }
      if (opts.take.kind === 'vehicle' && !v.cueing) {
        throw badRequest(`${v.name} has no cueing profile yet; a motion engineer sets one on the venue.`, [
          { path: 'venueIds', message: `${v.name}: no cueing profile` },
        ]);
      }
      out.push(
        await insertOrFindRun(ctx, {
          studioId: opts.studioId,
          take: opts.take,
          venue: v,
          cueingVersionId: opts.take.kind === 'vehicle' ? v.cueing : null,
          budgetVersionId: v.budget,
          // The venue's controller settings as they are now: part of the run's identity.
          params: normalRunParams({ ...params, controller: controllerOutputSchema.parse(v.controller) }),
        }),
      );
    }
    return out;
  });
}

/**
 * A new version of a run with the motion moved against the picture: the same take, venue, profile
 * versions and touch-up, another film offset. The old run is left as it is; asking for an offset a
 * run of these inputs already has returns that run.
 */
export async function queueRunWithFilmOffset(
  pool: pg.Pool,
  boss: PgBoss,
  opts: {
    studioId: string;
    run: CueRunRow;
    take: TakeRow;
    venueName: string;
    offset_frames: number;
    actor: { id: string; email: string } | null;
    now: Date;
    retry: { limit: number; delay_s: number };
  },
): Promise<{ run: CueRunRow; created: boolean }> {
  const params = normalRunParams({ ...opts.run.params, filmOffset_frames: opts.offset_frames });
  return inTransaction(pool, boss, opts, (ctx) =>
    insertOrFindRun(
      ctx,
      {
        studioId: opts.studioId,
        take: opts.take,
        venue: { id: opts.run.venueId, name: opts.venueName },
        cueingVersionId: opts.run.cueingVersionId,
        budgetVersionId: opts.run.budgetVersionId,
        params,
      },
      { nudgedFrom: opts.run.id, fromOffset_frames: opts.run.params.filmOffset_frames ?? null },
    ),
  );
}
