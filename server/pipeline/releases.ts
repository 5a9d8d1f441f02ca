// Releases of cleared runs: a producer releases (the release row, the run's state and the worker's
// build job in one transaction), the worker builds the package and supersedes older releases of the
// same track at the same venue, a producer withdraws, a venue operator downloads, acknowledges or
// reports a problem. Each step is written to the audit log; the venue's people hear of it by mail.
import { count, desc, eq, inArray, max, ne, sql } from 'drizzle-orm';
import type PgBoss from 'pg-boss';
import type pg from 'pg';
import type { Db, Tx } from '../db/client';
import { inClientTransaction } from '../db/client';
import {
  cueRuns,
  releaseAcknowledgements,
  releaseDownloads,
  releaseProblems,
  releases,
  takes,
  tracks,
  users,
  venues,
} from '../db/schema';
import type { ReleaseRow } from '../db/schema';
import { inStudio, visibleVenues } from '../db/scope';
import { canSeeVenue } from '../auth/permissions';
import type { VenueScopeMember } from '../../shared/permissions';
import { HttpError, notFound } from '../lib/http-error';
import { isUuid } from '../lib/validate';
import { recordAudit } from '../audit';
import { QUEUES } from '../queue';
import { loadRun } from './run-detail';
import { subjectOf } from './review';
import { releaseRule } from '../../shared/review-rules';
import { buildReleaseJobSchema } from '../../shared/schemas/release';
import type { Release, ReleaseCreated, ReleaseState } from '../../shared/schemas/release';
import type { Person } from '../../shared/schemas/review';
import { packageName } from './release-package';
import { queueMail, recipientsByRole } from '../notifications/outbox';
import { ROLE } from '../../shared/schemas/roles';
import { appPaths } from '../../shared/app-paths';
import type { MailKind } from '../../shared/schemas/notifications';

/** The line every release mail ends with, before its link. */
const MAIL_CAUTION =
  "Load a package only after the venue's own checks. Legwork supports, and never replaces, the ride " +
  "manufacturer's engineering, the applicable codes and a qualified person's sign-off.";

/**
 * Queues the mail about a release step in the caller's transaction: ready and withdrawn go to the
 * venue's operators, a problem to the studio's producers and safety reviewers.
 */
export async function mailAboutRelease(
  tx: Db | Tx,
  studioId: string,
  row: ReleaseRow,
  kind: Extract<MailKind, 'release_ready' | 'release_withdrawn' | 'problem_reported'>,
  words: { by?: string; reason?: string; text?: string } = {},
): Promise<number> {
  const n = await auditSubject(tx, studioId, row);
  const [take] = await tx
    .select({ number: takes.number })
    .from(cueRuns)
    .innerJoin(takes, eq(takes.id, cueRuns.takeId))
    .where(inStudio(cueRuns, studioId, eq(cueRuns.id, row.runId)));
  const what = `${n.trackTitle}, take ${take?.number ?? '?'}, for ${n.venueName}`;
  const userIds =
    kind === 'problem_reported'
      ? await recipientsByRole(tx, studioId, [ROLE.producer, ROLE.safety_reviewer])
      : await recipientsByRole(tx, studioId, [ROLE.venue_operator], { venueId: row.venueId });
  const mail = {
    release_ready: {
      subject: `Package ready: ${what}`,
      text: `The release package of ${what} is built and ready to download.\nSHA-256 of the zip: ${row.packageSha256 ?? '?'}\nCheck it with \`legwork verify\` before loading.\n\n${MAIL_CAUTION}`,
    },
    release_withdrawn: {
      subject: `Release withdrawn: ${what}`,
      text: `${words.by ?? 'A producer'} withdrew the release of ${what}: "${words.reason ?? ''}".\nDo not load this package; if it is installed, take it out of service as the venue's procedures say.\n\n${MAIL_CAUTION}`,
    },
    problem_reported: {
      subject: `Problem reported: ${what}`,
      text: `${words.by ?? 'A venue operator'} reported a problem with the release of ${what}:\n\n"${words.text ?? ''}"`,
    },
  }[kind];
  return queueMail(tx, { studioId, kind, userIds, ...mail, path: appPaths.release(studioId, row.id) });
}

