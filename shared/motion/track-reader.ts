// Incremental reader for the track CSV files of docs/motion-conventions.md section 3. Text is pushed in chunks so a
// long take (two hours at 1 kHz, 7,200,000 rows) never has to sit in memory as one string; numbers land
// in fixed-size Float64Array blocks per column, copied once into whole columns at the end (no growth by
// doubling, whose copies would hold one and a half times the track at its peak). Plain decimal fields
// are converted straight from their characters (see parseDecimal); every problem becomes a
// TrackFileError naming file, line and column, so the CLI, the API and the worker can show the same
// message.

import { G0_MPS2, RAD_PER_DEG } from './units';
import { trackName } from './track-names';

/** The three track kinds of docs/motion-conventions.md section 3. */
export type TrackKind = 'vehicle' | 'pose' | 'legs';
/** Which column set a track carries: vehicle motion, or pose/legs of a hexapod or a planar3 stage. */
export type TrackLayout = 'vehicle' | 'hexapod' | 'planar3';

/** Machine-readable reason of a TrackFileError. */
export type TrackErrorCode =
  | 'empty'
  | 'noRows'
  | 'notNumber'
  | 'timeNotIncreasing'
  | 'missingColumn'
  | 'unknownColumn'
  | 'unknownUnit'
  | 'duplicateColumn'
  | 'mixedColumns'
  | 'fieldCount'
  | 'tooManyRows'
  | 'tooLarge'
  | 'lineTooLong'
  | 'implausible'
  | 'tooLong';

/** A bad track file: where (file, 1-based line, 1-based column and its name) and why. */
export class TrackFileError extends Error {
  readonly file: string;
  readonly line: number;
  readonly column: number | null;
  readonly columnName: string | null;
  readonly code: TrackErrorCode;
  readonly reason: string;

  constructor(
    file: string,
    line: number,
    column: number | null,
    columnName: string | null,
    code: TrackErrorCode,
    reason: string,
  ) {
    const where =
      column === null
        ? `${file} line ${line}`
        : `${file} line ${line}, column ${column}${columnName ? ` (${columnName})` : ''}`;
    super(`${where}: ${reason}`);
    this.name = 'TrackFileError';
    this.file = file;
    this.line = line;
    this.column = column;
    this.columnName = columnName;
    this.code = code;
    this.reason = reason;
  }
}

/** A parsed track in SI units: time plus columns in the canonical order of its layout. */
export interface Track {
  readonly kind: TrackKind;
  readonly layout: TrackLayout;
  readonly length: number;
  readonly time_s: Float64Array;
  /** SI column names, canonical order, e.g. ['x_m', 'y_m', 'z_m', 'roll_rad', 'pitch_rad', 'yaw_rad']. */
  readonly names: readonly string[];
  /** One array per name, same order, each `length` long. */
  readonly columns: readonly Float64Array[];
  /** File line (1-based) of each row, when the track was read from a file; lets later errors name it. */
  readonly lines?: Int32Array;
}

/** Limits that protect the server from hostile or mistaken uploads. */
export interface TrackReaderOptions {
  /** Name used in messages (usually the file's base name). */
  file: string;
  /** Most data rows accepted; default 7,500,000 (two hours at 1 kHz, with room). */
  maxRows?: number;
  /** Most characters of text accepted (bytes for the ASCII files we expect); default 1 GiB. */
  maxBytes?: number;
  /** Most characters in one line; default 4,096 (a row of seven numbers needs under 200). */
  maxLineChars?: number;
  /**
   * The track's arrays in SharedArrayBuffers (where the platform has them), so other threads can
   * read them without a copy; the values are the same.
   */
  sharedMemory?: boolean;
}

/** Default most data rows of a track file: two hours at 1 kHz (7,200,001 rows), with room. */
export const DEFAULT_MAX_ROWS = 7_500_000;
/** Default most characters of a track file's text, 1 GiB (7,500,000 rows of seven 17-digit numbers need less). */
export const DEFAULT_MAX_BYTES = 1024 * 1024 * 1024;
/**
 * Largest magnitude a track value may have, per column base, in SI. Beyond these no ride and no motion
 * base can be (common practice: ride accelerations stay within a few g, spinning rides turn at about
 * one revolution per second, motion base excursions are a metre or two); such a value is a broken
 * export or a wrong unit, refused with its line so it is never cued and read as "within budget".
 */
export const PLAUSIBLE_LIMITS = {
  /** Specific force, 20 g. */
  accel_mps2: 20 * G0_MPS2,
  /** Angular rate, 20 rad/s (about 3.2 revolutions per second). */
  rate_radps: 20,
  /** Pose offset of the platform, 10 m. */
  offset_m: 10,
  /** Pose angle offset, one full turn. */
  angle_rad: 2 * Math.PI,
  /** Leg length, 50 m (and above 0). */
  leg_m: 50,
  /** Longest take, 4 hours (from its first to its last row). */
  duration_s: 4 * 3600,
} as const;

