// Tracks and takes: list, create, read, and the streamed take upload (browser session or API token).
import { Router } from 'express';
import type { Response } from 'express';
import { randomUUID } from 'node:crypto';
import { and, asc, count, desc, eq, exists, ilike, inArray, max, notExists, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { AppDeps } from '../deps';
import { cueRuns, takes, tracks } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { isUuid, parseBody } from '../lib/validate';
import { notFound } from '../lib/http-error';
import { actorOf } from '../lib/actor';
import { recordAudit } from '../audit';
import { createTrackBody, tracksQuery, uploadQuery } from '../../shared/schemas/pipeline';
import type { TrackDetail, TrackPage, TrackSummary, UploadedTake } from '../../shared/schemas/pipeline';
import { receiveTake } from '../pipeline/upload';
import { latestRunsPerVenue, listRuns, toTake } from '../pipeline/views';
import { VersionedAnswers } from '../pipeline/tracks-cache';
import type { CachedAnswer } from '../pipeline/tracks-cache';
import { venueScope } from '../auth/permissions';

export function tracksRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  const now = deps.now ?? (() => new Date());
  const answers = new VersionedAnswers();
  const sendAnswer = (res: Response, a: CachedAnswer) => {
    res.set({ ETag: a.etag, 'Content-Type': 'application/json; charset=utf-8' }).send(a.body);
  };

  const detail = async (studioId: string, trackId: string): Promise<TrackDetail> => {
    if (!isUuid(trackId)) throw notFound('No such track.');
    const [t] = await deps.db
      .select()
      .from(tracks)
      .where(inStudio(tracks, studioId, eq(tracks.id, trackId)));
    if (!t) throw notFound('No such track.');
    const tk = await deps.db
      .select()
      .from(takes)
      .where(inStudio(takes, studioId, eq(takes.trackId, t.id)))
      .orderBy(desc(takes.number));
    return {
      id: t.id,
      title: t.title,
      film: t.film,
      createdAt: t.createdAt.toISOString(),
      takes: tk.map(toTake),
      runs: await listRuns(deps.db, studioId, [t.id]),
    };
  };

  r.get('/', requirePermission('tracks.read'), async (req, res) => {
    const studioId = req.member!.studioId;
    // The answer depends on the studio, the query and (should the table ever be scoped by venue)
    // the member's venue scope; it is kept per the data version read with the membership. Kept
    // under the query string as sent, so a repeated query is answered before it is parsed again
    // (only a query that parsed once has an answer kept).
    const version = req.member!.dataVersion;
    const raw = req.originalUrl.indexOf('?');
    const cacheKey = `${JSON.stringify(venueScope(req.member!))}?${raw < 0 ? '' : req.originalUrl.slice(raw + 1)}`;
    if (version !== undefined) {
      const hit = answers.get(studioId, version, cacheKey);
      if (hit) return sendAnswer(res, hit);
    }
    const q = parseBody(tracksQuery, req.query, 'The track list query');
    // The filter looks at what each row shows: the latest run per venue (newest created_at, then the
    // greater id, the same order as listRuns), never an older run of the track.
    const later = alias(cueRuns, 'later_run');
    const runFilter =
      q.state || q.venueId
        ? exists(
            deps.db
              .select({ one: sql`1` })
              .from(cueRuns)
              .where(
                and(
                  eq(cueRuns.trackId, tracks.id),
                  q.state ? eq(cueRuns.state, q.state) : undefined,
                  q.venueId ? eq(cueRuns.venueId, q.venueId) : undefined,
                  notExists(
                    deps.db
                      .select({ one: sql`1` })
                      .from(later)
                      .where(
                        and(
                          eq(later.trackId, cueRuns.trackId),
                          eq(later.venueId, cueRuns.venueId),
                          sql`(${later.createdAt}, ${later.id}) > (${cueRuns.createdAt}, ${cueRuns.id})`,
                        ),
                      ),
                  ),
                ),
              ),
          )
        : undefined;
    const where = inStudio(
      tracks,
      studioId,
      runFilter,
      q.q ? ilike(tracks.title, `%${q.q.replace(/[%_\\]/g, (c) => `\\${c}`)}%`) : undefined,
    );
    const sortCol =
      q.sort === 'title' ? tracks.title : q.sort === 'createdAt' ? tracks.createdAt : tracks.updatedAt;
    // The count and the page, then the page's take counts and latest runs: each pair at once, on
    // two pooled connections.
    const [[total], rows] = await Promise.all([
      deps.db.select({ n: count() }).from(tracks).where(where),
      deps.db
        .select()
        .from(tracks)
        .where(where)
        .orderBy(q.dir === 'asc' ? asc(sortCol) : desc(sortCol), asc(tracks.id))
        .limit(q.pageSize)
        .offset((q.page - 1) * q.pageSize),
    ]);
    const ids = rows.map((t) => t.id);
    const [takeCounts, latest] = await Promise.all([
      ids.length
        ? deps.db
            .select({ trackId: takes.trackId, n: count() })
            .from(takes)
            .where(inStudio(takes, studioId, inArray(takes.trackId, ids)))
            .groupBy(takes.trackId)
        : [],
      latestRunsPerVenue(deps.db, studioId, ids),
    ]);
    const items: TrackSummary[] = rows.map((t) => {
      const perVenue: TrackSummary['venues'] = latest
        .filter((run) => run.trackId === t.id)
        .map(({ venueId, venueName, state, worstRatio }) => ({ venueId, venueName, state, worstRatio }));
      perVenue.sort((a, b) => a.venueName.localeCompare(b.venueName));
      return {
        id: t.id,
        title: t.title,
        film: t.film,
        takes: takeCounts.find((c) => c.trackId === t.id)?.n ?? 0,
        createdAt: t.createdAt.toISOString(),
        updatedAt: t.updatedAt.toISOString(),
        venues: perVenue,
      };
    });
    const page: TrackPage = { items, total: total?.n ?? 0, page: q.page, pageSize: q.pageSize };
    const body = JSON.stringify(page);
    if (version === undefined) res.type('application/json').send(body);
    else sendAnswer(res, answers.set(studioId, version, cacheKey, body));
  });

  r.post('/', requirePermission('tracks.write'), async (req, res) => {
    const body = parseBody(createTrackBody, req.body, 'The track form');
    const studioId = req.member!.studioId;
    const [t] = await deps.db.transaction(async (tx) => {
      const rows = await tx
        .insert(tracks)
        .values({ studioId, title: body.title, film: body.film, createdBy: req.user?.id ?? null })
        .returning();
      await recordAudit(tx, {
        studioId,
        actor: actorOf(req),
        action: 'track.created',
        subjectType: 'track',
        subjectId: rows[0]!.id,
        detail: { title: body.title },
      });
      return rows;
    });
    res.status(201).json(await detail(studioId, t!.id));
  });

  r.get('/:trackId', requirePermission('tracks.read'), async (req, res) => {
    res.json(await detail(req.member!.studioId, String(req.params.trackId)));
  });

  r.post('/:trackId/takes', requirePermission('takes.upload'), async (req, res) => {
    const studioId = req.member!.studioId;
    const trackId = String(req.params.trackId);
    // Film sync is checked before a byte of the file is read, so a bad field stores nothing.
    const { fileName, filmSync } = parseBody(uploadQuery, req.query, 'The upload');
    if (!isUuid(trackId)) throw notFound('No such track.');
    const [t] = await deps.db
      .select()
      .from(tracks)
      .where(inStudio(tracks, studioId, eq(tracks.id, trackId)));
    if (!t) throw notFound('No such track.');
    const takeId = randomUUID();
    const key = `studios/${studioId}/takes/${takeId}/${fileName}`;
    const got = await receiveTake(req, {
      res,
      storage: deps.storage,
      key,
      fileName,
      maxBytes: deps.env.UPLOAD_MAX_BYTES,
    });
    const n = got.track.length;
    const duration_s = n > 1 ? (got.track.time_s[n - 1] as number) - (got.track.time_s[0] as number) : 0;
    // The same bytes uploaded to this track before: stored again as a new take, with a warning.
    const [same] = await deps.db
      .select({ id: takes.id, number: takes.number })
      .from(takes)
      .where(inStudio(takes, studioId, and(eq(takes.trackId, t.id), eq(takes.sha256, got.sha256))))
      .orderBy(asc(takes.number))
      .limit(1);
    const row = await deps.db.transaction(async (tx) => {
      // Numbers per track: lock the track row so two uploads cannot take the same number.
      await tx.execute(sql`select id from tracks where id = ${t.id} for update`);
      const [last] = await tx
        .select({ n: max(takes.number) })
        .from(takes)
        .where(inStudio(takes, studioId, eq(takes.trackId, t.id)));
      const [inserted] = await tx
        .insert(takes)
        .values({
          id: takeId,
          studioId,
          trackId: t.id,
          number: (last?.n ?? 0) + 1,
          kind: got.track.kind,
          layout: got.track.layout,
          fileName,
          storageKey: key,
          sizeBytes: got.sizeBytes,
          sha256: got.sha256,
          samples: n,
          duration_s,
          uploadedBy: req.user?.id ?? null,
          uploadedVia: req.member!.tokenId ? 'token' : 'browser',
          frameRate: filmSync?.frameRate ?? null,
          startTimecode: filmSync?.startTimecode ?? null,
          filmOffsetFrames: filmSync?.offset_frames ?? null,
        })
        .returning();
      await tx.update(tracks).set({ updatedAt: now() }).where(eq(tracks.id, t.id));
      await recordAudit(tx, {
        studioId,
        actor: actorOf(req),
        action: 'take.uploaded',
        subjectType: 'take',
        subjectId: takeId,
        detail: {
          trackId: t.id,
          fileName,
          sha256: got.sha256,
          sizeBytes: got.sizeBytes,
          kind: got.track.kind,
          filmSync,
        },
      });
      return inserted!;
    });
    const answer: UploadedTake = { ...toTake(row), duplicateOf: same ?? null };
    res.status(201).json(answer);
  });

  return r;
}