/** A member acting on releases, with the address the audit log records. */
export interface ReleaseActor extends VenueScopeMember {
  userId: string;
  email: string;
}

/** States in which a package exists and may be downloaded. */
export const DOWNLOADABLE: readonly ReleaseState[] = ['ready', 'superseded'];

/** pg-boss send options of a build job: a few retries with backoff (storage outages), id = release id. */
export const buildReleaseJobOptions = (releaseId: string): PgBoss.SendOptions => ({
  id: releaseId,
  retryLimit: 3,
  retryDelay: 5,
  retryBackoff: true,
  expireInSeconds: 10 * 60,
});

/** Where a release's package lives in storage. */
export const packageKeyOf = (studioId: string, releaseId: string, name: string) =>
  `studios/${studioId}/releases/${releaseId}/${name}`;

/**
 * Releases a cleared run to its venue: the rule of shared/review-rules.ts under the run's row lock, the
 * release row, the run's move to `released`, the build job and the audit, all in one transaction.
 */
export async function createRelease(
  pool: pg.Pool,
  boss: PgBoss | null,
  opts: { studioId: string; runId: string; actor: ReleaseActor },
): Promise<ReleaseCreated> {
  const { studioId, runId, actor } = opts;
  return inClientTransaction(pool, async (tx, sqlOn) => {
    const loaded = await loadRun(tx, studioId, runId, true);
    if (!canSeeVenue(actor, loaded.run.venueId)) throw notFound('No such run.');
    const subject = await subjectOf(tx, studioId, loaded);
    const rule = releaseRule(subject, { userId: actor.userId, roles: actor.roles });
    if (!rule.allowed) throw new HttpError(rule.status, rule.why ?? 'This run cannot be released.');
    if (!boss) throw new HttpError(503, 'The job queue is not running; try again shortly.');
    const [row] = await tx
      .insert(releases)
      .values({
        studioId,
        runId,
        trackId: loaded.run.trackId,
        venueId: loaded.run.venueId,
        state: 'building',
        releasedBy: actor.userId,
      })
      .returning();
    await tx
      .update(cueRuns)
      .set({ state: 'released' })
      .where(inStudio(cueRuns, studioId, eq(cueRuns.id, runId)));
    await boss.send(QUEUES.buildRelease, buildReleaseJobSchema.parse({ releaseId: row!.id, studioId }), {
      ...buildReleaseJobOptions(row!.id),
      db: sqlOn,
    });
    await recordAudit(tx, {
      studioId,
      actor: { id: actor.userId, email: actor.email },
      action: 'release.created',
      subjectType: 'release',
      subjectId: row!.id,
      detail: {
        runId,
        trackId: loaded.run.trackId,
        trackTitle: loaded.trackTitle,
        venueId: loaded.run.venueId,
        venueName: loaded.venueName,
      },
    });
    return { id: row!.id, state: row!.state };
  });
}

/** The release row, or 404 (not a UUID, another studio's, or a venue the member does not see). */
export async function loadRelease(
  db: Db | Tx,
  studioId: string,
  member: VenueScopeMember,
  releaseId: string,
  forUpdate = false,
): Promise<ReleaseRow> {
  if (!isUuid(releaseId)) throw notFound('No such release.');
  const q = db
    .select()
    .from(releases)
    .where(inStudio(releases, studioId, eq(releases.id, releaseId)));
  const [row] = forUpdate ? await q.for('update') : await q;
  if (!row || !canSeeVenue(member, row.venueId)) throw notFound('No such release.');
  return row;
}

export interface ReleaseFilters {
  venueId?: string | undefined;
  trackId?: string | undefined;
  runId?: string | undefined;
  state?: ReleaseState | undefined;
  states?: readonly ReleaseState[];
}