/** The plausible SI range [lo, hi] of a column base (lo is the smallest positive double for a leg). */
function plausibleRange(base: string): [number, number] {
  const L = PLAUSIBLE_LIMITS;
  switch (QUANTITY[base]) {
    case 'accel':
      return [-L.accel_mps2, L.accel_mps2];
    case 'rate':
      return [-L.rate_radps, L.rate_radps];
    case 'angle':
      return [-L.angle_rad, L.angle_rad];
    case 'length':
      return base.startsWith('leg') ? [Number.MIN_VALUE, L.leg_m] : [-L.offset_m, L.offset_m];
    default:
      return [-Infinity, Infinity];
  }
}

/** Four significant digits, for limits in messages. */
const sig = (v: number): string => String(Number(v.toPrecision(4)));

/** Rows per storage block of the reader's columns. */
const BLOCK_ROWS = 16384;
/** Default most characters of one line of a track file. */
export const DEFAULT_MAX_LINE_CHARS = 4096;
/** Blank lines allowed besides the header and the data rows (every line counts against the row limit). */
const BLANK_LINE_ALLOWANCE = 1024;

type Quantity = 'time' | 'length' | 'angle' | 'accel' | 'rate';

// Unit suffix -> factor to SI. The SI suffix comes first: it names the output column.
const UNITS: Record<Quantity, ReadonlyArray<readonly [string, number]>> = {
  time: [['s', 1]],
  length: [
    ['m', 1],
    ['mm', 1e-3],
  ],
  angle: [
    ['rad', 1],
    ['deg', RAD_PER_DEG],
  ],
  accel: [
    ['mps2', 1],
    ['g', G0_MPS2],
  ],
  rate: [
    ['radps', 1],
    ['degps', RAD_PER_DEG],
  ],
};

const QUANTITY: Record<string, Quantity> = {
  time: 'time',
  fx: 'accel',
  fy: 'accel',
  fz: 'accel',
  wx: 'rate',
  wy: 'rate',
  wz: 'rate',
  x: 'length',
  y: 'length',
  z: 'length',
  roll: 'angle',
  pitch: 'angle',
  yaw: 'angle',
  leg1: 'length',
  leg2: 'length',
  leg3: 'length',
  leg4: 'length',
  leg5: 'length',
  leg6: 'length',
};

interface LayoutSpec {
  kind: TrackKind;
  layout: TrackLayout;
  bases: readonly string[];
}

const LAYOUTS: readonly LayoutSpec[] = [
  { kind: 'vehicle', layout: 'vehicle', bases: ['fx', 'fy', 'fz', 'wx', 'wy', 'wz'] },
  { kind: 'pose', layout: 'hexapod', bases: ['x', 'y', 'z', 'roll', 'pitch', 'yaw'] },
  { kind: 'pose', layout: 'planar3', bases: ['x', 'y', 'yaw'] },
  { kind: 'legs', layout: 'hexapod', bases: ['leg1', 'leg2', 'leg3', 'leg4', 'leg5', 'leg6'] },
  { kind: 'legs', layout: 'planar3', bases: ['leg1', 'leg2', 'leg3'] },
];

const KIND_OF_BASE: Record<string, TrackKind> = {
  fx: 'vehicle',
  fy: 'vehicle',
  fz: 'vehicle',
  wx: 'vehicle',
  wy: 'vehicle',
  wz: 'vehicle',
  x: 'pose',
  y: 'pose',
  z: 'pose',
  roll: 'pose',
  pitch: 'pose',
  yaw: 'pose',
  leg1: 'legs',
  leg2: 'legs',
  leg3: 'legs',
  leg4: 'legs',
  leg5: 'legs',
  leg6: 'legs',
};

/** The SI column name of a base name, e.g. 'roll' -> 'roll_rad'. */
export function siColumnName(base: string): string {
  const q = QUANTITY[base];
  const si = q ? UNITS[q][0] : undefined;
  if (!si) throw new Error(`unknown column base "${base}"`);
  return `${base}_${si[0]}`;
}

/** SI column names (canonical order, without time_s) of a kind and layout. */
export function trackColumnNames(kind: TrackKind, layout: TrackLayout): string[] {
  const spec = LAYOUTS.find((l) => l.kind === kind && l.layout === layout);
  if (!spec) throw new Error(`no ${kind} track for a ${layout} layout`);
  return spec.bases.map(siColumnName);
}

/** Returns the named SI column of a track, or throws if the track has none. */
export function trackColumn(track: Track, name: string): Float64Array {
  const i = track.names.indexOf(name);
  const col = i >= 0 ? track.columns[i] : undefined;
  if (!col) throw new Error(`track has no column ${name}`);
  return col;
}

// Strict decimal syntax: Number() alone would accept '', '0x1f', 'Infinity' and surrounding blanks.
const NUMBER_RE = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

function unquote(field: string): string {
  const t = field.trim();
  return t.length >= 2 && t.charCodeAt(0) === 34 && t.charCodeAt(t.length - 1) === 34
    ? t.slice(1, -1).trim()
    : t;
}

