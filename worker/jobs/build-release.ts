// The build-release job: takes a release that is building, gathers what its package records (the run's
// stored files and summary, the take, the venue's motion base as the run used it, the profile
// versions, the reviews, who released it), builds the zip with buildReleasePackage, stores it, and
// marks the release ready with its SHA-256 in one guarded update that also supersedes older releases
// of the same track at the same venue. The venue's operators are told by mail.
//
// Delivered twice, or again after a worker died mid-build, it is safe: a release no longer building
// is left alone, the zip is deterministic and its key fixed, and only the guarded update publishes it.
import { GetObjectCommand, PutObjectCommand } from '@aws-sdk/client-s3';
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import type { Db } from '../../server/db/client';
import { cueRuns, releases, takes, tracks, users, venues } from '../../server/db/schema';
import type { ReleaseRow, TakeRow } from '../../server/db/schema';
import { inStudio } from '../../server/db/scope';
import type { Storage } from '../../server/storage';
import { isMissingObject } from '../../server/storage';
import { recordAudit } from '../../server/audit';
import { versionRef } from '../../server/pipeline/views';
import { reviewsOf } from '../../server/pipeline/review';
import { auditSubject, mailAboutRelease, packageKeyOf, supersedeOlder } from '../../server/pipeline/releases';
import { PackageInputError, buildReleasePackage } from '../../server/pipeline/release-package';
import { takeFilmSync } from '../../server/pipeline/views';
import { filmSyncManifest } from '../../shared/motion/run-outputs';
import { runFilmSync, runParamsSchema, type RunParams } from '../../shared/schemas/run-params';
import type { BuiltPackage, ReleasePackageInput } from '../../server/pipeline/release-package';
import { softwareVersion } from '../../server/lib/version';
import { parseMotionBase, MotionBaseError } from '../../shared/schemas/motion-base';
import { buildReleaseJobSchema } from '../../shared/schemas/release';
import { MANIFEST_NAME } from '../../shared/schemas/package-manifest';
import type { JobMeta } from './cue-run';
import { errorText } from '../../server/lib/error-text';

export interface BuildReleaseDeps {
  db: Db;
  storage: Storage;
  log: (msg: string) => void;
  now: () => Date;
}

/** What cannot get better by retrying: the run's stored files or settings are not usable. */
class ReleaseInputError extends Error {}

const isInputError = (e: unknown) =>
  e instanceof ReleaseInputError ||
  e instanceof PackageInputError ||
  e instanceof MotionBaseError ||
  e instanceof z.ZodError;

/** The motion base as the run was computed with it: the run's own manifest records its parameters. */
const runManifestBase = z.object({
  base: z.object({ file: z.string(), sha256: z.string(), parameters: z.unknown() }),
});

async function readObject(storage: Storage, key: string): Promise<Buffer> {
  try {
    const obj = await storage.client.send(new GetObjectCommand({ Bucket: storage.bucket, Key: key }));
    return Buffer.from(await obj.Body!.transformToByteArray());
  } catch (e) {
    if (isMissingObject(e)) throw new ReleaseInputError(`${key.split('/').pop()} is missing from storage`);
    throw e;
  }
}

/** The manifest's film sync of a run (frame rate, start timecode, offset), or null without one. */
function filmSyncOfRun(take: TakeRow, params: RunParams): Record<string, unknown> | null {
  const sync = runFilmSync(takeFilmSync(take), params);
  return sync ? filmSyncManifest(sync) : null;
}

/** Gathers the package's input from the database and the run's stored files. */
async function packageInput(deps: BuildReleaseDeps, release: ReleaseRow): Promise<ReleasePackageInput> {
  const { db, storage } = deps;
  const studioId = release.studioId;
  const [row] = await db
    .select({ run: cueRuns, take: takes, track: tracks, venue: venues })
    .from(cueRuns)
    .innerJoin(takes, eq(takes.id, cueRuns.takeId))
    .innerJoin(tracks, eq(tracks.id, cueRuns.trackId))
    .innerJoin(venues, eq(venues.id, cueRuns.venueId))
    .where(inStudio(cueRuns, studioId, eq(cueRuns.id, release.runId)));
  if (!row) throw new ReleaseInputError('the run of this release no longer exists');
  const { run, take, track, venue } = row;
  if (!run.summary || !run.artifactPrefix) throw new ReleaseInputError('the run has no stored results');
  const prefix = run.artifactPrefix;
  const manifest = runManifestBase.parse(
    JSON.parse((await readObject(storage, `${prefix}${MANIFEST_NAME}`)).toString('utf8')),
  );
  const base = parseMotionBase(manifest.base.parameters);
  const [by] = release.releasedBy
    ? await db
        .select({ id: users.id, name: users.name, email: users.email })
        .from(users)
        .where(eq(users.id, release.releasedBy))
    : [];
  const budget = await versionRef(db, studioId, run.budgetVersionId);
  if (!budget) throw new ReleaseInputError('the budget profile version of the run no longer exists');
  const params = runParamsSchema.parse(run.params);
  return {
    release: {
      id: release.id,
      releasedBy: by ?? { id: '', name: '(former member)', email: '' },
      releasedAt: release.createdAt.toISOString(),
    },
    reviews: await reviewsOf(db, studioId, run.id),
    run: { id: run.id, state: 'released', summary: run.summary },
    track: { id: track.id, title: track.title },
    take: { id: take.id, number: take.number, sha256: take.sha256, filename: take.fileName },
    venue: { id: venue.id, name: venue.name, timeZone: venue.timeZone },
    motionBase: { id: venue.id, name: manifest.base.file, sha256: manifest.base.sha256, base },
    cueing: await versionRef(db, studioId, run.cueingVersionId),
    budget,
    softwareVersion: softwareVersion(),
    // The picture the run plays against: the take's film sync with the run's own offset.
    filmSync: filmSyncOfRun(take, params),
    // The controller settings and touch-up the run was made with (its parameters), not the venue's now.
    controller: params.controller ?? null,
    touchup: params.touchup ?? null,
    readRunFile: (name) => readObject(storage, `${prefix}${name}`),
  };
}

