// `legwork check`: the motion-safety budget of a pose (or legs) track on a motion base, as findings JSON.
// Also holds the JSON file readers that `process` shares: every problem names file, line and column.

import { readFile, writeFile } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import { KinematicsError } from '../../../shared/motion/base-geometry';
import { CheckInputError } from '../../../shared/motion/checks';
import { ProcessInputError, processTrack } from '../../../shared/motion/process';
import type { Track } from '../../../shared/motion/track-reader';
import { CueingError } from '../../../shared/motion/washout';
import type { Budget } from '../../../shared/schemas/budget';
import { parseBudgetText } from '../../../shared/schemas/budget';
import {
  JsonInputError,
  formatProblem,
  lineColumn,
  locateJsonPath,
  scanJson,
} from '../../../shared/schemas/json-input';
import type { CueingProfile } from '../../../shared/schemas/cueing-profile';
import { parseCueingProfileJson } from '../../../shared/schemas/cueing-profile';
import type { MotionBase } from '../../../shared/schemas/motion-base';
import { MotionBaseError, parseMotionBase } from '../../../shared/schemas/motion-base';
import type { CliIo } from '../io';
import { CAUTION, CliInputError, readTrackFile } from '../io';

export const summary = 'motion-safety budget of a pose track: findings JSON, exit 0, 3 or 4';

export const help = `Usage: legwork check --base BASE.json --budget BUDGET.json --in POSE.csv[.gz] [--out FINDINGS.json]

Checks a pose track (or a legs track) on a motion base against a safety budget and prints the
findings JSON (motion-spec section 7): every check's worst use ratio per leg, seat or axis, and a
finding with its time span for each stretch at or over a limit. The track is resampled to the base's
controller rate first. Checks: leg stroke (inside [min + margin, max - margin]), leg speed and
acceleration, the rider acceleration-duration envelope at every seat (hard limits); jerk, angular
speed and acceleration, ISO 2631-1 weighted r.m.s. and MSDV z, and conditioning when the budget sets
a limit (comfort limits). Rider forces are compared after a 4-pole 5 Hz Butterworth low-pass
(common practice).

Options:
  --base FILE     motion base JSON (motion-spec section 7)
  --budget FILE   safety budget JSON: strokeMargin_m, envelope, comfort (motion-spec section 7)
  --in FILE       pose or legs track CSV, optionally gzipped
  --out FILE      write the findings JSON here instead of stdout
  -h, --help      this text

Exit codes: 0 within budget, 2 bad input or usage, 3 over a comfort limit only, 4 over a hard limit.

The budget numbers are whatever the venue entered; Legwork does not check them against any code.
${CAUTION}
`;

async function readText(path: string): Promise<string> {
  try {
    return await readFile(path, 'utf8');
  } catch (e) {
    const code = (e as { code?: string }).code;
    if (code === 'ENOENT') throw new CliInputError(`${path}: no such file`);
    if (code === 'EISDIR') throw new CliInputError(`${path}: is a directory, expected a file`);
    throw new CliInputError(`${path}: cannot read: ${(e as Error).message}`);
  }
}

function syntaxError(path: string, text: string): CliInputError | null {
  const scan = scanJson(text);
  if (scan.ok) return null;
  const at = lineColumn(text, scan.offset);
  return new CliInputError(`${path}:${at.line}:${at.column}: not valid JSON: ${scan.reason}`);
}

/** Reads a motion base file; each problem is reported as file:line:column: path: reason. */
export async function readBaseFile(path: string): Promise<{ base: MotionBase; text: string }> {
  const text = await readText(path);
  const bad = syntaxError(path, text);
  if (bad) throw bad;
  try {
    return { base: parseMotionBase(JSON.parse(text)), text };
  } catch (e) {
    if (!(e instanceof MotionBaseError)) throw e;
    const lines = e.issues.map((i) => {
      const at = locateJsonPath(text, i.path);
      return formatProblem({
        file: path,
        ...(at ?? {}),
        path: i.path === '(root)' ? '' : i.path,
        reason: i.message,
      });
    });
    throw new CliInputError(`invalid motion base:\n${lines.join('\n')}`);
  }
}

/** Reads a budget file; each problem is reported as file:line:column: path: reason. */
export async function readBudgetFile(path: string): Promise<{ budget: Budget; text: string }> {
  const text = await readText(path);
  try {
    return { budget: parseBudgetText(text, path), text };
  } catch (e) {
    if (e instanceof JsonInputError) throw new CliInputError(`invalid budget:\n${e.message}`);
    throw e;
  }
}

/** Reads a cueing profile file; each problem is reported as file:line:column: path: reason. */
export async function readProfileFile(path: string): Promise<{ profile: CueingProfile; text: string }> {
  const text = await readText(path);
  const bad = syntaxError(path, text);
  if (bad) throw bad;
  const r = parseCueingProfileJson(text);
  if (r.ok) return { profile: r.profile, text };
  const lines = r.issues.map((i) =>
    formatProblem({
      file: path,
      ...(i.line !== undefined ? { line: i.line, column: i.column } : {}),
      path: i.path === '(profile)' ? '' : i.path,
      reason: i.message,
    }),
  );
  throw new CliInputError(`invalid cueing profile:\n${lines.join('\n')}`);
}

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
  let values: { base?: string; budget?: string; in?: string; out?: string; help?: boolean };
  try {
    values = parseArgs({
      args: argv,
      options: {
        base: { type: 'string' },
        budget: { type: 'string' },
        in: { type: 'string' },
        out: { type: 'string' },
        help: { type: 'boolean', short: 'h' },
      },
      strict: true,
      allowPositionals: false,
    }).values;
  } catch (e) {
    throw new CliInputError((e as Error).message);
  }
  if (values.help) {
    io.stdout(help);
    return 0;
  }
  if (!values.base) throw new CliInputError('missing --base FILE');
  if (!values.budget) throw new CliInputError('missing --budget FILE');
  if (!values.in) throw new CliInputError('missing --in FILE');
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
    result = processTrack({ track, base, budget, chartBuckets: 0 });
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