// Exact powers of ten: every one up to 1e22 is a double, so one multiplication or division by it
// rounds correctly.
const POW10 = [
  1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19,
  1e20, 1e21, 1e22,
];

// Where the last scanDecimal stopped: the index of the first character after the number.
let scanStop = 0;

/**
 * mant x 10^scale with its sign, correctly rounded: both mant (at most 15 digits) and 10^|scale| (at
 * most 10^22) are exact doubles, so one multiplication or division rounds once (IEEE 754); NaN
 * beyond that, where only the slow way can tell.
 */
function decimalValue(mant: number, scale: number, neg: boolean): number {
  let v: number;
  if (mant === 0) v = 0;
  else if (scale >= 0) {
    if (scale > 22) return NaN;
    v = mant * (POW10[scale] as number);
  } else {
    if (scale < -22) return NaN;
    v = mant / (POW10[-scale] as number);
  }
  return neg ? -v : v;
}

/**
 * Reads the plain decimal at text[from, ...) (sign, digits, a point, digits, an exponent: a subset of
 * NUMBER_RE) up to the first character that cannot continue it or `to`, and sets scanStop there.
 * Returns its value when it has at most 15 significant digits and its scale is within 10^22, else
 * NaN (the caller then reads the field the slow way). The value equals Number() of the text: the
 * digits make an integer below 2^53, exactly a double, and one multiplication or division by an
 * exact power of ten rounds correctly (Clinger, "How to read floating point numbers accurately",
 * PLDI 1990, the fast path).
 */
function scanDecimal(text: string, from: number, to: number): number {
  let i = from;
  scanStop = from;
  if (i >= to) return NaN;
  let c = text.charCodeAt(i);
  let neg = false;
  if (c === 45 || c === 43) {
    neg = c === 45;
    if (++i >= to) return NaN;
    c = text.charCodeAt(i);
  }
  let mant = 0;
  let digits = 0; // significant digits taken into mant
  let scale = 0; // power of ten the digits are to be multiplied by
  let any = false;
  while (i < to) {
    c = text.charCodeAt(i);
    const d = c - 48;
    if (d < 0 || d > 9) break;
    any = true;
    if (mant !== 0 || d !== 0) {
      if (++digits > 15) return NaN;
      mant = mant * 10 + d;
    }
    i++;
  }
  if (i < to && c === 46) {
    i++;
    while (i < to) {
      c = text.charCodeAt(i);
      const d = c - 48;
      if (d < 0 || d > 9) break;
      any = true;
      if (mant !== 0 || d !== 0) {
        if (++digits > 15) return NaN;
        mant = mant * 10 + d;
      }
      scale--;
      i++;
    }
  }
  if (!any) return NaN;
  if (i < to && (c === 101 || c === 69)) {
    if (++i >= to) return NaN;
    c = text.charCodeAt(i);
    let eneg = false;
    if (c === 45 || c === 43) {
      eneg = c === 45;
      if (++i >= to) return NaN;
    }
    let e = 0;
    let edigits = 0;
    while (i < to) {
      const d = text.charCodeAt(i) - 48;
      if (d < 0 || d > 9) break;
      if (++edigits > 4) return NaN;
      e = e * 10 + d;
      i++;
    }
    if (edigits === 0) return NaN;
    scale += eneg ? -e : e;
  }
  scanStop = i;
  return decimalValue(mant, scale, neg);
}

/**
 * The value of text[from, to) when it is all one plain decimal that scanDecimal reads, else NaN: the
 * value Number() gives, or NaN where only the slow way can tell.
 */
export function parseDecimal(text: string, from: number, to: number): number {
  const v = scanDecimal(text, from, to);
  return scanStop === to ? v : NaN;
}

/**
 * scanDecimal on ASCII bytes: reads the plain decimal at bytes[from, ...) up to the first byte that
 * cannot continue it or `to`, sets scanStop there and returns its value, or NaN where scanDecimal
 * would (the same digits, scale and rounding, so the same value for the same characters).
 */
function scanDecimalBytes(bytes: Uint8Array, from: number, to: number): number {
  let i = from;
  scanStop = from;
  if (i >= to) return NaN;
  let c = bytes[i] as number;
  let neg = false;
  if (c === 45 || c === 43) {
    neg = c === 45;
    if (++i >= to) return NaN;
    c = bytes[i] as number;
  }
  let mant = 0;
  let digits = 0;
  let scale = 0;
  let any = false;
  while (i < to) {
    c = bytes[i] as number;
    const d = c - 48;
    if (d < 0 || d > 9) break;
    any = true;
    if (mant !== 0 || d !== 0) {
      if (++digits > 15) return NaN;
      mant = mant * 10 + d;
    }
    i++;
  }
  if (i < to && c === 46) {
    i++;
    while (i < to) {
      c = bytes[i] as number;
      const d = c - 48;
      if (d < 0 || d > 9) break;
      any = true;
      if (mant !== 0 || d !== 0) {
        if (++digits > 15) return NaN;
        mant = mant * 10 + d;
      }
      scale--;
      i++;
    }
  }
  if (!any) return NaN;
  if (i < to && (c === 101 || c === 69)) {
    if (++i >= to) return NaN;
    c = bytes[i] as number;
    let eneg = false;
    if (c === 45 || c === 43) {
      eneg = c === 45;
      if (++i >= to) return NaN;
    }
    let e = 0;
    let edigits = 0;
    while (i < to) {
      const d = (bytes[i] as number) - 48;
      if (d < 0 || d > 9) break;
      if (++edigits > 4) return NaN;
      e = e * 10 + d;
      i++;
    }
    if (edigits === 0) return NaN;
    scale += eneg ? -e : e;
  }
  scanStop = i;
  return decimalValue(mant, scale, neg);
}

