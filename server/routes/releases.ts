// Releases of a studio (GET .../releases, GET .../releases/:release), their packages (streamed, every
// download logged; 410 once withdrawn) and what happens to them afterwards: a producer withdraws, a
// venue operator acknowledges the package as installed or reports a problem. Operators see only their
// venues' releases (another venue's is 404). Releasing a run is POST .../runs/:run/release (reviews.ts).
import { Router } from 'express';
import type { Readable } from 'node:stream';
import { GetObjectCommand } from '@aws-sdk/client-s3';
import type { AppDeps } from '../deps';
import { requirePermission } from '../auth/require-permission';
import { HttpError } from '../lib/http-error';
import { parseBody } from '../lib/validate';
import { actorOf } from '../lib/actor';
import { isMissingObject } from '../storage';
import {
  acknowledgeRelease,
  listReleases,
  loadRelease,
  logDownload,
  releaseView,
  reportProblem,
  withdrawRelease,
} from '../pipeline/releases';
import type { ReleaseActor } from '../pipeline/releases';
import { acknowledgeBody, problemBody, releasesQuery, withdrawBody } from '../../shared/schemas/release';

/** The signed-in member as a release actor; API tokens do not act on releases. */
function releaseActor(req: Express.Request): ReleaseActor {
  const m = req.member!;
  const actor = actorOf(req as never);
  if (!m.userId || !actor) throw new HttpError(403, 'Releases are handled by people, not API tokens.');
  return { userId: m.userId, email: actor.email, roles: m.roles, venueIds: m.venueIds };
}

export function releasesRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });

  r.get('/', requirePermission('releases.read'), async (req, res) => {
    const m = req.member!;
    const q = parseBody(releasesQuery, req.query, 'The release filters');
    res.json(await listReleases(deps.db, m.studioId, m, q));
  });

  r.get('/:releaseId', requirePermission('releases.read'), async (req, res) => {
    const m = req.member!;
    const row = await loadRelease(deps.db, m.studioId, m, String(req.params.releaseId));
    res.json(await releaseView(deps.db, m.studioId, row));
  });

  r.get('/:releaseId/package', requirePermission('releases.download'), async (req, res) => {
    const m = req.member!;
    const row = await loadRelease(deps.db, m.studioId, m, String(req.params.releaseId));
    if (row.state === 'withdrawn')
      throw new HttpError(
        410,
        `This release was withdrawn${row.withdrawReason ? `: ${row.withdrawReason}` : ''}. Do not load it.`,
      );
    if (!row.packageKey || (row.state !== 'ready' && row.state !== 'superseded'))
      throw new HttpError(
        409,
        row.state === 'failed'
          ? 'The package of this release could not be built.'
          : 'The package is still being built.',
      );
    const obj = await deps.storage.client
      .send(new GetObjectCommand({ Bucket: deps.storage.bucket, Key: row.packageKey }))
      .catch((e: unknown) => {
        if (isMissingObject(e)) throw new HttpError(500, 'The package is missing from storage.');
        throw new HttpError(503, 'Storage is not answering; try the download again shortly.');
      });
    await logDownload(deps.db, m.studioId, actorOf(req), m.userId, row);
    res.type('application/zip');
    res.attachment(row.packageKey.split('/').pop() ?? 'package.zip');
    if (obj.ContentLength !== undefined) res.setHeader('content-length', String(obj.ContentLength));
    if (row.packageSha256) res.setHeader('x-package-sha256', row.packageSha256);
    res.setHeader('cache-control', 'private, no-store');
    (obj.Body as Readable).pipe(res);
  });

  r.post('/:releaseId/withdraw', requirePermission('releases.withdraw'), async (req, res) => {
    const m = req.member!;
    const actor = releaseActor(req);
    const body = parseBody(withdrawBody, req.body, 'The withdrawal');
    const after = await deps.db.transaction(async (tx) => {
      const { after: row } = await withdrawRelease(
        tx,
        m.studioId,
        actor,
        String(req.params.releaseId),
        body.reason,
      );
      return releaseView(tx, m.studioId, row);
    });
    res.json(after);
  });

  r.post('/:releaseId/acknowledge', requirePermission('releases.acknowledge'), async (req, res) => {
    const m = req.member!;
    const actor = releaseActor(req);
    const body = parseBody(acknowledgeBody, req.body, 'The acknowledgement');
    const out = await deps.db.transaction(async (tx) => {
      const row = await acknowledgeRelease(tx, m.studioId, actor, String(req.params.releaseId), body.note);
      return releaseView(tx, m.studioId, row);
    });
    res.status(201).json(out);
  });

  r.post('/:releaseId/problems', requirePermission('releases.report'), async (req, res) => {
    const m = req.member!;
    const actor = releaseActor(req);
    const body = parseBody(problemBody, req.body, 'The problem report');
    const out = await deps.db.transaction(async (tx) => {
      const { row } = await reportProblem(tx, m.studioId, actor, String(req.params.releaseId), body.text);
      return releaseView(tx, m.studioId, row);
    });
    res.status(201).json(out);
  });
  return r;
}
