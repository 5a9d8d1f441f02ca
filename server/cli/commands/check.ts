// `legwork check`: the motion-safety budget of a pose (or legs) track on a motion base, as findings JSON.
// Also holds the pipeline error wording that `process` shares.

import { writeFile } from 'node:fs/promises';
import { KinematicsError } from '../../../shared/motion/base-geometry';
import { CheckInputError } from '../../../shared/motion/checks';
import { ProcessInputError, processTrack } from '../../../shared/motion/process';
import type { Track } from '../../../shared/motion/track-reader';
import { CueingError } from '../../../shared/motion/washout';
import { parseCommandOptions } from '../args';
import type { CliIo } from '../io';
import { CAUTION, CliInputError, readBaseFile, readBudgetFile, readTrackFile } from '../io';

export const summary = 'motion-safety budget of a pose track: findings JSON, exit 0, 3 or 4';

export const help = `Usage: legwork check --base BASE.json --budget BUDGET.json --in POSE.csv[.gz] [--out FINDINGS.json]

Checks a pose track (or a legs track) on a motion base against a safety budget and prints the
findings JSON (docs/motion-conventions.md section 7): every check's worst use ratio per leg, seat or axis, and a
finding with its time span for each stretch at or over a limit. The track is resampled to the base's
controller rate first. Checks: leg stroke (inside [min + margin, max - margin]), leg speed and
acceleration, the rider acceleration-duration envelope at every seat (hard limits); jerk, angular
speed and acceleration, ISO 2631-1 weighted r.m.s. and MSDV z, and conditioning when the budget sets
a limit (comfort limits). Rider forces are compared after a 4-pole 5 Hz Butterworth low-pass
(common practice).

Options:
  --base FILE     motion base JSON (docs/motion-conventions.md section 7)
  --budget FILE   safety budget JSON: strokeMargin_m, envelope, comfort (docs/motion-conventions.md section 7)
  --in FILE       pose or legs track CSV, optionally gzipped
  --out FILE      write the findings JSON here instead of stdout
  -h, --help      this text

Exit codes: 0 within budget, 2 bad input or usage, 3 over a comfort limit only, 4 over a hard limit.

The budget numbers are whatever the venue entered; Legwork does not check them against any code.
${CAUTION}
`;

/** File line of the input row at or after time t_s (for errors found after resampling). */
export function lineAtTime(track: Track, t_s: number): number | undefined {
  const t = track.time_s;
  let lo = 0;
  let hi = t.length - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if ((t[mid] as number) < t_s) lo = mid + 1;
    else hi = mid;
  }
  return track.lines?.[lo] ?? lo + 2;
}

/**
 * Turns errors the pipeline raises on input it cannot follow into CliInputError naming the file and,
 * where a time is known, the input line.
 */
export function describePipelineError(
  e: unknown,
  files: { input: string; track: Track; profile?: string },
): never {
  if (e instanceof KinematicsError) {
    const line = e.time_s === null ? undefined : lineAtTime(files.track, e.time_s);
    throw new CliInputError(
      `${files.input}${line === undefined ? '' : ` line ${line}`}: forward kinematics failed: ${e.message}`,
    );
  }
  if (e instanceof CueingError) {
    throw new CliInputError(`${files.profile ?? 'default cueing profile'}: ${e.message}`);
  }
  if (e instanceof ProcessInputError || e instanceof CheckInputError) {
    throw new CliInputError(`${files.input}: ${e.message}`);
  }
  throw e;
}

/** Runs `legwork check`; resolves to the exit code (0, 3 or 4; bad input throws CliInputError for 2). */
export async function run(argv: string[], io: CliIo): Promise<number> {
  const values = parseCommandOptions(argv, ['base', 'budget', 'in', 'out'], {
    base: 'FILE',
    budget: 'FILE',
    in: 'FILE',
  });
  if (!values) {
    io.stdout(help);
    return 0;
  }
  const { base } = await readBaseFile(values.base);
  const { budget } = await readBudgetFile(values.budget);
  const track = await readTrackFile(values.in);
  if (track.kind === 'vehicle') {
    throw new CliInputError(
      `${values.in} line 1: this is a vehicle track; \`legwork check\` takes platform motion (a pose or legs track). ` +
        'Use `legwork process` to cue it first.',
    );
  }
  let result;
  try {
    result = processTrack({ track, base, budget });
  } catch (e) {
    describePipelineError(e, { input: values.in, track });
  }
  const text = `${JSON.stringify(result.findings, null, 2)}\n`;
  if (values.out) {
    try {
      await writeFile(values.out, text);
    } catch (e) {
      throw new CliInputError(`${values.out}: cannot write: ${(e as Error).message}`);
    }
  } else {
    io.stdout(text);
  }
  return result.exitCode;
}
