// The demo studio, seeded into an empty database by `npm start` (fictional names and numbers).
import { randomUUID } from 'node:crypto';
import { Readable } from 'node:stream';
import { count, inArray } from 'drizzle-orm';
import type pg from 'pg';
import type PgBoss from 'pg-boss';
import { openDb } from './client';
import type { Db } from './client';
import {
  cueRuns,
  memberships,
  profileVersions,
  profiles,
  studios,
  takes,
  tracks,
  users,
  venueSettings,
  venues,
} from './schema';
import type { CueRunRow } from './schema';
import type { Storage } from '../storage';
import { receiveTake } from '../pipeline/upload';
import { queueRuns } from '../pipeline/queue-runs';
import { applyReview, findingCounts } from '../pipeline/review';
import { demoRideCsv } from '../../shared/demo-ride';
import { createHandler as createCueRunHandler } from '../../worker/jobs/cue-run';
import { createBuildReleaseHandler } from '../../worker/jobs/build-release';
import { acknowledgeRelease, createRelease, withdrawRelease } from '../pipeline/releases';
import { hashPassword } from '../auth/passwords';
import {
  DEMO_PASSWORD,
  DEMO_SECOND_STUDIO,
  DEMO_STUDIO,
  DEMO_TRACK,
  DEMO_USERS,
  DEMO_VENUES,
} from '../../shared/demo';
import { demoHexapodBase, demoPlanar3Base } from '../../shared/schemas/motion-base';
import { defaultCueingProfile } from '../../shared/schemas/cueing-profile';
import { DEMO_BUDGET } from '../../shared/schemas/budget';

/** Seeds the demo scenario into `db`; returns the ids made. */
export async function seedDemo(db: Db) {
  const hash = await hashPassword(DEMO_PASSWORD);
  return db.transaction(async (tx) => {
    const [studio] = await tx.insert(studios).values(DEMO_STUDIO).returning();
    const [second] = await tx.insert(studios).values(DEMO_SECOND_STUDIO).returning();
    const [dome] = await tx
      .insert(venues)
      .values({
        studioId: studio!.id,
        ...DEMO_VENUES.dome,
        base: demoHexapodBase,
        // Demo numbers: an encoder of 409.6 counts per mm (4096 counts per 10 mm of stroke).
        controller: {
          encoder: { countsPerMm: 409.6, zeroOffset_counts: 0 },
          ramp: { duration_s: 3, profile: 'quintic' },
        },
      })
      .returning();
    const [arcade] = await tx
      .insert(venues)
      .values({ studioId: studio!.id, ...DEMO_VENUES.arcade, base: demoPlanar3Base })
      .returning();
    const venueIds = { dome: dome!.id, arcade: arcade!.id };
    // Starting profiles: the common-practice washout defaults and the clearly marked demo budget.
    const [cueing] = await tx
      .insert(profiles)
      .values({ studioId: studio!.id, kind: 'cueing', name: 'House washout (common-practice defaults)' })
      .returning();
    const [cueingV] = await tx
      .insert(profileVersions)
      .values({
        studioId: studio!.id,
        profileId: cueing!.id,
        version: 1,
        params: defaultCueingProfile(),
        note: 'Defaults as shipped: common practice, not a standard.',
      })
      .returning();
    const [budget] = await tx
      .insert(profiles)
      .values({ studioId: studio!.id, kind: 'budget', name: 'DEMO budget (invented values)' })
      .returning();
    const [budgetV] = await tx
      .insert(profileVersions)
      .values({
        studioId: studio!.id,
        profileId: budget!.id,
        version: 1,
        params: DEMO_BUDGET,
        note: 'Demo numbers only: replace with the envelope that applies to the venue.',
      })
      .returning();
    for (const id of [dome!.id, arcade!.id]) {
      await tx.insert(venueSettings).values({
        venueId: id,
        studioId: studio!.id,
        cueingVersionId: cueingV!.id,
        budgetVersionId: budgetV!.id,
      });
    }
    const userIds: Record<string, string> = {};
    for (const u of DEMO_USERS) {
      const [row] = await tx
        .insert(users)
        .values({ email: u.email, name: u.name, passwordHash: hash })
        .returning();
      userIds[u.email] = row!.id;
      await tx.insert(memberships).values({
        studioId: studio!.id,
        userId: row!.id,
        roles: u.roles,
        venueIds: (u.venues ?? []).map((k) => venueIds[k]),
      });
    }
    // The admin also produces for a second studio, so the studio switcher has something to switch.
    const admin = DEMO_USERS.find((u) => u.roles.includes('studio_admin'))!;
    await tx
      .insert(memberships)
      .values({ studioId: second!.id, userId: userIds[admin.email]!, roles: ['producer', 'studio_admin'] });
    return {
      studioId: studio!.id,
      secondStudioId: second!.id,
      venueIds,
      userIds,
      cueingVersionId: cueingV!.id,
      budgetVersionId: budgetV!.id,
    };
  });
}