/** parseDecimal on ASCII bytes: the value of bytes[from, to) when all of it is one plain decimal, else NaN. */
export function parseDecimalBytes(bytes: Uint8Array, from: number, to: number): number {
  const v = scanDecimalBytes(bytes, from, to);
  return scanStop === to ? v : NaN;
}

// Decodes a line's bytes for the text path: UTF-8, a bad sequence as U+FFFD, a U+FEFF kept (the
// reader drops one only at the start of the file, as push() does).
const UTF8 = new TextDecoder('utf-8', { ignoreBOM: true });

function showField(raw: string): string {
  const t = raw.length > 40 ? `${raw.slice(0, 40)}...` : raw;
  return JSON.stringify(t);
}

/**
 * Push-based CSV track parser: `push(text)` or `pushBytes(bytes)` (UTF-8; one or the other for a
 * whole file) any number of times, then `end()` for the Track. Both give the same track and the same
 * errors for the same file.
 */
export class TrackReader {
  private readonly file: string;
  private readonly maxRows: number;
  private readonly maxBytes: number;
  private readonly maxLineChars: number;
  private readonly sharedMemory: boolean;
  // The unfinished last line, in pieces (joined once its newline arrives: linear in the input).
  private carry: string[] = [];
  private carryChars = 0;
  private blankLines = 0;
  private bytes = 0;
  private lineNo = 0;
  private failed: TrackFileError | null = null;
  private headerDone = false;
  private fieldCount = 0;
  private headerNames: string[] = [];
  // Per file field: index into the output columns (-1 for time) and the factor to SI.
  private target: Int32Array = new Int32Array(0);
  private scale: Float64Array = new Float64Array(0);
  // Per output column: the plausible range [lo, hi] in SI (see PLAUSIBLE_LIMITS).
  private lo: Float64Array = new Float64Array(0);
  private hi: Float64Array = new Float64Array(0);
  private firstTime = NaN;
  private spec: LayoutSpec | null = null;
  private rows = 0;
  // Filled blocks, and the block being filled (row `rows` goes to index rows % BLOCK_ROWS).
  private timeBlocks: Float64Array[] = [];
  private lineBlocks: Int32Array[] = [];
  private colBlocks: Float64Array[][] = [];
  private time: Float64Array = new Float64Array(0);
  private lines: Int32Array = new Int32Array(0);
  private cols: Float64Array[] = [];
  private lastTime = -Infinity;
  // Row index of the current block's first row.
  private blockStart = 0;
  private lastTimeLine = 0;
  private started = false;
  // pushBytes: the unfinished last line's bytes (byteCarry[0, byteCarryLen)).
  private byteCarry: Uint8Array = new Uint8Array(0);
  private byteCarryLen = 0;
  private input: 'none' | 'text' | 'bytes' = 'none';
  // One row's values as read, before they are checked and stored (pushBytes).
  private values: Float64Array = new Float64Array(0);

  constructor(options: TrackReaderOptions) {
    this.file = options.file;
    this.maxRows = options.maxRows ?? DEFAULT_MAX_ROWS;
    this.maxBytes = options.maxBytes ?? DEFAULT_MAX_BYTES;
    this.maxLineChars = options.maxLineChars ?? DEFAULT_MAX_LINE_CHARS;
    this.sharedMemory = options.sharedMemory === true && typeof SharedArrayBuffer === 'function';
  }

