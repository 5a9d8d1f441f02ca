// One run as the run page reads it (GET .../runs/:run), shared by the runs and reviews routers.
import { eq } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { cueRuns, takes, tracks, venues } from '../db/schema';
import type { CueRunRow, TakeRow } from '../db/schema';
import { inStudio } from '../db/scope';
import { isUuid } from '../lib/validate';
import { notFound } from '../lib/http-error';
import type { RunDetail } from '../../shared/schemas/pipeline';
import { SERIES_FILE } from '../../shared/schemas/run-outputs';
import { runFilmSync } from '../../shared/schemas/run-params';
import { takeFilmSync, toRunSummary, toTake, versionRef } from './views';

export interface LoadedRun {
  run: CueRunRow;
  take: TakeRow;
  venueName: string;
  trackTitle: string;
}

/** The run with its take, venue name and track title, or 404. `forUpdate` locks the run's row. */
export async function loadRun(
  db: Db | Tx,
  studioId: string,
  runId: string,
  forUpdate = false,
): Promise<LoadedRun> {
  if (!isUuid(runId)) throw notFound('No such run.');
  const q = db
    .select({ run: cueRuns, take: takes, venueName: venues.name, trackTitle: tracks.title })
    .from(cueRuns)
    .innerJoin(takes, eq(takes.id, cueRuns.takeId))
    .innerJoin(venues, eq(venues.id, cueRuns.venueId))
    .innerJoin(tracks, eq(tracks.id, cueRuns.trackId))
    .where(inStudio(cueRuns, studioId, eq(cueRuns.id, runId)));
  const [row] = forUpdate ? await q.for('update', { of: cueRuns }) : await q;
  if (!row) throw notFound('No such run.');
  return row;
}

/** The run page's view of a loaded run. */
export async function runDetail(db: Db | Tx, studioId: string, loaded: LoadedRun): Promise<RunDetail> {
  const { run, take, venueName, trackTitle } = loaded;
  const s = run.summary;
  const budgetVersion = await versionRef(db, studioId, run.budgetVersionId);
  return {
    ...toRunSummary(run, take.number, venueName),
    trackTitle,
    take: toTake(take),
    cueingVersion: await versionRef(db, studioId, run.cueingVersionId),
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
    params: run.params,
    filmSync: runFilmSync(takeFilmSync(take), run.params),
    ramp: s?.ramp ?? null,
  };
}
