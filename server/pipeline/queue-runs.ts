// Queues one cue run per target venue. The run row and its pg-boss job are written in one
// transaction (pg-boss's `db` option runs its insert on our client), so there is never a run without a
// job nor a job without a run. The job id is the run id: a second send for the same run is a no-op.
import { and, eq, inArray, isNull } from 'drizzle-orm';
import { drizzle } from 'drizzle-orm/node-postgres';
import type pg from 'pg';
import type PgBoss from 'pg-boss';
import * as schema from '../db/schema';
import { cueRuns, profileVersions, venueSettings, venues } from '../db/schema';
import type { CueRunRow, TakeRow } from '../db/schema';
import { inStudio } from '../db/scope';
import { badRequest } from '../lib/http-error';
import { QUEUES } from '../queue';
import { recordAudit } from '../audit';
import { trackName } from '../../shared/motion/track-names';
import { cueRunJobSchema } from '../../shared/schemas/run-outputs';

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

/** Creates (or finds) the run of `take` for each venue and queues the new ones; returns every run. */
export async function queueRuns(
  pool: pg.Pool,
  boss: PgBoss,
  opts: {
    studioId: string;
    take: TakeRow;
    venueIds: string[];
    actor: { id: string; email: string } | null;
    now: Date;
    retry: { limit: number; delay_s: number };
  },
): Promise<{ run: CueRunRow; created: boolean }[]> {
  const client = await pool.connect();
  const tx = drizzle(client, { schema });
  try {
    await client.query('BEGIN');
    const found = await tx
      .select({
        id: venues.id,
        name: venues.name,
        base: venues.base,
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
      const cueingVersionId = opts.take.kind === 'vehicle' ? v.cueing : null;
      const [inserted] = await tx
        .insert(cueRuns)
        .values({
          studioId: opts.studioId,
          trackId: opts.take.trackId,
          takeId: opts.take.id,
          venueId: v.id,
          cueingVersionId,
          budgetVersionId: v.budget,
          requestedBy: opts.actor?.id ?? null,
        })
        .onConflictDoNothing()
        .returning();
      if (inserted) {
        // A version that a run used is frozen from now on.
        const used = [v.budget, ...(cueingVersionId ? [cueingVersionId] : [])];
        await tx
          .update(profileVersions)
          .set({ usedAt: opts.now })
          .where(and(inArray(profileVersions.id, used), isNull(profileVersions.usedAt)));
        const job = cueRunJobSchema.parse({ runId: inserted.id, studioId: opts.studioId });
        await boss.send(QUEUES.cueRun, job, {
          ...cueRunJobOptions(inserted.id, opts.retry),
          db: { executeSql: (text: string, values: unknown[]) => client.query(text, values) },
        });
        await recordAudit(tx, {
          studioId: opts.studioId,
          actor: opts.actor,
          action: 'run.queued',
          subjectType: 'cue_run',
          subjectId: inserted.id,
          detail: { takeId: opts.take.id, venue: v.name },
        });
        out.push({ run: inserted, created: true });
      } else {
        const [existing] = await tx
          .select()
          .from(cueRuns)
          .where(
            inStudio(
              cueRuns,
              opts.studioId,
              eq(cueRuns.takeId, opts.take.id),
              eq(cueRuns.venueId, v.id),
              eq(cueRuns.budgetVersionId, v.budget),
              cueingVersionId
                ? eq(cueRuns.cueingVersionId, cueingVersionId)
                : isNull(cueRuns.cueingVersionId),
            ),
          );
        out.push({ run: existing!, created: false });
      }
    }
    await client.query('COMMIT');
    return out;
  } catch (e) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw e;
  } finally {
    client.release();
  }
}