  /** Feeds the next piece of the file's text (any split, even mid-line or mid-number). */
  push(chunk: string): void {
    if (this.failed) throw this.failed;
    this.inputIs('text');
    try {
      this.bytes += chunk.length;
      if (this.bytes > this.maxBytes) {
        this.fail(
          this.lineNo + 1,
          null,
          null,
          'tooLarge',
          `file too large: more than ${this.maxBytes} bytes`,
        );
      }
      let text = chunk;
      if (!this.started && text.length > 0) {
        this.started = true;
        if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
      }
      // Only the new text is searched for newlines; the carried start of a line is never searched again.
      let start = 0;
      let nl = text.indexOf('\n');
      if (nl >= 0 && this.carry.length > 0) {
        this.checkLineLength(this.carryChars + nl);
        this.carry.push(text.slice(0, nl));
        const whole = this.carry.join('');
        this.carry = [];
        this.carryChars = 0;
        this.line(whole, 0, whole.length);
        start = nl + 1;
        nl = text.indexOf('\n', start);
      }
      while (nl >= 0) {
        this.checkLineLength(nl - start);
        this.line(text, start, nl);
        start = nl + 1;
        nl = text.indexOf('\n', start);
      }
      if (start < text.length) {
        this.checkLineLength(this.carryChars + text.length - start);
        this.carry.push(start === 0 ? text : text.slice(start));
        this.carryChars += text.length - start;
      }
    } catch (e) {
      if (e instanceof TrackFileError) this.failed = e;
      throw e;
    }
  }

  /**
   * Feeds the next piece of the file as UTF-8 bytes (any split, even mid-line, mid-number or
   * mid-character). Rows of plain decimals are read from the bytes with no string per line; any other
   * line is decoded and read as push() reads it. The size limit (maxBytes) counts bytes here.
   */
  pushBytes(chunk: Uint8Array): void {
    if (this.failed) throw this.failed;
    this.inputIs('bytes');
    try {
      this.bytes += chunk.length;
      if (this.bytes > this.maxBytes) {
        this.fail(
          this.lineNo + 1,
          null,
          null,
          'tooLarge',
          `file too large: more than ${this.maxBytes} bytes`,
        );
      }
      let start = 0;
      let nl = chunk.indexOf(10);
      if (nl >= 0 && this.byteCarryLen > 0) {
        this.carryBytes(chunk, 0, nl, false);
        this.lineBytes(this.byteCarry, 0, this.byteCarryLen);
        this.byteCarryLen = 0;
        start = nl + 1;
        nl = chunk.indexOf(10, start);
      }
      const max = this.maxLineChars;
      while (nl >= 0) {
        if (nl - start > max) this.checkLineBytes(chunk, start, nl, false);
        this.lineBytes(chunk, start, nl);
        start = nl + 1;
        nl = chunk.indexOf(10, start);
      }
      if (start < chunk.length) this.carryBytes(chunk, start, chunk.length, true);
    } catch (e) {
      if (e instanceof TrackFileError) this.failed = e;
      throw e;
    }
  }

  /** Ends the input and returns the track; throws TrackFileError if the file was bad or empty. */
  end(): Track {
    if (this.failed) throw this.failed;
    try {
      if (this.byteCarryLen > 0) {
        const len = this.byteCarryLen;
        this.byteCarryLen = 0;
        this.lineBytes(this.byteCarry, 0, len);
      }
      if (this.carry.length > 0) {
        const last = this.carry.join('');
        this.carry = [];
        this.carryChars = 0;
        this.line(last, 0, last.length);
      }
      if (!this.headerDone) this.fail(1, null, null, 'empty', 'empty file: no header row');
      if (this.rows === 0) this.fail(this.lineNo, null, null, 'noRows', 'no data rows after the header');
    } catch (e) {
      if (e instanceof TrackFileError) this.failed = e;
      throw e;
    }
    const spec = this.spec as LayoutSpec;
    const n = this.rows;
    const f64 = (): Float64Array =>
      this.sharedMemory ? new Float64Array(new SharedArrayBuffer(8 * n)) : new Float64Array(n);
    const time_s = this.joinBlocks(this.timeBlocks, this.time, f64());
    const lines = this.joinBlocks(this.lineBlocks, this.lines, new Int32Array(n));
    const columns: Float64Array[] = [];
    for (let j = 0; j < this.cols.length; j++) {
      columns.push(this.joinBlocks(this.colBlocks[j] as Float64Array[], this.cols[j] as Float64Array, f64()));
      // Let the blocks go column by column, so at most one column is held twice.
      this.colBlocks[j] = [];
    }
    this.cols = [];
    this.timeBlocks = [];
    this.lineBlocks = [];
    return {
      kind: spec.kind,
      layout: spec.layout,
      length: n,
      time_s,
      names: spec.bases.map(siColumnName),
      columns,
      lines,
    };
  }

  /** Copies the filled blocks and the first rows of the current one into `out` (`rows` long). */
  private joinBlocks<T extends Float64Array | Int32Array>(blocks: T[], current: T, out: T): T {
    let at = 0;
    for (const b of blocks) {
      out.set(b, at);
      at += b.length;
    }
    out.set(current.subarray(0, this.rows - at), at);
    return out;
  }

  private fail(
    line: number,
    column: number | null,
    columnName: string | null,
    code: TrackErrorCode,
    reason: string,
  ): never {
    throw new TrackFileError(this.file, line, column, columnName, code, reason);
  }

  private inputIs(kind: 'text' | 'bytes'): void {
    if (this.input === 'none') this.input = kind;
    else if (this.input !== kind) throw new Error('TrackReader: push() and pushBytes() mixed in one file');
  }

