// Cue runs: read one, its chart series and its artifacts (runs are asked for on a take, takes.ts).
import { Router } from 'express';
import type { Response } from 'express';
import type { Readable } from 'node:stream';
import { GetObjectCommand } from '@aws-sdk/client-s3';
import { eq } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { cueRuns, takes, tracks, venues } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { isUuid } from '../lib/validate';
import { notFound } from '../lib/http-error';
import type { RunDetail } from '../../shared/schemas/pipeline';
import { toRunSummary, toTake, versionRef } from '../pipeline/views';
import { SERIES_FILE, runFileContentType } from '../../shared/schemas/run-outputs';

export function runsRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });

  const load = async (studioId: string, runId: string) => {
    if (!isUuid(runId)) throw notFound('No such run.');
    const [row] = await deps.db
      .select({ run: cueRuns, take: takes, venueName: venues.name, trackTitle: tracks.title })
      .from(cueRuns)
      .innerJoin(takes, eq(takes.id, cueRuns.takeId))
      .innerJoin(venues, eq(venues.id, cueRuns.venueId))
      .innerJoin(tracks, eq(tracks.id, cueRuns.trackId))
      .where(inStudio(cueRuns, studioId, eq(cueRuns.id, runId)));
    if (!row) throw notFound('No such run.');
    return row;
  };

  r.get('/:runId', requirePermission('runs.read'), async (req, res) => {
    const studioId = req.member!.studioId;
    const { run, take, venueName, trackTitle } = await load(studioId, String(req.params.runId));
    const s = run.summary;
    const budgetVersion = await versionRef(deps.db, studioId, run.budgetVersionId);
    const out: RunDetail = {
      ...toRunSummary(run, take.number, venueName),
      trackTitle,
      take: toTake(take),
      cueingVersion: await versionRef(deps.db, studioId, run.cueingVersionId),
      budgetVersion: budgetVersion ?? { id: run.budgetVersionId, name: '(removed)', version: 0 },
      result: s
        ? {
            within: s.within,
            findings: s.findings,
            uses: s.uses,
            ...(s.comfort ? { comfort: s.comfort } : {}),
            notes: s.notes,
          }
        : null,
      budgetIsDemo: s ? s.budgetIsDemo : null,
      files: s?.files.filter((f) => f.name !== SERIES_FILE.name) ?? [],
    };
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