/** The member's visible releases matching the filters, newest first, as the API answers them. */
export async function listReleases(
  db: Db | Tx,
  studioId: string,
  member: VenueScopeMember,
  f: ReleaseFilters = {},
): Promise<Release[]> {
  const rows = await db
    .select({ r: releases })
    .from(releases)
    .innerJoin(venues, eq(venues.id, releases.venueId))
    .where(
      inStudio(
        releases,
        studioId,
        visibleVenues(member),
        f.venueId ? eq(releases.venueId, f.venueId) : undefined,
        f.trackId ? eq(releases.trackId, f.trackId) : undefined,
        f.runId ? eq(releases.runId, f.runId) : undefined,
        f.state ? eq(releases.state, f.state) : undefined,
        f.states ? inArray(releases.state, [...f.states]) : undefined,
      ),
    )
    .orderBy(desc(releases.createdAt), desc(releases.id));
  return releaseViews(
    db,
    studioId,
    rows.map((x) => x.r),
  );
}

/** Releases as the API answers them: names, people, acknowledgements, problems and download counts. */
export async function releaseViews(db: Db | Tx, studioId: string, rows: ReleaseRow[]): Promise<Release[]> {
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.id);
  const runIds = [...new Set(rows.map((r) => r.runId))];
  const named = await db
    .select({ runId: cueRuns.id, number: takes.number, title: tracks.title, venue: venues.name })
    .from(cueRuns)
    .innerJoin(takes, eq(takes.id, cueRuns.takeId))
    .innerJoin(tracks, eq(tracks.id, cueRuns.trackId))
    .innerJoin(venues, eq(venues.id, cueRuns.venueId))
    .where(inStudio(cueRuns, studioId, inArray(cueRuns.id, runIds)));
  const byRun = new Map(named.map((n) => [n.runId, n]));
  const acks = await db
    .select({ a: releaseAcknowledgements, name: users.name, email: users.email })
    .from(releaseAcknowledgements)
    .innerJoin(users, eq(users.id, releaseAcknowledgements.userId))
    .where(inStudio(releaseAcknowledgements, studioId, inArray(releaseAcknowledgements.releaseId, ids)))
    .orderBy(releaseAcknowledgements.at);
  const problems = await db
    .select({ p: releaseProblems, name: users.name, email: users.email })
    .from(releaseProblems)
    .leftJoin(users, eq(users.id, releaseProblems.userId))
    .where(inStudio(releaseProblems, studioId, inArray(releaseProblems.releaseId, ids)))
    .orderBy(desc(releaseProblems.at));
  const downloads = await db
    .select({ releaseId: releaseDownloads.releaseId, n: count(), last: max(releaseDownloads.at) })
    .from(releaseDownloads)
    .where(inStudio(releaseDownloads, studioId, inArray(releaseDownloads.releaseId, ids)))
    .groupBy(releaseDownloads.releaseId);
  const peopleIds = [
    ...new Set(rows.flatMap((r) => [r.releasedBy, r.withdrawnBy]).filter((x): x is string => !!x)),
  ];
  const people = peopleIds.length
    ? await db
        .select({ id: users.id, name: users.name, email: users.email })
        .from(users)
        .where(inArray(users.id, peopleIds))
    : [];
  const person = (id: string | null): Person | null => {
    if (!id) return null;
    return people.find((p) => p.id === id) ?? { id, name: '(former member)', email: '' };
  };
  const gone: Person = { id: '', name: '(former member)', email: '' };
  return rows.map((r) => {
    const n = byRun.get(r.runId);
    const d = downloads.find((x) => x.releaseId === r.id);
    const take = { number: n?.number ?? 0 };
    const files = Array.isArray(r.files) ? (r.files as Release['files']) : [];
    return {
      id: r.id,
      runId: r.runId,
      trackId: r.trackId,
      trackTitle: n?.title ?? '(removed)',
      takeNumber: take.number,
      venueId: r.venueId,
      venueName: n?.venue ?? '(removed)',
      state: r.state,
      failureReason: r.failureReason,
      releasedBy: person(r.releasedBy),
      releasedAt: r.createdAt.toISOString(),
      builtAt: r.builtAt?.toISOString() ?? null,
      packageName: r.packageKey
        ? (r.packageKey.split('/').pop() ?? '')
        : packageName({
            track: { id: r.trackId, title: n?.title ?? 'track' },
            take: { id: '', number: take.number, sha256: '', filename: '' },
            venue: { id: r.venueId, name: n?.venue ?? 'venue', timeZone: 'UTC' },
            release: { id: r.id, releasedBy: gone, releasedAt: '' },
          }),
      packageSha256: r.packageSha256,
      packageSizeBytes: r.packageSizeBytes,
      files,
      withdrawnAt: r.withdrawnAt?.toISOString() ?? null,
      withdrawnBy: person(r.withdrawnBy),
      withdrawReason: r.withdrawReason,
      supersededAt: r.supersededAt?.toISOString() ?? null,
      supersededById: r.supersededBy,
      acknowledgements: acks
        .filter((a) => a.a.releaseId === r.id)
        .map((a) => ({
          by: { id: a.a.userId, name: a.name, email: a.email },
          note: a.a.note,
          at: a.a.at.toISOString(),
        })),
      problems: problems
        .filter((p) => p.p.releaseId === r.id)
        .map((p) => ({
          id: p.p.id,
          by: p.p.userId ? { id: p.p.userId, name: p.name ?? '', email: p.email ?? '' } : gone,
          text: p.p.text,
          at: p.p.at.toISOString(),
        })),
      downloads: d?.n ?? 0,
      lastDownloadAt: d?.last ? new Date(d.last as unknown as string).toISOString() : null,
    };
  });
}

