// The cue-run job: fetch the take from storage, run the motion core (the same `processTrack` as
// `legwork process`), write the artifacts to storage and the summary to PostgreSQL.
//
// Delivered twice, or again after a worker died mid-run, it is safe: a run already finished is left
// alone; a run left in `cueing` is done again from the start, and since the artifacts are
// deterministic and their keys fixed, the retry overwrites them with the same bytes before the one
// guarded update that finishes the run.
import { createHash } from 'node:crypto';
import { StringDecoder } from 'node:string_decoder';
import { createGunzip } from 'node:zlib';
import type { Readable } from 'node:stream';
import { GetObjectCommand, PutObjectCommand } from '@aws-sdk/client-s3';
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import type { Db } from '../../server/db/client';
import { cueRuns, profileVersions, profiles, takes, venues } from '../../server/db/schema';
import type { CueRunRow } from '../../server/db/schema';
import { inStudio } from '../../server/db/scope';
import type { Storage } from '../../server/storage';
import { recordAudit } from '../../server/audit';
import { TrackFileError, TrackReader } from '../../shared/motion/track-reader';
import type { Track } from '../../shared/motion/track-reader';
import { ProcessInputError, packageContents, processTrack } from '../../shared/motion/process';
import { KinematicsError } from '../../shared/motion/base-geometry';
import { RUN_SERIES_BUCKETS, buildRunSeries } from '../../shared/motion/run-series';
import { parseMotionBase } from '../../shared/schemas/motion-base';
import { budgetSchema } from '../../shared/schemas/budget';
import { cueingProfileSchema } from '../../shared/schemas/cueing-profile';
import { softwareVersion } from '../../server/lib/version';

export const cueRunJobSchema = z.object({ runId: z.string().uuid(), studioId: z.string().uuid() });

export interface CueRunDeps {
  db: Db;
  storage: Storage;
  log: (msg: string) => void;
  now: () => Date;
}

export interface JobMeta {
  id: string;
  data: unknown;
  retryCount?: number;
  retryLimit?: number;
}

/** Errors in the take or its settings: retrying cannot help, so the run fails at once with the reason. */
const isInputError = (e: unknown) =>
  e instanceof TrackFileError ||
  e instanceof ProcessInputError ||
  e instanceof KinematicsError ||
  e instanceof z.ZodError;

const artifactKey = (run: Pick<CueRunRow, 'studioId' | 'id'>, name: string) =>
  `studios/${run.studioId}/runs/${run.id}/${name}`;

async function readTake(storage: Storage, key: string, fileName: string): Promise<Track> {
  const obj = await storage.client.send(new GetObjectCommand({ Bucket: storage.bucket, Key: key }));
  const body = obj.Body as Readable;
  const stream = fileName.toLowerCase().endsWith('.gz') ? body.pipe(createGunzip()) : body;
  const reader = new TrackReader({ file: fileName, maxBytes: Number.MAX_SAFE_INTEGER });
  const decoder = new StringDecoder('utf8');
  for await (const chunk of stream) reader.push(decoder.write(chunk as Buffer));
  reader.push(decoder.end());
  return reader.end();
}

