// File and console edges of the `legwork` command: streaming track files into the pure reader,
// reading the JSON inputs (base, budget, profile) with positions in their errors, writing CSV, and the
// shared exit codes and caution.

import { createReadStream, createWriteStream } from 'node:fs';
import { open, readFile, stat } from 'node:fs/promises';
import { once } from 'node:events';
import { TrackFileError, trackColumnNames } from '../../shared/motion/track-reader';
import { TrackStreamError, isGzipName, readTrackStream } from '../pipeline/track-stream';
import type { Track, TrackReaderOptions } from '../../shared/motion/track-reader';
import { MotionBaseError, parseMotionBase } from '../../shared/schemas/motion-base';
import type { MotionBase } from '../../shared/schemas/motion-base';
import { parseBudgetText } from '../../shared/schemas/budget';
import type { Budget } from '../../shared/schemas/budget';
import { parseCueingProfileJson } from '../../shared/schemas/cueing-profile';
import type { CueingProfile } from '../../shared/schemas/cueing-profile';
import { touchupSchema } from '../../shared/schemas/touchup';
import type { Touchup } from '../../shared/schemas/touchup';
import { controllerOutputSchema } from '../../shared/schemas/controller-output';
import type { ControllerOutput } from '../../shared/schemas/controller-output';
import type { z } from 'zod';
import {
  JsonInputError,
  formatJsonPath,
  formatProblem,
  lineColumn,
  locateJsonPath,
  scanJson,
} from '../../shared/schemas/json-input';
import { trackName } from '../../shared/motion/track-names';

/** Exit codes of docs/motion-conventions.md section 7 (1 is left for failures of the program itself). */
export const EXIT = { ok: 0, internal: 1, badInput: 2, comfort: 3, hard: 4, mismatch: 5 } as const;

/** Printed in every help text: the product supports, never replaces, engineering and sign-off. */
export const CAUTION =
  'Caution: motion systems can injure riders and staff. Legwork supports, and never replaces, the ride\n' +
  "manufacturer's engineering, the applicable codes and standards, and a qualified person's sign-off.";

/** Where a command's text goes; tests pass a capturing one. */
export interface CliIo {
  stdout(text: string): void;
  stderr(text: string): void;
}

/** The real process streams. */
export const processIo: CliIo = {
  stdout: (t) => void process.stdout.write(t),
  stderr: (t) => void process.stderr.write(t),
};

/** Bad input or usage: the command prints the message and exits with code 2. */
export class CliInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'CliInputError';
  }
}

function describeFsError(file: string, e: unknown): CliInputError {
  const code = (e as { code?: string }).code;
  if (code === 'ENOENT') return new CliInputError(`${file}: no such file`);
  if (code === 'EISDIR') return new CliInputError(`${file}: is a directory, expected a file`);
  if (code === 'EACCES') return new CliInputError(`${file}: permission denied`);
  if (code === 'Z_DATA_ERROR' || code === 'Z_BUF_ERROR')
    return new CliInputError(`${file}: not a valid gzip file`);
  return new CliInputError(`${file}: cannot read: ${(e as Error).message}`);
}

/**
 * Streams a track file (.csv, or .csv.gz in any case through gunzip) into the track stream reader.
 * Throws TrackFileError for bad content and CliInputError for files that cannot be read.
 */
export async function readTrackFile(
  path: string,
  limits: Omit<TrackReaderOptions, 'file'> = {},
): Promise<Track> {
  return (await readTrackFileHashed(path, limits)).track;
}

/**
 * readTrackFile, and the SHA-256 (hex) and size of the file's bytes as stored (compressed, for .gz),
 * taken in the same pass.
 */
