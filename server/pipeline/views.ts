// Rows to API shapes, and the small queries the pipeline routes share.
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../db/client';
import { cueRuns, profileVersions, profiles, takes, venues } from '../db/schema';
import type { CueRunRow, TakeRow } from '../db/schema';
import { inStudio } from '../db/scope';
import type { RunSummary, Take } from '../../shared/schemas/pipeline';
import type { FilmSync } from '../../shared/schemas/film-sync';
import type { StoredRunSummary } from '../../shared/schemas/run-outputs';

/** The take's film sync from its columns, or null when it has none. */
export function takeFilmSync(t: TakeRow): FilmSync | null {
  if (!t.frameRate) return null;
  return {
    frameRate: t.frameRate,
    startTimecode: t.startTimecode ?? '00:00:00:00',
    offset_frames: t.filmOffsetFrames ?? 0,
  };
}

export const toTake = (t: TakeRow): Take => ({
  id: t.id,
  trackId: t.trackId,
  number: t.number,
  kind: t.kind,
  layout: t.layout,
  fileName: t.fileName,
  sizeBytes: t.sizeBytes,
  sha256: t.sha256,
  samples: t.samples,
  duration_s: t.duration_s,
  uploadedVia: t.uploadedVia,
  filmSync: takeFilmSync(t),
  proxyVideo:
    t.proxyVideoKey && t.proxyVideoType && t.proxyVideoAt
      ? {
          type: t.proxyVideoType,
          sizeBytes: t.proxyVideoBytes ?? 0,
          sha256: t.proxyVideoSha256 ?? '',
          uploadedAt: t.proxyVideoAt.toISOString(),
        }
      : null,
  createdAt: t.createdAt.toISOString(),
});

/** The worst use of a finished run (the headline number of lists). */
export function worstUse(summary: StoredRunSummary | null): { ratio: number; check: string } | null {
  const uses = summary?.uses;
  if (!uses?.length) return null;
  let worst = uses[0]!;
  for (const u of uses) if (u.ratio > worst.ratio) worst = u;
  return { ratio: worst.ratio, check: `${worst.check} ${worst.subject}` };
}

/**
 * Seconds without a heartbeat after which a run being cued shows as stalled (RUN_STALL_S; the server
 * sets it from its environment at start, see createApp).
 */
let stallAfter_s = 60;
export function setRunStallSeconds(s: number): void {
  stallAfter_s = s;
}

/** Whole seconds since a run's worker last vouched for it: its heartbeat, else its start, else its queuing. */
export function silentSeconds(
  r: Pick<CueRunRow, 'heartbeatAt' | 'startedAt' | 'createdAt'>,
  now: Date = new Date(),
): number {
  const last = r.heartbeatAt ?? r.startedAt ?? r.createdAt;
  return Math.max(0, Math.round((now.getTime() - last.getTime()) / 1000));
}

export function toRunSummary(r: CueRunRow, takeNumber: number, venueName: string): RunSummary {
  const w = worstUse(r.summary);
  const findings = r.summary?.findings;
  const silent_s = r.state === 'cueing' ? silentSeconds(r) : null;
  return {
    id: r.id,
    trackId: r.trackId,
    takeId: r.takeId,
    takeNumber,
    venueId: r.venueId,
    venueName,
    state: r.state,
    progress: r.progress,
    failureReason: r.failureReason,
    lastError: r.lastError,
    attempts: r.attempts,
    stalled: silent_s !== null && silent_s > stallAfter_s,
    silent_s,
    worstRatio: w?.ratio ?? null,
    worstCheck: w?.check ?? null,
    findingCount: findings ? findings.length : null,
    createdAt: r.createdAt.toISOString(),
    finishedAt: r.finishedAt?.toISOString() ?? null,
  };
}

/** Runs of a studio (optionally of some tracks), newest first, with take number and venue name. */
export async function listRuns(db: Db, studioId: string, trackIds?: string[]): Promise<RunSummary[]> {
  if (trackIds && trackIds.length === 0) return [];
  const rows = await db
    .select({ run: cueRuns, takeNumber: takes.number, venueName: venues.name })
    .from(cueRuns)
    .innerJoin(takes, eq(takes.id, cueRuns.takeId))
    .innerJoin(venues, eq(venues.id, cueRuns.venueId))
    .where(inStudio(cueRuns, studioId, trackIds ? inArray(cueRuns.trackId, trackIds) : undefined))
    .orderBy(desc(cueRuns.createdAt), desc(cueRuns.id));
  return rows.map((r) => toRunSummary(r.run, r.takeNumber, r.venueName));
}

/**
 * For the tracks table: per track of `trackIds`, the latest run at each venue (newest created_at, then
 * the greater id, the order of listRuns) with its state and worst use ratio. The ratio is taken in
 * SQL from the summary's uses, so the summaries never leave the database.
 */
export async function latestRunsPerVenue(
  db: Db,
  studioId: string,
  trackIds: string[],
): Promise<
  {
    trackId: string;
    venueId: string;
    venueName: string;
    state: RunSummary['state'];
    worstRatio: number | null;
  }[]
> {
  if (trackIds.length === 0) return [];
  const rows = await db.execute<{
    track_id: string;
    venue_id: string;
    venue_name: string;
    state: RunSummary['state'];
    worst: number | null;
  }>(sql`
    WITH latest AS (
      SELECT DISTINCT ON (track_id, venue_id) id
      FROM ${cueRuns}
      WHERE ${cueRuns.studioId} = ${studioId} AND ${cueRuns.trackId} IN ${trackIds}
      ORDER BY track_id, venue_id, created_at DESC, id DESC
    )
    SELECT r.track_id, r.venue_id, v.name AS venue_name, r.state,
      (SELECT max((u ->> 'ratio')::float8) FROM jsonb_array_elements(r.summary -> 'uses') u) AS worst
    FROM latest JOIN ${cueRuns} r ON r.id = latest.id JOIN ${venues} v ON v.id = r.venue_id
  `);
  return rows.rows.map((r) => ({
    trackId: r.track_id,
    venueId: r.venue_id,
    venueName: r.venue_name,
    state: r.state,
    worstRatio: r.worst === null ? null : Number(r.worst),
  }));
}

/** Name and number of a profile version of this studio, or null. */
export async function versionRef(db: Db, studioId: string, id: string | null) {
  if (!id) return null;
  const [v] = await db
    .select({ id: profileVersions.id, version: profileVersions.version, name: profiles.name })
    .from(profileVersions)
    .innerJoin(profiles, and(eq(profiles.id, profileVersions.profileId)))
    .where(inStudio(profileVersions, studioId, eq(profileVersions.id, id)));
  return v ?? null;
}
