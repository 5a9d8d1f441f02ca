// `legwork process`: the whole offline pipeline (read, resample, cue, kinematics, checks, spectra) into a
// package folder with a manifest of SHA-256 sums and every parameter of the run.

import { basename } from 'node:path';
import { processTrack } from '../../../shared/motion/process';
import type { Track } from '../../../shared/motion/track-reader';
import type { ProcessResult } from '../../../shared/motion/process';
import { buildRunOutputs, motionCsvParts } from '../../../shared/motion/run-outputs';
import { PACKAGE_FILES } from '../../../shared/schemas/run-outputs';
import type { Budget } from '../../../shared/schemas/budget';
import type { CueingProfile } from '../../../shared/schemas/cueing-profile';
import type { CliIo } from '../io';
import { parseCommandOptions } from '../args';
import {
  CAUTION,
  CliInputError,
  readBaseFile,
  readBudgetFile,
  readProfileFile,
  readControllerFile,
  readTouchupFile,
  readTrackFileHashed,
} from '../io';
import type { Touchup } from '../../../shared/schemas/touchup';
import { folderSink, sha256Hex, writeRunOutputs } from '../../pipeline/run-outputs';
import { softwareVersion } from '../../lib/version';
import { describePipelineError } from './check';
import type { CsvBytes, PackageWorker } from '../package-worker';
import { resampleAntiAliasColumns } from '../../../shared/motion/resample';
import type { DecimatedColumn } from '../../../shared/motion/band-limit';
import { startPackageWorker } from '../package-worker';
import { collectGarbage } from '../collect';

export const summary =
  'the whole offline pipeline into a package folder (legs, pose, findings, spectra, report)';

export const help = `Usage: legwork process --base BASE.json [--profile PROFILE.json] [--budget BUDGET.json]
                       [--touchup TOUCHUP.json] [--controller CONTROLLER.json] --in TRACK.csv[.gz] --out DIR

Reads a vehicle, pose or legs track, resamples it to the base's controller rate, cues vehicle
tracks by classical washout (the default profile when none is given), runs the kinematics (inverse;
forward for a legs track), checks the safety budget and computes the rider's spectra. Writes into DIR
the same package a cue run stores:
${PACKAGE_FILES.map((f) => `  ${f.name.padEnd(15)}${f.describes}`).join('\n')}
Without --budget the DEMO budget is used (invented numbers, not a standard's), and the report says so.

Options:
  --base FILE        motion base JSON (docs/motion-conventions.md section 7)
  --profile FILE     cueing profile JSON (vehicle tracks only)
  --budget FILE      safety budget JSON
  --touchup FILE     take touch-up JSON applied before everything else: offset_s, trimIn_s,
                     trimOut_s, gain {axis: factor}, smoothing_hz {axis: cut-off}, fadeIn_s,
                     fadeOut_s (docs/motion-conventions.md, take touch-up)
  --controller FILE  the venue controller's settings: ramp {duration_s, profile quintic or
                     raisedCosine} from neutral into the show and back, added before the
                     kinematics and checked with the show; encoder {countsPerMm, zeroOffset_counts}
                     (recorded; counts are written into release packages). Without it: no ramps
  --in FILE          track CSV, optionally gzipped
  --out DIR          package folder (created if missing; package files in it are replaced)
  -h, --help         this text

Exit codes: 0 within budget, 2 bad input or usage, 3 over a comfort limit only, 4 over a hard limit.

The budget numbers are whatever the venue entered; Legwork does not check them against any code.
${CAUTION}
`;

/** Runs `legwork process`; resolves to the exit code (0, 3 or 4; bad input throws CliInputError for 2). */
export async function run(argv: string[], io: CliIo): Promise<number> {
  const values = parseCommandOptions(
    argv,
    ['base', 'profile', 'budget', 'touchup', 'controller', 'in', 'out'],
    {
      base: 'FILE',
      in: 'FILE',
      out: 'DIR',
    },
  );
  if (!values) {
    io.stdout(help);
    return 0;
  }
  // With LEGWORK_THREADS=1 (see package-worker.ts): started first, so it loads while the track is
  // read; it resamples half the columns and writes the CSV files during the checks.
  const worker = startPackageWorker(import.meta.url);
  try {
    return await runWith(values, io, worker);
  } finally {
    worker?.close();
  }
}

/** Rows up to which a take is processed on two threads (about 40 minutes at 1 kHz). */
const THREADED_MAX_ROWS = 2_500_000;

/**
 * resampleAntiAliasColumns of every column of the track, the first half on this thread and the rest
 * on the worker at the same time; undefined when it cannot be done (processTrack then resamples, and
 * reports any problem with the track as it would).
 */
async function resampleOnTwoThreads(
  worker: PackageWorker,
  track: Track,
  rate_hz: number,
): Promise<Map<number, DecimatedColumn> | undefined> {
  if (track.length < 3) return undefined;
  const half = Math.ceil(track.columns.length / 2);
  const pick = (from: number, to: number) =>
    new Map(track.columns.slice(from, to).map((c, i) => [from + i, c] as const));
  const theirs = worker.resample(track, pick(half, track.columns.length), rate_hz);
  theirs.catch(() => undefined);
  let mine: Map<number, DecimatedColumn>;
  try {
    mine = resampleAntiAliasColumns(track, pick(0, half), rate_hz);
  } catch {
    return undefined;
  }
  // A failed worker is an error: the run was asked to use it (LEGWORK_THREADS=1).
  return new Map([...mine, ...(await theirs)]);
}