  /** Appends bytes[from, to) to the carried line; checks its length (`partial`: more may follow). */
  private carryBytes(bytes: Uint8Array, from: number, to: number, partial: boolean): void {
    const len = this.byteCarryLen + to - from;
    if (len > this.byteCarry.length) {
      const grown = new Uint8Array(Math.max(256, 2 * len));
      grown.set(this.byteCarry.subarray(0, this.byteCarryLen));
      this.byteCarry = grown;
    }
    this.byteCarry.set(bytes.subarray(from, to), this.byteCarryLen);
    this.byteCarryLen = len;
    if (len > this.maxLineChars) this.checkLineBytes(this.byteCarry, 0, len, partial);
  }

  /**
   * The line-length check of push() on bytes[from, to): in characters, as push() counts them (bytes
   * when all are ASCII; a BOM at the file's start not counted). `partial`: the line goes on, so an
   * unfinished character at the end is not counted yet.
   */
  private checkLineBytes(bytes: Uint8Array, from: number, to: number, partial: boolean): void {
    let ascii = true;
    for (let i = from; i < to; i++) {
      if ((bytes[i] as number) >= 0x80) {
        ascii = false;
        break;
      }
    }
    if (ascii) {
      this.checkLineLength(to - from);
      return;
    }
    const text = new TextDecoder('utf-8', { ignoreBOM: true }).decode(bytes.subarray(from, to), {
      stream: partial,
    });
    const bom = this.lineNo === 0 && text.charCodeAt(0) === 0xfeff ? 1 : 0;
    this.checkLineLength(text.length - bom);
  }

  /** The text of line bytes[from, to) as push() would see it. */
  private decodeLine(bytes: Uint8Array, from: number, to: number): string {
    const text = UTF8.decode(bytes.subarray(from, to));
    return this.lineNo === 1 && text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  }

  /** One line of pushBytes (without its '\n'). */
  private lineBytes(bytes: Uint8Array, from: number, to: number): void {
    this.lineNo++;
    let end = to;
    if (end > from && bytes[end - 1] === 13) end--;
    if (!this.headerDone) {
      const text = this.decodeLine(bytes, from, end);
      this.lineText(text, 0, text.length);
      return;
    }
    for (let i = from; i < end; i++) {
      const c = bytes[i];
      if (c !== 32 && c !== 9) {
        this.rowBytes(bytes, from, end);
        return;
      }
    }
    this.blankLine();
  }

  /**
   * A data row of pushBytes: all plain short decimals, read from the bytes and then checked and stored
   * field by field as row() does; any other row goes to row() as text.
   */
  private rowBytes(bytes: Uint8Array, from: number, end: number): void {
    const ln = this.lineNo;
    if (this.rows >= this.maxRows) {
      this.fail(ln, null, null, 'tooManyRows', `too many rows: more than ${this.maxRows}`);
    }
    const n = this.fieldCount;
    const values = this.values;
    let pos = from;
    for (let c = 0; c < n; c++) {
      const x = scanDecimalBytes(bytes, pos, end);
      const stop = scanStop;
      if (x !== x || (c === n - 1 ? stop !== end : stop === end || bytes[stop] !== 44)) {
        const text = this.decodeLine(bytes, from, end);
        this.row(text, 0, text.length);
        return;
      }
      values[c] = x;
      pos = stop + 1;
    }
    if (this.rows - this.blockStart >= this.time.length) this.nextBlock();
    const r = this.rows - this.blockStart;
    for (let c = 0; c < n; c++) this.store(ln, c, r, values[c] as number);
    this.lines[r] = ln;
    this.rows++;
  }

  private checkLineLength(chars: number): void {
    if (chars > this.maxLineChars) {
      this.fail(
        this.lineNo + 1,
        null,
        null,
        'lineTooLong',
        `line too long: more than ${this.maxLineChars} characters`,
      );
    }
  }

  private line(text: string, from: number, to: number): void {
    this.lineNo++;
    let end = to;
    if (end > from && text.charCodeAt(end - 1) === 13) end--;
    this.lineText(text, from, end);
  }

  /** Line `lineNo`, text[from, end) without its line end: blank, the header or a data row. */
  private lineText(text: string, from: number, end: number): void {
    // Blank lines (often a trailing one) carry no data.
    let blank = true;
    for (let i = from; i < end; i++) {
      const c = text.charCodeAt(i);
      if (c !== 32 && c !== 9) {
        blank = false;
        break;
      }
    }
    if (blank) {
      this.blankLine();
      return;
    }
    if (!this.headerDone) this.header(text.slice(from, end));
    else this.row(text, from, end);
  }

  private blankLine(): void {
    if (++this.blankLines > BLANK_LINE_ALLOWANCE + this.rows) {
      this.fail(
        this.lineNo,
        null,
        null,
        'tooManyRows',
        `too many blank lines: more than ${BLANK_LINE_ALLOWANCE} besides one per data row`,
      );
    }
  }