/** One release as the API answers it. */
export async function releaseView(db: Db | Tx, studioId: string, row: ReleaseRow): Promise<Release> {
  const [v] = await releaseViews(db, studioId, [row]);
  return v!;
}

/** What the audit log names a release by: its run, track and venue, with their titles. */
export async function auditSubject(db: Db | Tx, studioId: string, row: ReleaseRow) {
  const [n] = await db
    .select({ trackTitle: tracks.title, venueName: venues.name })
    .from(tracks)
    .innerJoin(venues, eq(venues.id, row.venueId))
    .where(inStudio(tracks, studioId, eq(tracks.id, row.trackId)));
  return {
    runId: row.runId,
    trackId: row.trackId,
    venueId: row.venueId,
    trackTitle: n?.trackTitle ?? '',
    venueName: n?.venueName ?? '',
  };
}

/** The run's state after its release left `ready`/`building`: the release's own end state. */
async function settleRun(tx: Tx | Db, studioId: string, row: ReleaseRow, state: 'withdrawn' | 'superseded') {
  // Only a run whose release this was moves; a run with another live release stays released.
  const live = await tx
    .select({ id: releases.id })
    .from(releases)
    .where(
      inStudio(
        releases,
        studioId,
        eq(releases.runId, row.runId),
        ne(releases.id, row.id),
        inArray(releases.state, ['building', 'ready']),
      ),
    )
    .limit(1);
  if (live.length) return;
  await tx
    .update(cueRuns)
    .set({ state })
    .where(inStudio(cueRuns, studioId, eq(cueRuns.id, row.runId), eq(cueRuns.state, 'released')));
}

/**
 * A newer package for the same track at the same venue is ready: every older ready release of them is
 * superseded (still downloadable, for the record), and their runs with them. Returns those superseded.
 */
export async function supersedeOlder(
  tx: Tx | Db,
  studioId: string,
  newer: ReleaseRow,
): Promise<ReleaseRow[]> {
  const older = await tx
    .update(releases)
    .set({ state: 'superseded', supersededAt: sql`now()`, supersededBy: newer.id })
    .where(
      inStudio(
        releases,
        studioId,
        eq(releases.trackId, newer.trackId),
        eq(releases.venueId, newer.venueId),
        eq(releases.state, 'ready'),
        ne(releases.id, newer.id),
      ),
    )
    .returning();
  for (const o of older) {
    await settleRun(tx, studioId, o, 'superseded');
    await recordAudit(tx, {
      studioId,
      actor: null,
      action: 'release.superseded',
      subjectType: 'release',
      subjectId: o.id,
      detail: { supersededBy: newer.id, ...(await auditSubject(tx, studioId, o)) },
    });
  }
  return older;
}