async function runWith(
  values: Record<string, string | undefined> & { base: string; in: string; out: string },
  io: CliIo,
  worker: PackageWorker | null,
): Promise<number> {
  const basePath = values.base;
  const inPath = values.in;
  const { base, text: baseText } = await readBaseFile(basePath);
  let budget: Budget | undefined;
  let budgetText: string | undefined;
  if (values.budget) ({ budget, text: budgetText } = await readBudgetFile(values.budget));
  let profile: CueingProfile | undefined;
  let profileText: string | undefined;
  if (values.profile) ({ profile, text: profileText } = await readProfileFile(values.profile));
  let touchup: Touchup | undefined;
  let touchupText: string | undefined;
  if (values.touchup) ({ touchup, text: touchupText } = await readTouchupFile(values.touchup));
  const controller = values.controller ? (await readControllerFile(values.controller)).controller : undefined;
  // The input's SHA-256 and size for the manifest come from the same read as the track. Its columns
  // are held in shared memory, so the worker reads them without a copy. No other name holds the
  // track (its columns are let go below), so inputHash is assigned with it.
  let track: Track | undefined;
  let inputHash: { sha256: string; size_bytes: number };
  // eslint-disable-next-line prefer-const -- see above
  ({ track, ...inputHash } = await readTrackFileHashed(inPath, { sharedMemory: true }));
  if (values.profile && track.kind !== 'vehicle') {
    io.stderr(`warning: ${values.profile}: a ${track.kind} track is not cued; the profile was not used\n`);
  }

  // The reader's blocks, let go once the columns were joined. Only a long take holds enough of them
  // to set the peak; on a shorter one the collection would cost time and save nothing that matters.
  const long = track.length > THREADED_MAX_ROWS;
  if (long) collectGarbage();
  // A long take stays on one thread: a second one would hold its own copies and scratch (hundreds
  // of megabytes on a two-hour take) for a gain that matters less there.
  const helper = worker && track.length <= THREADED_MAX_ROWS ? worker : null;
  if (!helper) worker?.close();
  // Half the columns resampled on each thread (a touch-up changes the take first: then none here).
  const resampledColumns =
    helper && !touchup ? await resampleOnTwoThreads(helper, track, base.controllerRate_hz) : undefined;
  let csvBytes: Promise<CsvBytes> | undefined;

  let result: ProcessResult;
  try {
    result = processTrack({
      track,
      base,
      ...(budget ? { budget } : {}),
      ...(profile ? { profile } : {}),
      ...(touchup ? { touchup } : {}),
      ...(controller ? { ramp: controller.ramp } : {}),
      ...(resampledColumns ? { resampledColumns } : {}),
      ...(helper ? { onMotion: (m) => (csvBytes = helper.csv(m)) } : {}),
    });
  } catch (e) {
    describePipelineError(e, {
      input: inPath,
      track,
      ...(values.profile ? { profile: values.profile } : {}),
    });
  }

  // From here on the package needs only the input's kind, layout and times: the command writes no
  // chart series, the one output that reads the input's columns. Letting the columns go frees about
  // 400 MB on a two-hour 1 kHz take before the package's texts are built.
  const input: Track = {
    kind: track.kind,
    layout: track.layout,
    length: track.length,
    time_s: track.time_s,
    names: track.names,
    columns: [],
  };
  // eslint-disable-next-line no-useless-assignment -- the columns go to the garbage collector
  track = undefined;
  if (long) collectGarbage();
  // The CSV files as bytes in pieces (no string of each file): from the worker, or made here.
  const csv: CsvBytes = csvBytes ? await csvBytes : motionCsvParts(result);
  const outputs = buildRunOutputs(
    result,
    input,
    base,
    {
      input: { file: basename(inPath), ...inputHash },
      track: input,
      base: { file: basename(basePath), sha256: sha256Hex(baseText) },
      ...(values.profile && profileText !== undefined
        ? { profile: { file: basename(values.profile), sha256: sha256Hex(profileText) } }
        : {}),
      ...(values.budget && budgetText !== undefined
        ? { budget: { file: basename(values.budget), sha256: sha256Hex(budgetText) } }
        : {}),
      ...(values.touchup && touchupText !== undefined
        ? { touchup: { file: basename(values.touchup), sha256: sha256Hex(touchupText) } }
        : {}),
      ...(controller ? { controller } : {}),
      softwareVersion: softwareVersion(),
    },
    csv,
  );

  try {
    await writeRunOutputs(outputs, folderSink(values.out));
  } catch (e) {
    throw new CliInputError(`${values.out}: cannot write the package: ${(e as Error).message}`);
  }
  io.stdout(
    `${values.out}: package written (${result.findings.findings.length} finding(s); exit ${result.exitCode}). ` +
      'See report.txt.\n',
  );
  return result.exitCode;
}