  private header(line: string): void {
    const names = line.split(',').map(unquote);
    const n = names.length;
    const baseAt = new Map<string, number>();
    const factors = new Float64Array(n);
    const ln = this.lineNo;
    for (let c = 0; c < n; c++) {
      const name = names[c] ?? '';
      const us = name.lastIndexOf('_');
      const base = us > 0 ? name.slice(0, us) : name;
      const unit = us > 0 ? name.slice(us + 1) : '';
      const q = QUANTITY[base];
      if (!q) {
        this.fail(ln, c + 1, name, 'unknownColumn', `unknown column ${showField(name)}`);
      }
      const units = UNITS[q];
      const u = units.find((x) => x[0] === unit);
      if (!u) {
        const expected = units.map((x) => `${base}_${x[0]}`).join(' or ');
        this.fail(
          ln,
          c + 1,
          name,
          'unknownUnit',
          unit === ''
            ? `missing unit suffix (expected ${expected})`
            : `unknown unit "${unit}" (expected ${expected})`,
        );
      }
      const prev = baseAt.get(base);
      if (prev !== undefined) {
        this.fail(
          ln,
          c + 1,
          name,
          'duplicateColumn',
          `duplicate column: ${base} already given in column ${prev + 1} (${names[prev]})`,
        );
      }
      baseAt.set(base, c);
      factors[c] = u[1];
    }
    if (!baseAt.has('time')) {
      this.fail(ln, null, 'time_s', 'missingColumn', 'missing column "time_s"');
    }
    // The first motion column decides the kind; any column of another kind is a mix-up.
    let kind: TrackKind | null = null;
    for (let c = 0; c < n; c++) {
      const name = names[c] ?? '';
      const base = name.slice(0, Math.max(name.lastIndexOf('_'), 0)) || name;
      const k = KIND_OF_BASE[base];
      if (!k) continue;
      if (kind === null) kind = k;
      else if (k !== kind) {
        this.fail(ln, c + 1, name, 'mixedColumns', `a ${k} column in a ${kind} track`);
      }
    }
    if (kind === null) {
      this.fail(
        ln,
        null,
        null,
        'missingColumn',
        'missing motion columns: expected a vehicle, pose or legs track',
      );
    }
    let spec: LayoutSpec | undefined;
    if (kind === 'vehicle') spec = LAYOUTS[0];
    else if (kind === 'pose') {
      const full = baseAt.has('z') || baseAt.has('roll') || baseAt.has('pitch');
      spec = full ? LAYOUTS[1] : LAYOUTS[2];
    } else {
      const full = baseAt.has('leg4') || baseAt.has('leg5') || baseAt.has('leg6');
      spec = full ? LAYOUTS[3] : LAYOUTS[4];
    }
    if (!spec) throw new Error('unreachable: layout table');
    for (const b of spec.bases) {
      if (!baseAt.has(b)) {
        const q = QUANTITY[b] as Quantity;
        const alts = UNITS[q].map((x) => `"${b}_${x[0]}"`).join(' or ');
        this.fail(
          ln,
          null,
          `${b}_${UNITS[q][0]?.[0]}`,
          'missingColumn',
          `missing column ${alts} for a ${trackName(spec.kind, spec.layout)}`,
        );
      }
    }
    if (n !== spec.bases.length + 1) {
      // Only reachable with a column that belongs to the kind but not the layout, e.g. leg4 without leg5.
      const extra = names.find((nm) => {
        const b = nm.slice(0, Math.max(nm.lastIndexOf('_'), 0));
        return b !== 'time' && !spec.bases.includes(b);
      });
      const c = extra === undefined ? n : names.indexOf(extra) + 1;
      this.fail(
        ln,
        c,
        extra ?? null,
        'unknownColumn',
        `column does not belong to a ${trackName(spec.kind, spec.layout)}`,
      );
    }
    const target = new Int32Array(n);
    for (let c = 0; c < n; c++) {
      const name = names[c] ?? '';
      const base = name.slice(0, name.lastIndexOf('_'));
      target[c] = base === 'time' ? -1 : spec.bases.indexOf(base);
    }
    this.spec = spec;
    this.headerNames = names;
    this.fieldCount = n;
    this.target = target;
    this.scale = factors;
    this.lo = new Float64Array(spec.bases.length);
    this.hi = new Float64Array(spec.bases.length);
    spec.bases.forEach((b, j) => {
      const [lo, hi] = plausibleRange(b);
      this.lo[j] = lo;
      this.hi[j] = hi;
    });
    this.headerDone = true;
    this.values = new Float64Array(n);
    this.colBlocks = spec.bases.map(() => []);
    this.newBlock(64);
  }

  /** Starts a block of `size` rows (the first one small, so a short file stays small). */
  private newBlock(size: number): void {
    this.time = new Float64Array(size);
    this.lines = new Int32Array(size);
    this.cols = (this.spec as LayoutSpec).bases.map(() => new Float64Array(size));
  }

