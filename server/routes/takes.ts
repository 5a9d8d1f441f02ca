// Takes: asking for cue runs of a take, and the take's proxy video. Uploading a take is under its
// track (tracks.ts).
import { randomUUID } from 'node:crypto';
import { Router } from 'express';
import type { Request } from 'express';
import { DeleteObjectCommand } from '@aws-sdk/client-s3';
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
import { toRunSummary, toTake } from '../pipeline/views';
import {
  declaredVideoType,
  receiveProxyVideo,
  sendProxyVideo,
  sendStoredFile,
} from '../pipeline/proxy-video';
import { isGzipName } from '../pipeline/track-stream';
import { recordAudit } from '../audit';
import { storageHttpError } from '../storage';

/** POST /takes/:takeId/runs: queue cue runs of a take for venues (one per venue, deduplicated). */
export function takesRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  const findTake = async (req: Request) => {
    const takeId = String(req.params.takeId);
    if (!isUuid(takeId)) throw notFound('No such take.');
    const [take] = await deps.db
      .select()
      .from(takes)
      .where(inStudio(takes, req.member!.studioId, eq(takes.id, takeId)));
    if (!take) throw notFound('No such take.');
    return take;
  };
  const removeObject = (key: string) =>
    deps.storage.client.send(new DeleteObjectCommand({ Bucket: deps.storage.bucket, Key: key })).then(
      () => undefined,
      (e: unknown) => deps.log(`proxy video ${key} could not be removed from storage: ${String(e)}`),
    );

  /**
   * PUT /takes/:takeId/proxy-video: the body is the video (Content-Type video/mp4 or video/webm), up
   * to PROXY_VIDEO_MAX_BYTES. It replaces an earlier one; the old file is removed once the new one is
   * recorded. A refused upload stores nothing and changes nothing.
   */
  r.put('/:takeId/proxy-video', requirePermission('takes.upload'), async (req, res) => {
    const studioId = req.member!.studioId;
    const type = declaredVideoType(req.headers['content-type']);
    const take = await findTake(req);
    const key = `studios/${studioId}/takes/${take.id}/proxy-${randomUUID()}.${type === 'video/mp4' ? 'mp4' : 'webm'}`;
    const got = await receiveProxyVideo(req, {
      storage: deps.storage,
      key,
      type,
      maxBytes: deps.env.PROXY_VIDEO_MAX_BYTES,
      res,
    }).catch((e: unknown) => {
      if (e instanceof HttpError) throw e;
      throw storageHttpError(e, 'the proxy video', 'was not stored');
    });
    const at = (deps.now ?? (() => new Date()))();
    const row = await deps.db.transaction(async (tx) => {
      const [updated] = await tx
        .update(takes)
        .set({
          proxyVideoKey: key,
          proxyVideoType: type,
          proxyVideoBytes: got.sizeBytes,
          proxyVideoSha256: got.sha256,
          proxyVideoAt: at,
        })
        .where(inStudio(takes, studioId, eq(takes.id, take.id)))
        .returning();
      await recordAudit(tx, {
        studioId,
        actor: actorOf(req),
        action: 'take.proxy_video_set',
        subjectType: 'take',
        subjectId: take.id,
        detail: { type, sizeBytes: got.sizeBytes, sha256: got.sha256, replaced: take.proxyVideoSha256 },
      });
      return updated!;
    });
    if (take.proxyVideoKey) await removeObject(take.proxyVideoKey);
    res.status(200).json(toTake(row));
  });

  /** GET /takes/:takeId/file: the take's file as uploaded (byte for byte; its SHA-256 is on the take). */
  r.get('/:takeId/file', requirePermission('tracks.read'), async (req, res) => {
    const take = await findTake(req);
    await sendStoredFile(res, {
      storage: deps.storage,
      key: take.storageKey,
      type: isGzipName(take.fileName) ? 'application/gzip' : 'text/csv; charset=utf-8',
      fileName: take.fileName,
      sizeBytes: take.sizeBytes,
    }).catch((e: unknown) => {
      if (res.headersSent) {
        res.destroy();
        return;
      }
      throw storageHttpError(e, `the file of take ${take.number}`);
    });
  });

  /** GET /takes/:takeId/proxy-video: the video, with byte ranges (206) for seeking. */
  r.get('/:takeId/proxy-video', requirePermission('tracks.read'), async (req, res) => {
    const take = await findTake(req);
    if (!take.proxyVideoKey || !take.proxyVideoType) throw notFound('This take has no proxy video.');
    await sendProxyVideo(res, {
      storage: deps.storage,
      key: take.proxyVideoKey,
      type: take.proxyVideoType,
      sizeBytes: take.proxyVideoBytes ?? 0,
      range: req.headers.range,
    }).catch((e: unknown) => {
      if (res.headersSent) {
        res.destroy();
        return;
      }
      throw storageHttpError(e, 'the proxy video');
    });
  });

  /** DELETE /takes/:takeId/proxy-video: the take goes back to having none. */
  r.delete('/:takeId/proxy-video', requirePermission('takes.upload'), async (req, res) => {
    const studioId = req.member!.studioId;
    const take = await findTake(req);
    if (!take.proxyVideoKey) throw notFound('This take has no proxy video.');
    const row = await deps.db.transaction(async (tx) => {
      const [updated] = await tx
        .update(takes)
        .set({
          proxyVideoKey: null,
          proxyVideoType: null,
          proxyVideoBytes: null,
          proxyVideoSha256: null,
          proxyVideoAt: null,
        })
        .where(inStudio(takes, studioId, eq(takes.id, take.id)))
        .returning();
      await recordAudit(tx, {
        studioId,
        actor: actorOf(req),
        action: 'take.proxy_video_removed',
        subjectType: 'take',
        subjectId: take.id,
        detail: { sha256: take.proxyVideoSha256 },
      });
      return updated!;
    });
    await removeObject(take.proxyVideoKey);
    res.json(toTake(row));
  });

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