/**
 * The demo track: the fictional ride's takes, uploaded through the same streamed path as a browser
 * upload, queued for their venues, and cued at once by the worker's own job handler (so the demo's
 * states exist the moment the app starts; a later delivery of the same job changes nothing).
 */
export async function seedDemoTrack(
  db: Db,
  pool: pg.Pool,
  storage: Storage,
  boss: PgBoss,
  ids: Awaited<ReturnType<typeof seedDemo>>,
): Promise<{ take: number; venue: 'dome' | 'arcade'; runId: string }[]> {
  const producer = DEMO_USERS.find((u) => u.roles.includes('producer'))!;
  const producerId = ids.userIds[producer.email]!;
  const [track] = await db
    .insert(tracks)
    .values({ studioId: ids.studioId, title: DEMO_TRACK.title, film: DEMO_TRACK.film, createdBy: producerId })
    .returning();
  const cue = createCueRunHandler({ db, storage, log: () => undefined, now: () => new Date() });
  const runs: { take: number; venue: keyof typeof ids.venueIds; runId: string }[] = [];
  let number = 0;
  for (const spec of DEMO_TRACK.takes) {
    number++;
    const takeId = randomUUID();
    const key = `studios/${ids.studioId}/takes/${takeId}/${spec.file}`;
    const csv = Buffer.from(demoRideCsv(spec));
    const got = await receiveTake(Readable.from([csv]), {
      storage,
      key,
      fileName: spec.file,
      maxBytes: csv.byteLength,
    });
    const n = got.track.length;
    const [take] = await db
      .insert(takes)
      .values({
        id: takeId,
        studioId: ids.studioId,
        trackId: track!.id,
        number,
        kind: got.track.kind,
        layout: got.track.layout,
        fileName: spec.file,
        storageKey: key,
        sizeBytes: got.sizeBytes,
        sha256: got.sha256,
        samples: n,
        duration_s: (got.track.time_s[n - 1] as number) - (got.track.time_s[0] as number),
        uploadedBy: producerId,
        uploadedVia: 'browser',
      })
      .returning();
    const queued = await queueRuns(pool, boss, {
      studioId: ids.studioId,
      take: take!,
      venueIds: spec.venues.map((v) => ids.venueIds[v]),
      actor: { id: producerId, email: producer.email },
      now: new Date(),
      retry: { limit: 3, delay_s: 5 },
    });
    for (const { run } of queued) {
      await cue({ id: run.id, data: { runId: run.id, studioId: ids.studioId } });
      const venue = run.venueId === ids.venueIds.dome ? 'dome' : 'arcade';
      runs.push({ take: number, venue, runId: run.id });
    }
  }
  return runs;
}

/**
 * The demo's reviews, through the same rules as the review route: the demo reviewer holds the first
 * run with a hard finding and clears the first run with no finding; the rest wait in the queue.
 */
export async function seedDemoReviews(
  db: Db,
  ids: Awaited<ReturnType<typeof seedDemo>>,
  runs: { take: number; venue: 'dome' | 'arcade'; runId: string }[],
): Promise<void> {
  const reviewer = DEMO_USERS.find((u) => u.roles.includes('safety_reviewer'))!;
  const who = {
    userId: ids.userIds[reviewer.email]!,
    email: reviewer.email,
    roles: reviewer.roles,
    venueIds: [],
  };
  const rows = await db
    .select()
    .from(cueRuns)
    .where(
      inArray(
        cueRuns.id,
        runs.map((r) => r.runId),
      ),
    );
  const byTake = (a: CueRunRow, b: CueRunRow) =>
    runs.findIndex((r) => r.runId === a.id) - runs.findIndex((r) => r.runId === b.id);
  rows.sort(byTake);
  const hard = rows.find((r) => findingCounts(r).hard > 0);
  const clean = rows.find((r) => r.summary && r.summary.findings.length === 0);
  await db.transaction(async (tx) => {
    if (hard)
      await applyReview(tx, ids.studioId, hard.id, who, {
        decision: 'hold',
        reason:
          'Hard finding in the drop: the legs run out of stroke. Cue again with a softer heave washout.',
      });
    if (clean) await applyReview(tx, ids.studioId, clean.id, who, { decision: 'clear', reason: '' });
  });
}