/** Publishes the built package: ready with its hash, older releases superseded, one audit event. */
async function publish(
  deps: BuildReleaseDeps,
  release: ReleaseRow,
  key: string,
  built: BuiltPackage,
): Promise<{ ready: ReleaseRow; superseded: ReleaseRow[] } | null> {
  return deps.db.transaction(async (tx) => {
    const [ready] = await tx
      .update(releases)
      .set({
        state: 'ready',
        packageKey: key,
        packageSha256: built.sha256,
        packageSizeBytes: built.sizeBytes,
        files: built.files,
        builtAt: deps.now(),
        failureReason: null,
      })
      .where(and(eq(releases.id, release.id), eq(releases.state, 'building')))
      .returning();
    if (!ready) return null;
    const superseded = await supersedeOlder(tx, release.studioId, ready);
    await recordAudit(tx, {
      studioId: release.studioId,
      actor: null,
      action: 'release.ready',
      subjectType: 'release',
      subjectId: release.id,
      detail: {
        sha256: built.sha256,
        sizeBytes: built.sizeBytes,
        ...(await auditSubject(tx, release.studioId, ready)),
      },
    });
    await mailAboutRelease(tx, release.studioId, ready, 'release_ready');
    return { ready, superseded };
  });
}

/** Ends a build as failed with its reason; the run goes back to cleared so it can be released again. */
async function fail(deps: BuildReleaseDeps, release: ReleaseRow, reason: string): Promise<void> {
  await deps.db.transaction(async (tx) => {
    const [done] = await tx
      .update(releases)
      .set({ state: 'failed', failureReason: reason })
      .where(and(eq(releases.id, release.id), eq(releases.state, 'building')))
      .returning();
    if (!done) return;
    await tx
      .update(cueRuns)
      .set({ state: 'cleared' })
      .where(and(eq(cueRuns.id, release.runId), eq(cueRuns.state, 'released')));
    await recordAudit(tx, {
      studioId: release.studioId,
      actor: null,
      action: 'release.failed',
      subjectType: 'release',
      subjectId: release.id,
      detail: { reason, ...(await auditSubject(tx, release.studioId, done)) },
    });
  });
}

/** Builds the pg-boss handler for the build-release queue. */
export function createBuildReleaseHandler(deps: BuildReleaseDeps) {
  return async function handle(job: JobMeta): Promise<void> {
    const data = buildReleaseJobSchema.parse(job.data);
    const [release] = await deps.db
      .select()
      .from(releases)
      .where(inStudio(releases, data.studioId, eq(releases.id, data.releaseId)));
    if (!release || release.state !== 'building') {
      deps.log(
        `release ${data.releaseId}: ${release ? `already ${release.state}` : 'not found'}; nothing to do`,
      );
      return;
    }
    try {
      const input = await packageInput(deps, release);
      const built = await buildReleasePackage(input);
      const key = packageKeyOf(release.studioId, release.id, built.name);
      await deps.storage.client.send(
        new PutObjectCommand({
          Bucket: deps.storage.bucket,
          Key: key,
          Body: built.zip,
          ContentLength: built.sizeBytes,
          ContentType: 'application/zip',
        }),
      );
      const done = await publish(deps, release, key, built);
      if (!done) {
        deps.log(`release ${release.id}: no longer building (withdrawn meanwhile); package not published`);
        return;
      }
      deps.log(
        `release ${release.id}: ready (${built.sizeBytes} bytes, SHA-256 ${built.sha256.slice(0, 12)})`,
      );
    } catch (e) {
      const message = errorText(e);
      if (isInputError(e)) {
        await fail(deps, release, `The package could not be built: ${message}`);
        return;
      }
      if ((job.retryCount ?? 0) >= (job.retryLimit ?? 0)) {
        await fail(deps, release, `Gave up after ${(job.retryCount ?? 0) + 1} attempt(s): ${message}`);
        return;
      }
      throw e;
    }
  };
}
