// Takes: asking for cue runs of a take. Uploading a take is under its track (tracks.ts).
import { Router } from 'express';
import { eq } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { takes, venues } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { isUuid, parseBody } from '../lib/validate';
import { HttpError, notFound } from '../lib/http-error';
import { actorOf } from '../lib/actor';
import { requestRunsBody } from '../../shared/schemas/pipeline';
import { queueRuns } from '../pipeline/queue-runs';
import { toRunSummary } from '../pipeline/views';

/** POST /takes/:takeId/runs: queue cue runs of a take for venues (one per venue, deduplicated). */
export function takesRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  r.post('/:takeId/runs', requirePermission('runs.request'), async (req, res) => {
    const studioId = req.member!.studioId;
    const takeId = String(req.params.takeId);
    const body = parseBody(requestRunsBody, req.body, 'The run request');
    if (!isUuid(takeId)) throw notFound('No such take.');
    const [take] = await deps.db
      .select()
      .from(takes)
      .where(inStudio(takes, studioId, eq(takes.id, takeId)));
    if (!take) throw notFound('No such take.');
    if (!deps.boss) throw new HttpError(503, 'The job queue is not running; try again shortly.');
    const made = await queueRuns(deps.pool, deps.boss, {
      studioId,
      take,
      venueIds: [...new Set(body.venueIds)],
      ...(body.touchup ? { touchup: body.touchup } : {}),
      actor: actorOf(req),
      now: (deps.now ?? (() => new Date()))(),
      retry: { limit: deps.env.CUE_RUN_RETRY_LIMIT, delay_s: deps.env.CUE_RUN_RETRY_DELAY_S },
    });
    const names = await deps.db
      .select({ id: venues.id, name: venues.name })
      .from(venues)
      .where(inStudio(venues, studioId));
    res
      .status(201)
      .json(
        made.map((m) =>
          toRunSummary(m.run, take.number, names.find((v) => v.id === m.run.venueId)?.name ?? ''),
        ),
      );
  });
  return r;
}