/**
 * The demo's releases, through the same steps as the routes and the worker: the run the reviewer
 * cleared goes out to Harbour Lights Dome and is withdrawn (the recut replaces it); the recut is
 * cleared, released there, built and acknowledged as installed by the dome's operator. One run stays
 * awaiting review, the rattle cut stays held by its comfort findings, the hot cut held for a hard one.
 */
export async function seedDemoReleases(
  db: Db,
  pool: pg.Pool,
  storage: Storage,
  boss: PgBoss,
  ids: Awaited<ReturnType<typeof seedDemo>>,
  runs: { take: number; venue: 'dome' | 'arcade'; runId: string }[],
): Promise<void> {
  const person = (role: string) => {
    const u = DEMO_USERS.find((x) => x.roles.includes(role as never))!;
    return {
      userId: ids.userIds[u.email]!,
      email: u.email,
      roles: u.roles,
      venueIds: (u.venues ?? []).map((v) => ids.venueIds[v]),
    };
  };
  const producer = person('producer');
  const reviewer = person('safety_reviewer');
  const operator = person('venue_operator');
  const build = createBuildReleaseHandler({ db, storage, log: () => undefined, now: () => new Date() });
  const releaseAndBuild = async (runId: string) => {
    const made = await createRelease(pool, boss, { studioId: ids.studioId, runId, actor: producer });
    await build({ id: made.id, data: { releaseId: made.id, studioId: ids.studioId } });
    return made.id;
  };
  const rows = await db
    .select()
    .from(cueRuns)
    .where(
      inArray(
        cueRuns.id,
        runs.map((r) => r.runId),
      ),
    );
  const at = (take: number, venue: 'dome' | 'arcade') =>
    rows.find((r) => r.id === runs.find((x) => x.take === take && x.venue === venue)?.runId);
  const first = rows.find((r) => r.state === 'cleared' && r.venueId === ids.venueIds.dome);
  const recut = at(2, 'dome');
  if (!first || !recut || findingCounts(recut).hard > 0 || recut.state === 'cleared') return;
  const withdrawn = await releaseAndBuild(first.id);
  await db.transaction((tx) =>
    withdrawRelease(
      tx,
      ids.studioId,
      producer,
      withdrawn,
      'The recut with the softer launch replaces this cut at the dome.',
    ),
  );
  await db.transaction((tx) =>
    applyReview(tx, ids.studioId, recut.id, reviewer, {
      decision: 'clear',
      reason: findingCounts(recut).comfort
        ? 'Comfort findings are brief and inside what this ride accepts; checked against the budget.'
        : '',
    }),
  );
  const installed = await releaseAndBuild(recut.id);
  await db.transaction((tx) =>
    acknowledgeRelease(
      tx,
      ids.studioId,
      operator,
      installed,
      'Loaded on the dome controller after the venue checks.',
    ),
  );
}

/** Seeds the demo studio (and, given storage and the queue, its demo track) when the database has no studio yet. */
export async function seedDemoIfEmpty(
  url: string,
  services?: { storage: Storage; boss: PgBoss },
): Promise<boolean> {
  // Seeding writes the rows of a studio that does not exist yet: across studios, deliberately.
  const { db, pool } = openDb(url, { max: 2, outsideScope: 'all' });
  try {
    const [row] = await db.select({ n: count() }).from(studios);
    if ((row?.n ?? 0) > 0) return false;
    const ids = await seedDemo(db);
    if (services) {
      const runs = await seedDemoTrack(db, pool, services.storage, services.boss, ids);
      await seedDemoReviews(db, ids, runs);
      await seedDemoReleases(db, pool, services.storage, services.boss, ids, runs);
    }
    return true;
  } finally {
    await pool.end();
  }
}