export async function readTrackFileHashed(
  path: string,
  limits: Omit<TrackReaderOptions, 'file'> = {},
): Promise<{ track: Track; sha256: string; size_bytes: number }> {
  try {
    const s = await stat(path);
    if (s.isDirectory()) throw Object.assign(new Error('directory'), { code: 'EISDIR' });
  } catch (e) {
    throw describeFsError(path, e);
  }
  const { maxBytes, ...readerLimits } = limits;
  try {
    // 1 MiB reads: a long take passes in a few hundred chunks rather than thousands of 64 KiB ones.
    const source = isGzipName(path)
      ? createReadStream(path, { highWaterMark: 1 << 20 })
      : fileChunks(path, 1 << 20);
    const got = await readTrackStream(source, {
      ...readerLimits,
      fileName: path,
      ...(maxBytes !== undefined ? { maxTextBytes: maxBytes } : {}),
    });
    return { track: got.track, sha256: got.sha256, size_bytes: got.sizeBytes };
  } catch (e) {
    if (e instanceof TrackFileError) throw e;
    if (e instanceof TrackStreamError) throw new CliInputError(e.message);
    throw describeFsError(path, e);
  }
}

/**
 * The file's bytes in reads of `size` into one buffer, handed out again for each read: for a reader
 * that is done with a chunk before it asks for the next (readTrackStream on plain text).
 */
async function* fileChunks(path: string, size: number): AsyncGenerator<Buffer> {
  const file = await open(path, 'r');
  try {
    const buf = Buffer.allocUnsafe(size);
    for (;;) {
      const { bytesRead } = await file.read(buf, 0, size, null);
      if (bytesRead === 0) return;
      yield buf.subarray(0, bytesRead);
    }
  } finally {
    await file.close();
  }
}

/** Reads a whole UTF-8 text file; a file that cannot be read is a CliInputError naming it. */
export async function readTextFile(path: string): Promise<string> {
  try {
    return await readFile(path, 'utf8');
  } catch (e) {
    throw describeFsError(path, e);
  }
}

/** Reads and parses a JSON file; a syntax error names the file, line and column. */
export async function readJsonFile(path: string): Promise<unknown> {
  const text = await readTextFile(path);
  try {
    return JSON.parse(text);
  } catch {
    const scan = scanJson(text);
    // The scanner and JSON.parse follow the same grammar; the fallback only keeps the error total.
    const { offset, reason } = scan.ok ? { offset: text.length, reason: 'not valid JSON' } : scan;
    const where = lineColumn(text, offset);
    throw new CliInputError(`${path} line ${where.line}, column ${where.column}: not valid JSON: ${reason}`);
  }
}

