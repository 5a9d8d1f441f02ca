// Cue runs: read one, its chart series and its artifacts (runs are asked for on a take, takes.ts).
import { Router } from 'express';
import type { Response } from 'express';
import type { Readable } from 'node:stream';
import { GetObjectCommand } from '@aws-sdk/client-s3';
import type { AppDeps } from '../deps';
import { requirePermission } from '../auth/require-permission';
import { notFound } from '../lib/http-error';
import { loadRun, runDetail } from '../pipeline/run-detail';
import { runFileContentType } from '../../shared/schemas/run-outputs';

export function runsRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });

  const load = (studioId: string, runId: string) => loadRun(deps.db, studioId, runId);

  r.get('/:runId', requirePermission('runs.read'), async (req, res) => {
    const studioId = req.member!.studioId;
    const out = await runDetail(deps.db, studioId, await load(studioId, String(req.params.runId)));
    res.json(out);
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
      .catch(() => {
        throw notFound(`${name} is missing from storage.`);
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