/** Builds the pg-boss handler for the cue-run queue. */
export function createHandler(deps: CueRunDeps) {
  const { db, storage, log } = deps;

  const setProgress = (run: CueRunRow, progress: number) =>
    db
      .update(cueRuns)
      .set({ progress })
      .where(and(eq(cueRuns.id, run.id), eq(cueRuns.state, 'cueing')));

  async function fail(run: CueRunRow, reason: string): Promise<void> {
    await db.transaction(async (tx) => {
      const [done] = await tx
        .update(cueRuns)
        .set({ state: 'failed', failureReason: reason, finishedAt: deps.now() })
        .where(and(eq(cueRuns.id, run.id), eq(cueRuns.state, 'cueing')))
        .returning({ id: cueRuns.id });
      if (done) {
        await recordAudit(tx, {
          studioId: run.studioId,
          actor: null,
          action: 'run.failed',
          subjectType: 'cue_run',
          subjectId: run.id,
          detail: { reason },
        });
      }
    });
  }

  async function handle(job: JobMeta): Promise<void> {
    const data = cueRunJobSchema.parse(job.data);
    const [run] = await db
      .select()
      .from(cueRuns)
      .where(inStudio(cueRuns, data.studioId, eq(cueRuns.id, data.runId)));
    if (!run) {
      log(`cue run ${data.runId}: not found; nothing to do`);
      return;
    }
    if (run.state !== 'queued' && run.state !== 'cueing') {
      log(`cue run ${run.id}: already ${run.state}; a repeated delivery changes nothing`);
      return;
    }
    await db
      .update(cueRuns)
      .set({
        state: 'cueing',
        progress: 2,
        attempts: run.attempts + 1,
        startedAt: deps.now(),
        lastError: null,
      })
      .where(eq(cueRuns.id, run.id));
    const running: CueRunRow = { ...run, state: 'cueing' };
    try {
      const [take] = await db
        .select()
        .from(takes)
        .where(inStudio(takes, run.studioId, eq(takes.id, run.takeId)));
      const [venue] = await db
        .select()
        .from(venues)
        .where(inStudio(venues, run.studioId, eq(venues.id, run.venueId)));
      if (!take || !venue) throw new ProcessInputError('the take or the venue of this run no longer exists');
      const versionOf = async (id: string | null) => {
        if (!id) return null;
        const [v] = await db
          .select({ params: profileVersions.params, version: profileVersions.version, name: profiles.name })
          .from(profileVersions)
          .innerJoin(profiles, eq(profiles.id, profileVersions.profileId))
          .where(inStudio(profileVersions, run.studioId, eq(profileVersions.id, id)));
        return v ?? null;
      };
      const cueing = await versionOf(run.cueingVersionId);
      const budgetV = await versionOf(run.budgetVersionId);
      if (!budgetV) throw new ProcessInputError('the budget profile version of this run no longer exists');
      const base = parseMotionBase(venue.base);
      const budget = budgetSchema.parse(budgetV.params);
      const profile = cueing ? cueingProfileSchema.parse(cueing.params) : undefined;

      const track = await readTake(storage, take.storageKey, take.fileName);
      await setProgress(running, 30);
      const result = processTrack({
        track,
        base,
        budget,
        chartBuckets: RUN_SERIES_BUCKETS,
        ...(profile ? { profile } : {}),
      });
      await setProgress(running, 65);

      const json = (v: unknown) => JSON.stringify(v);
      const sha = (s: string) => createHash('sha256').update(s).digest('hex');
      const contents = packageContents(result, base, {
        input: { file: take.fileName, sha256: take.sha256, size_bytes: take.sizeBytes },
        track,
        base: { file: `${venue.name} motion base`, sha256: sha(json(venue.base)) },
        ...(cueing
          ? { profile: { file: `${cueing.name} v${cueing.version}`, sha256: sha(json(cueing.params)) } }
          : {}),
        budget: { file: `${budgetV.name} v${budgetV.version}`, sha256: sha(json(budgetV.params)) },
        softwareVersion: softwareVersion(),
      });
      const series = buildRunSeries(result, track, base);
      const files = [...contents.files, { name: 'series.json', content: json(series) }];
      const entries: { name: string; sha256: string; size_bytes: number }[] = [];
      for (const f of files) {
        const bytes = Buffer.from(f.content, 'utf8');
        await storage.client.send(
          new PutObjectCommand({
            Bucket: storage.bucket,
            Key: artifactKey(run, f.name),
            Body: bytes,
            ContentType: f.name.endsWith('.json')
              ? 'application/json'
              : f.name.endsWith('.csv')
                ? 'text/csv'
                : 'text/plain',
          }),
        );
        entries.push({ name: f.name, sha256: sha(f.content), size_bytes: bytes.byteLength });
      }
      const manifest = {
        ...contents.manifest,
        run: {
          id: run.id,
          take: { id: take.id, number: take.number },
          venue: { id: venue.id, name: venue.name },
        },
        files: entries.filter((e) => e.name !== 'series.json'),
      };
      const manifestText = `${JSON.stringify(manifest, null, 2)}\n`;
      await storage.client.send(
        new PutObjectCommand({
          Bucket: storage.bucket,
          Key: artifactKey(run, 'manifest.json'),
          Body: manifestText,
          ContentType: 'application/json',
        }),
      );
      await setProgress(running, 95);

      const state = result.exitCode === 0 ? 'awaiting_review' : 'held_by_budget';
      const summary = {
        within: result.findings.within,
        exitCode: result.exitCode,
        uses: result.findings.uses,
        findings: result.findings.findings,
        comfort: result.findings.comfort ?? null,
        notes: result.notes,
        rate_hz: result.rate_hz,
        samples: result.time_s.length,
        duration_s: (result.time_s[result.time_s.length - 1] as number) - (result.time_s[0] as number),
        budgetIsDemo: result.budgetIsDemo,
        files: [
          ...entries,
          { name: 'manifest.json', sha256: sha(manifestText), size_bytes: Buffer.byteLength(manifestText) },
        ],
      };
      await db.transaction(async (tx) => {
        const [done] = await tx
          .update(cueRuns)
          .set({
            state,
            progress: 100,
            summary,
            artifactPrefix: artifactKey(run, ''),
            finishedAt: deps.now(),
            failureReason: null,
          })
          .where(and(eq(cueRuns.id, run.id), eq(cueRuns.state, 'cueing')))
          .returning({ id: cueRuns.id });
        if (done) {
          await recordAudit(tx, {
            studioId: run.studioId,
            actor: null,
            action: state === 'held_by_budget' ? 'run.held_by_budget' : 'run.awaiting_review',
            subjectType: 'cue_run',
            subjectId: run.id,
            detail: { findings: result.findings.findings.length, exitCode: result.exitCode },
          });
        }
      });
      log(`cue run ${run.id}: ${state} (${result.findings.findings.length} finding(s))`);
    } catch (e) {
      const message = (e as Error).message || String(e);
      if (isInputError(e)) {
        await fail(running, `The take could not be processed for this venue: ${message}`);
        return;
      }
      const last = (job.retryCount ?? 0) >= (job.retryLimit ?? 0);
      if (last) {
        await fail(running, `Gave up after ${(job.retryCount ?? 0) + 1} attempt(s): ${message}`);
      } else {
        await db
          .update(cueRuns)
          .set({ state: 'queued', progress: 0, lastError: message })
          .where(eq(cueRuns.id, run.id));
      }
      throw e;
    }
  }
  return handle;
}