  /** The current block is full: keep it and start the next. */
  private nextBlock(): void {
    this.timeBlocks.push(this.time);
    this.lineBlocks.push(this.lines);
    for (let j = 0; j < this.cols.length; j++)
      (this.colBlocks[j] as Float64Array[]).push(this.cols[j] as Float64Array);
    this.blockStart = this.rows;
    this.newBlock(BLOCK_ROWS);
  }

  private row(text: string, from: number, end: number): void {
    const ln = this.lineNo;
    if (this.rows >= this.maxRows) {
      this.fail(ln, null, null, 'tooManyRows', `too many rows: more than ${this.maxRows}`);
    }
    if (this.rows - this.blockStart >= this.time.length) this.nextBlock();
    const r = this.rows - this.blockStart;
    const n = this.fieldCount;
    let pos = from;
    for (let c = 0; c < n; c++) {
      // One pass reads the number and finds its end, which must be the comma (or the line's end for
      // the last field); anything else is read again the slow way.
      let x = scanDecimal(text, pos, end);
      let stop = scanStop;
      const last = c === n - 1;
      if (x !== x || (last ? stop !== end : stop === end || text.charCodeAt(stop) !== 44)) {
        let comma = text.indexOf(',', pos);
        if (comma < 0 || comma > end) comma = -1;
        if ((!last && comma < 0) || (last && comma >= 0)) {
          const got = text.slice(from, end).split(',').length;
          this.fail(ln, null, null, 'fieldCount', `wrong field count: expected ${n} fields, got ${got}`);
        }
        stop = comma < 0 ? end : comma;
        x = parseDecimal(text, pos, stop);
        if (x !== x) x = this.slowField(text, pos, stop, c);
      }
      pos = stop + 1;
      this.store(ln, c, r, x);
    }
    this.lines[r] = ln;
    this.rows++;
  }

  /** Checks field c's value x (file units) of line ln and stores it in SI at row r of the block. */
  private store(ln: number, c: number, r: number, x: number): void {
    // Finite: a plain decimal is below 1e37, and slowField refuses what is not.
    const v = x * (this.scale[c] as number);
    const j = this.target[c] as number;
    if (j < 0) {
      if (!(v > this.lastTime)) {
        this.fail(
          ln,
          c + 1,
          this.headerNames[c] ?? null,
          'timeNotIncreasing',
          `time not increasing: ${v} s after ${this.lastTime} s on line ${this.lastTimeLine}`,
        );
      }
      if (this.rows === 0) this.firstTime = v;
      else if (v - this.firstTime > PLAUSIBLE_LIMITS.duration_s) {
        this.fail(
          ln,
          c + 1,
          this.headerNames[c] ?? null,
          'tooLong',
          `take too long: ${v} s is more than ${PLAUSIBLE_LIMITS.duration_s / 3600} hours after the first row's ${this.firstTime} s`,
        );
      }
      this.lastTime = v;
      this.lastTimeLine = ln;
      this.time[r] = v;
    } else {
      if (!(v >= (this.lo[j] as number) && v <= (this.hi[j] as number))) this.implausible(ln, c, x, j);
      (this.cols[j] as Float64Array)[r] = v;
    }
  }

  /** Refuses a value outside its column's plausible range (see PLAUSIBLE_LIMITS), naming the range. */
  private implausible(ln: number, c: number, raw: number, j: number): never {
    const name = this.headerNames[c] ?? '';
    const base = (this.spec as LayoutSpec).bases[j] as string;
    const si = siColumnName(base);
    const unit = si.slice(si.lastIndexOf('_') + 1);
    const hi = this.hi[j] as number;
    const range =
      (this.lo[j] as number) > 0 ? `above 0 and at most ${hi} ${unit}` : `within +/-${sig(hi)} ${unit}`;
    this.fail(
      ln,
      c + 1,
      name,
      'implausible',
      `implausible value ${raw} for ${name}: no ride or motion base goes there (a track's ${base} must be ${range}); check the export and the column's unit`,
    );
  }

  /** A field that is not a plain short decimal: checked against NUMBER_RE (quotes and blanks allowed) and read by Number(). */
  private slowField(text: string, from: number, to: number, c: number): number {
    let raw = text.slice(from, to);
    if (!NUMBER_RE.test(raw)) {
      const t = unquote(raw);
      if (!NUMBER_RE.test(t)) {
        this.fail(
          this.lineNo,
          c + 1,
          this.headerNames[c] ?? null,
          'notNumber',
          `not a number: ${showField(raw.trim())}`,
        );
      }
      raw = t;
    }
    const v = Number(raw);
    if (!Number.isFinite(v * (this.scale[c] as number))) {
      this.fail(
        this.lineNo,
        c + 1,
        this.headerNames[c] ?? null,
        'notNumber',
        `not a finite number: ${showField(raw)}`,
      );
    }
    return v;
  }
}

/** Parses a whole track file held in one string (SI output); throws TrackFileError on bad input. */
export function parseTrackText(text: string, options: TrackReaderOptions): Track {
  const reader = new TrackReader(options);
  reader.push(text);
  return reader.end();
}
