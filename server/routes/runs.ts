// Cue runs: read one, its chart series and its artifacts (runs are asked for on a take, takes.ts).
import { Router } from 'express';
import type { Response } from 'express';
import type { Readable } from 'node:stream';
import { GetObjectCommand } from '@aws-sdk/client-s3';
import type { AppDeps } from '../deps';
import { requirePermission } from '../auth/require-permission';
import { HttpError, notFound } from '../lib/http-error';
import { parseBody } from '../lib/validate';
import { actorOf } from '../lib/actor';
import { loadRun, runDetail } from '../pipeline/run-detail';
import { queueRunWithFilmOffset } from '../pipeline/queue-runs';
import { requeueRun } from '../pipeline/stalled-runs';
import { toRunSummary } from '../pipeline/views';
import { runFileContentType } from '../../shared/schemas/run-outputs';
import { filmOffsetBody } from '../../shared/schemas/run-params';

export function runsRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });

  const load = (studioId: string, runId: string) => loadRun(deps.db, studioId, runId);

  r.get('/:runId', requirePermission('runs.read'), async (req, res) => {
    const studioId = req.member!.studioId;
    const out = await runDetail(deps.db, studioId, await load(studioId, String(req.params.runId)));
    res.json(out);
  });

  // A producer nudges the motion against the picture: a new run (a new version) with the new film
  // offset and every other input of this run; this run is never rewritten. The same offset again
  // returns the run that has it (200), a new one is 201.
  r.post('/:runId/film-offset', requirePermission('runs.sync'), async (req, res) => {
    const studioId = req.member!.studioId;
    const loaded = await load(studioId, String(req.params.runId));
    const body = parseBody(filmOffsetBody, req.body, 'The film offset');
    if (!loaded.take.frameRate) {
      throw new HttpError(
        409,
        `Take ${loaded.take.number} has no film sync: its frame rate and start timecode are set when it is uploaded.`,
      );
    }
    if (!deps.boss) throw new HttpError(503, 'The job queue is not running; try again shortly.');
    const made = await queueRunWithFilmOffset(deps.pool, deps.boss, {
      studioId,
      run: loaded.run,
      take: loaded.take,
      venueName: loaded.venueName,
      offset_frames: body.offset_frames,
      actor: actorOf(req),
      now: (deps.now ?? (() => new Date()))(),
      retry: { limit: deps.env.CUE_RUN_RETRY_LIMIT, delay_s: deps.env.CUE_RUN_RETRY_DELAY_S },
    });
    res.status(made.created ? 201 : 200).json(toRunSummary(made.run, loaded.take.number, loaded.venueName));
  });

  // Asking again for a run that failed (storage was down, a worker kept dying) or whose worker stopped
  // answering: the same run, queued under a new job; its history stays in the audit log.
  r.post('/:runId/requeue', requirePermission('runs.request'), async (req, res) => {
    const studioId = req.member!.studioId;
    const loaded = await load(studioId, String(req.params.runId));
    if (!deps.boss) throw new HttpError(503, 'The job queue is not running; try again shortly.');
    const run = await requeueRun(deps.pool, deps.boss, {
      studioId,
      runId: loaded.run.id,
      actor: actorOf(req),
      now: (deps.now ?? (() => new Date()))(),
      policy: {
        stall_s: deps.env.RUN_STALL_S,
        retry: { limit: deps.env.CUE_RUN_RETRY_LIMIT, delay_s: deps.env.CUE_RUN_RETRY_DELAY_S },
      },
    });
    res.status(202).json(toRunSummary(run, loaded.take.number, loaded.venueName));
  });

  const streamArtifact = async (
    studioId: string,
    runId: string,
    name: string,
    res: Response,
    download: boolean,
  ) => {
    const { run } = await load(studioId, runId);
    if (!run.artifactPrefix) throw notFound('This run has no results yet.');
    const contentType = runFileContentType(name);
    if (!contentType) throw notFound('No such file in this run.');
    const obj = await deps.storage.client
      .send(new GetObjectCommand({ Bucket: deps.storage.bucket, Key: `${run.artifactPrefix}${name}` }))
      .catch((e: unknown) => {
        const code = (e as { name?: string; $metadata?: { httpStatusCode?: number } }) ?? {};
        if (code.name === 'NoSuchKey' || code.$metadata?.httpStatusCode === 404) {
          throw notFound(`${name} is missing from storage.`);
        }
        throw new HttpError(503, 'Storage is not answering; try again shortly.');
      });
    res.type(contentType);
    if (download) res.attachment(name);
    if (obj.ContentLength !== undefined) res.setHeader('content-length', String(obj.ContentLength));
    (obj.Body as Readable).pipe(res);
  };

  r.get('/:runId/series', requirePermission('runs.read'), async (req, res) => {
    await streamArtifact(req.member!.studioId, String(req.params.runId), 'series.json', res, false);
  });

  r.get('/:runId/files/:name', requirePermission('runs.read'), async (req, res) => {
    await streamArtifact(req.member!.studioId, String(req.params.runId), String(req.params.name), res, true);
  });
  return r;
}