/** Withdraws a release (any state but withdrawn or failed); the run follows unless it has another. */
export async function withdrawRelease(
  tx: Tx,
  studioId: string,
  actor: ReleaseActor,
  releaseId: string,
  reason: string,
): Promise<{ before: ReleaseRow; after: ReleaseRow }> {
  const before = await loadRelease(tx, studioId, actor, releaseId, true);
  if (before.state === 'withdrawn') throw new HttpError(409, 'This release is already withdrawn.');
  if (before.state === 'failed')
    throw new HttpError(409, 'This release failed to build: there is no package to withdraw.');
  const [after] = await tx
    .update(releases)
    .set({ state: 'withdrawn', withdrawnAt: sql`now()`, withdrawnBy: actor.userId, withdrawReason: reason })
    .where(inStudio(releases, studioId, eq(releases.id, releaseId)))
    .returning();
  await settleRun(tx, studioId, after!, 'withdrawn');
  // Operators heard of the package only once it was built.
  if (before.state === 'ready' || before.state === 'superseded')
    await mailAboutRelease(tx, studioId, after!, 'release_withdrawn', { by: actor.email, reason });
  await recordAudit(tx, {
    studioId,
    actor: { id: actor.userId, email: actor.email },
    action: 'release.withdrawn',
    subjectType: 'release',
    subjectId: releaseId,
    detail: { reason, fromState: before.state, ...(await auditSubject(tx, studioId, before)) },
  });
  return { before, after: after! };
}

/** An operator acknowledges a package as installed (once per person; 409 the second time). */
export async function acknowledgeRelease(
  tx: Tx,
  studioId: string,
  actor: ReleaseActor,
  releaseId: string,
  note: string,
): Promise<ReleaseRow> {
  const row = await loadRelease(tx, studioId, actor, releaseId, true);
  if (row.state === 'withdrawn') throw new HttpError(409, 'This release was withdrawn: do not install it.');
  if (!DOWNLOADABLE.includes(row.state))
    throw new HttpError(409, 'This release has no package yet: it can be acknowledged once it is ready.');
  const inserted = await tx
    .insert(releaseAcknowledgements)
    .values({ studioId, releaseId, userId: actor.userId, note })
    .onConflictDoNothing()
    .returning();
  if (!inserted.length) throw new HttpError(409, 'You have already acknowledged this release as installed.');
  await recordAudit(tx, {
    studioId,
    actor: { id: actor.userId, email: actor.email },
    action: 'release.acknowledged',
    subjectType: 'release',
    subjectId: releaseId,
    detail: { note, ...(await auditSubject(tx, studioId, row)) },
  });
  return row;
}

/** An operator reports a problem with a package that reached the venue. */
export async function reportProblem(
  tx: Tx,
  studioId: string,
  actor: ReleaseActor,
  releaseId: string,
  text: string,
): Promise<{ row: ReleaseRow; problemId: string }> {
  const row = await loadRelease(tx, studioId, actor, releaseId, true);
  if (row.state === 'building' || row.state === 'failed')
    throw new HttpError(409, 'This release never reached the venue: it has no package to report on.');
  const [p] = await tx
    .insert(releaseProblems)
    .values({ studioId, releaseId, userId: actor.userId, text })
    .returning();
  await recordAudit(tx, {
    studioId,
    actor: { id: actor.userId, email: actor.email },
    action: 'release.problem_reported',
    subjectType: 'release',
    subjectId: releaseId,
    detail: { text, problemId: p!.id, ...(await auditSubject(tx, studioId, row)) },
  });
  await mailAboutRelease(tx, studioId, row, 'problem_reported', { by: actor.email, text });
  return { row, problemId: p!.id };
}

/** Records one download of a package (the route streams it after this). */
export async function logDownload(
  db: Db | Tx,
  studioId: string,
  actor: { id: string; email: string } | null,
  userId: string | null,
  row: ReleaseRow,
): Promise<void> {
  await db.insert(releaseDownloads).values({ studioId, releaseId: row.id, userId });
  await recordAudit(db, {
    studioId,
    actor,
    action: 'release.downloaded',
    subjectType: 'release',
    subjectId: row.id,
    detail: { ...(await auditSubject(db, studioId, row)) },
  });
}