/** Reads and validates a motion base file; problems come back as one CliInputError listing each. */
export async function readMotionBaseFile(path: string): Promise<MotionBase> {
  const json = await readJsonFile(path);
  try {
    return parseMotionBase(json);
  } catch (e) {
    if (e instanceof MotionBaseError) {
      throw new CliInputError(`${path}: ${e.message}`);
    }
    throw e;
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
  const text = await readTextFile(path);
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
  const text = await readTextFile(path);
  try {
    return { budget: parseBudgetText(text, path), text };
  } catch (e) {
    if (e instanceof JsonInputError) throw new CliInputError(`invalid budget:\n${e.message}`);
    throw e;
  }
}

/** Reads a cueing profile file; each problem is reported as file:line:column: path: reason. */
export async function readProfileFile(path: string): Promise<{ profile: CueingProfile; text: string }> {
  const text = await readTextFile(path);
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

/** Reads a JSON settings file and validates it with `schema`; every problem names the field. */
async function readSettingsFile<S extends z.ZodType>(
  path: string,
  schema: S,
  what: string,
): Promise<{ value: z.infer<S>; text: string }> {
  const text = await readTextFile(path);
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new CliInputError(`${path}: not JSON: ${(e as Error).message}`);
  }
  const r = schema.safeParse(json);
  if (r.success) return { value: r.data, text };
  const lines = r.error.issues.map((i) =>
    formatProblem({ file: path, path: formatJsonPath(i.path), reason: i.message }),
  );
  throw new CliInputError(`invalid ${what}:\n${lines.join('\n')}`);
}

/** Reads and validates a touch-up JSON file; every problem names the field (`gain.z: ...`). */
export async function readTouchupFile(path: string): Promise<{ touchup: Touchup; text: string }> {
  const { value, text } = await readSettingsFile(path, touchupSchema, 'touch-up');
  return { touchup: value, text };
}

/** Reads and validates a venue controller settings file (ramp, encoder); problems name the field. */
export async function readControllerFile(
  path: string,
): Promise<{ controller: ControllerOutput; text: string }> {
  const { value, text } = await readSettingsFile(path, controllerOutputSchema, 'controller settings');
  return { controller: value, text };
}

/**
 * Writes a CSV (header `names`, then time and columns, full round-trip precision) to `outPath`, or to
 * io.stdout when no path is given. Rows are built in blocks so a 600,000-row file streams out.
 */
export async function writeCsv(
  io: CliIo,
  outPath: string | undefined,
  names: readonly string[],
  columns: readonly Float64Array[],
): Promise<void> {
  const n = columns[0]?.length ?? 0;
  const m = columns.length;
  const file = outPath === undefined ? null : createWriteStream(outPath);
  const failed = file
    ? new Promise<never>((_, reject) => file.once('error', (e) => reject(describeFsError(outPath ?? '', e))))
    : null;
  failed?.catch(() => undefined);
  const emit = async (text: string): Promise<void> => {
    if (!file) {
      io.stdout(text);
      return;
    }
    if (!file.write(text)) await Promise.race([once(file, 'drain'), failed]);
  };
  await emit(`${names.join(',')}\n`);
  const BLOCK = 2000;
  for (let start = 0; start < n; start += BLOCK) {
    const end = Math.min(n, start + BLOCK);
    let text = '';
    for (let r = start; r < end; r++) {
      let line = '';
      for (let c = 0; c < m; c++) {
        // String(number) is the shortest text that reads back to the same double; -0 prints as 0.
        line += (c === 0 ? '' : ',') + String((columns[c] as Float64Array)[r]);
      }
      text += `${line}\n`;
    }
    await emit(text);
  }
  if (file) {
    file.end();
    await Promise.race([once(file, 'finish'), failed]);
  }
}

/**
 * Reads a motion base and a track that must be of `kind` in that base's layout (ik takes pose, fk takes
 * legs); any other track is a CliInputError on its header line.
 */
export async function readBaseAndTrack(
  basePath: string,
  inputPath: string,
  kind: 'pose' | 'legs',
): Promise<{ base: MotionBase; track: Track }> {
  const base = await readMotionBaseFile(basePath);
  const track = await readTrackFile(inputPath);
  if (track.kind !== kind || track.layout !== base.kind) {
    throw new CliInputError(
      `${inputPath} line 1: expected a ${trackName(kind, base.kind)} (${['time_s', ...trackColumnNames(kind, base.kind)].join(', ')}), found a ${trackName(track.kind, track.layout)}`,
    );
  }
  return { base, track };
}

/** Writes to stderr a warning per leg (lengths in m, at the track's times) outside the base's stroke. */
export function warnOutsideStroke(
  io: CliIo,
  file: string,
  track: Track,
  legs: readonly Float64Array[],
  base: MotionBase,
): void {
  for (const w of strokeWarnings(file, track.time_s, legs, base.leg.min_m, base.leg.max_m, track.lines)) {
    io.stderr(`${w}\n`);
  }
}

/** Stroke warnings for leg columns (m): per leg out of [min_m, max_m], count, worst value and first time. */
export function strokeWarnings(
  file: string,
  time_s: Float64Array,
  legs: readonly Float64Array[],
  min_m: number,
  max_m: number,
  lines?: Int32Array,
): string[] {
  const out: string[] = [];
  for (let i = 0; i < legs.length; i++) {
    const l = legs[i] as Float64Array;
    let count = 0;
    let first = -1;
    let worst = 0;
    let worstValue = 0;
    for (let s = 0; s < l.length; s++) {
      const v = l[s] as number;
      const over = v > max_m ? v - max_m : v < min_m ? min_m - v : 0;
      if (over > 0) {
        if (first < 0) first = s;
        count++;
        if (over > worst) {
          worst = over;
          worstValue = v;
        }
      }
    }
    if (count > 0) {
      const line = lines?.[first];
      out.push(
        `warning: ${file}: leg${i + 1} outside its stroke [${min_m}, ${max_m}] m at ${count} sample(s), ` +
          `first at t = ${time_s[first]} s${line === undefined ? '' : ` (line ${line})`}, worst ${worstValue.toPrecision(6)} m`,
      );
    }
  }
  return out;
}
