import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import fc from 'fast-check';
import {
  parseDecimal,
  parseTrackText,
  trackColumn,
  TrackFileError,
  TrackReader,
} from '../../../shared/motion/track-reader';
import type { TrackErrorCode } from '../../../shared/motion/track-reader';
import { CliInputError, readTrackFile } from '../../../server/cli/io';
import { makeCsv } from '../../factories/motion';

const POSE_HEADER = 'time_s,x_m,y_m,z_mm,roll_rad,pitch_deg,yaw_rad';

function failure(text: string, options: { maxRows?: number; maxBytes?: number } = {}): TrackFileError {
  try {
    parseTrackText(text, { file: 'pose.csv', ...options });
  } catch (e) {
    if (e instanceof TrackFileError) return e;
    throw e;
  }
  throw new Error('expected a TrackFileError');
}

describe('track reader errors name file, line, column and reason', () => {
  const cases: [TrackErrorCode, string, RegExp, { maxRows?: number; maxBytes?: number }?][] = [
    [
      'notNumber',
      `${POSE_HEADER}\n0,0,0,0,0,0,0\n0.1,0,0,abc,0,0,0\n`,
      /^pose\.csv line 3, column 4 \(z_mm\): not a number: "abc"$/,
    ],
    [
      'notNumber',
      `${POSE_HEADER}\n0,0,0,0,0,0,0\n0.1,0,0,,0,0,0\n`,
      /^pose\.csv line 3, column 4 \(z_mm\): not a number: ""$/,
    ],
    [
      'notNumber',
      `${POSE_HEADER}\n0,0,1e999,0,0,0,0\n`,
      /^pose\.csv line 2, column 3 \(y_m\): not a finite number/,
    ],
    [
      'timeNotIncreasing',
      `${POSE_HEADER}\n0,0,0,0,0,0,0\n0.5,0,0,0,0,0,0\n0.5,0,0,0,0,0,0\n`,
      /^pose\.csv line 4, column 1 \(time_s\): time not increasing: 0\.5 s after 0\.5 s on line 3$/,
    ],
    [
      'missingColumn',
      'time_s,x_m,y_m,z_m,roll_rad,pitch_rad\n0,0,0,0,0,0\n',
      /^pose\.csv line 1: missing column "yaw_rad" or "yaw_deg"/,
    ],
    ['missingColumn', 'x_m,y_m,yaw_rad\n0,0,0\n', /^pose\.csv line 1: missing column "time_s"$/],
    [
      'unknownUnit',
      'time_s,x_cm,y_m,yaw_rad\n0,0,0,0\n',
      /^pose\.csv line 1, column 2 \(x_cm\): unknown unit "cm" \(expected x_m or x_mm\)$/,
    ],
    [
      'unknownUnit',
      'time_s,x,y_m,yaw_rad\n0,0,0,0\n',
      /^pose\.csv line 1, column 2 \(x\): missing unit suffix/,
    ],
    [
      'unknownColumn',
      'time_s,x_m,y_m,yaw_rad,speed_mps\n0,0,0,0,0\n',
      /^pose\.csv line 1, column 5 \(speed_mps\): unknown column/,
    ],
    [
      'duplicateColumn',
      'time_s,x_m,y_m,x_mm,yaw_rad\n0,0,0,0,0\n',
      /^pose\.csv line 1, column 4 \(x_mm\): duplicate column: x already given in column 2/,
    ],
    [
      'mixedColumns',
      'time_s,x_m,y_m,yaw_rad,leg1_m\n0,0,0,0,0\n',
      /^pose\.csv line 1, column 5 \(leg1_m\): a legs column in a pose track$/,
    ],
    [
      'fieldCount',
      `${POSE_HEADER}\n0,0,0,0,0,0,0\n0.1,0,0,0,0,0\n`,
      /^pose\.csv line 3: wrong field count: expected 7 fields, got 6$/,
    ],
    [
      'fieldCount',
      `${POSE_HEADER}\n0,0,0,0,0,0,0,\n`,
      /^pose\.csv line 2: wrong field count: expected 7 fields, got 8$/,
    ],
    [
      'tooManyRows',
      `${POSE_HEADER}\n0,0,0,0,0,0,0\n1,0,0,0,0,0,0\n2,0,0,0,0,0,0\n`,
      /^pose\.csv line 4: too many rows: more than 2$/,
      { maxRows: 2 },
    ],
    [
      'tooLarge',
      `${POSE_HEADER}\n0,0,0,0,0,0,0\n`,
      /^pose\.csv line 1: file too large: more than 10 bytes$/,
      { maxBytes: 10 },
    ],
    [
      'implausible',
      `${POSE_HEADER}\n0,0,0,0,0,0,0\n0.1,0,0,12000,0,0,0\n`,
      /^pose\.csv line 3, column 4 \(z_mm\): implausible value 12000 for z_mm: .*within \+\/-10 m/,
    ],
    [
      'implausible',
      `${POSE_HEADER}\n0,0,0,0,0,400,0\n`,
      /^pose\.csv line 2, column 6 \(pitch_deg\): implausible value 400 for pitch_deg/,
    ],
    [
      'tooLong',
      `${POSE_HEADER}\n0,0,0,0,0,0,0\n14400.5,0,0,0,0,0,0\n`,
      /^pose\.csv line 3, column 1 \(time_s\): take too long: 14400\.5 s is more than 4 hours/,
    ],
    ['empty', '', /^pose\.csv line 1: empty file: no header row$/],
    ['empty', '\n  \n', /^pose\.csv line 1: empty file/],
    ['noRows', `${POSE_HEADER}\n`, /^pose\.csv line 1: no data rows after the header$/],
  ];
  // Source for each expectation: the error list of docs/motion-conventions.md section 3 and the message format of the reader.
  it.each(cases)('%s: %j', (code, text, message, options) => {
    const e = failure(text, options);
    expect(e.code).toBe(code);
    expect(e.message).toMatch(message);
    expect(e.file).toBe('pose.csv');
    expect(e.line).toBeGreaterThanOrEqual(1);
  });

  it('counts blank lines when naming a line', () => {
    const e = failure(`${POSE_HEADER}\n\n0,0,0,0,0,0,0\n\n0.1,0,x,0,0,0,0\n`);
    expect(e.line).toBe(5);
    expect(e.column).toBe(3);
    expect(e.columnName).toBe('y_m');
  });
});

describe('values no ride can have are refused at reading', () => {
  // Limits: common practice (ride specific force within a few g, spinning rides about one turn per
  // second, platform excursions of a metre or two); the reader's limits sit well beyond them.
  const vehicle = 'time_s,fx_mps2,fy_g,fz_mps2,wx_radps,wy_degps,wz_radps';
  it.each([
    ['1e300 m/s^2 of surge force', `${vehicle}\n0,1e300,0,9.8,0,0,0\n`, 2, 'fx_mps2'],
    ['25 g of sway force', `${vehicle}\n0,0,0,9.8,0,0,0\n0.01,0,25,9.8,0,0,0\n`, 3, 'fy_g'],
    ['a roll rate of 30 rad/s', `${vehicle}\n0,0,0,9.8,-30,0,0\n`, 2, 'wx_radps'],
    ['a leg of zero length', 'time_s,leg1_m,leg2_m,leg3_m\n0,1,0,1\n', 2, 'leg2_m'],
    ['a leg of 60 m', 'time_s,leg1_mm,leg2_m,leg3_m\n0,60000,1,1\n', 2, 'leg1_mm'],
  ])('%s', (_what, text, line, column) => {
    const e = failure(text);
    expect(e.code).toBe('implausible');
    expect([e.line, e.columnName]).toEqual([line, column]);
    expect(e.message).toMatch(/check the export and the column's unit$/);
  });

  it('accepts the most a ride can be: 19 g, 19 rad/s, 9 m, 350 deg, a two-hour take', () => {
    const t = parseTrackText(`${vehicle}\n0,186,-19,9.8,19,1000,-19\n7200,0,0,9.8,0,0,0\n`, {
      file: 'v.csv',
    });
    expect(t.length).toBe(2);
    const p = parseTrackText(`${POSE_HEADER}\n0,9,-9,9000,6.2,350,-6.2\n`, { file: 'p.csv' });
    expect(trackColumn(p, 'pitch_rad')[0]).toBeCloseTo((350 * Math.PI) / 180, 12);
  });
});

describe('track reader content', () => {
  it('converts mm, deg, g and deg/s to SI', () => {
    // Source: 1 mm = 1e-3 m and 180 deg = pi rad (SI definitions); g0 = 9.80665 m/s^2 (3rd CGPM, 1901).
    const pose = parseTrackText(
      'time_s,x_mm,y_mm,z_mm,roll_deg,pitch_deg,yaw_deg\n0,1234.5,-20,0,90,-45,180\n',
      { file: 'p.csv' },
    );
    expect(pose.kind).toBe('pose');
    expect(pose.layout).toBe('hexapod');
    expect(trackColumn(pose, 'x_m')[0]).toBeCloseTo(1.2345, 15);
    expect(trackColumn(pose, 'y_m')[0]).toBeCloseTo(-0.02, 15);
    expect(trackColumn(pose, 'roll_rad')[0]).toBeCloseTo(Math.PI / 2, 15);
    expect(trackColumn(pose, 'pitch_rad')[0]).toBeCloseTo(-Math.PI / 4, 15);
    expect(trackColumn(pose, 'yaw_rad')[0]).toBeCloseTo(Math.PI, 15);
    const veh = parseTrackText(
      'time_s,fx_g,fy_mps2,fz_g,wx_degps,wy_radps,wz_degps\n0,0.5,1,1,90,0.1,-180\n',
      { file: 'v.csv' },
    );
    expect(veh.kind).toBe('vehicle');
    expect(trackColumn(veh, 'fx_mps2')[0]).toBeCloseTo(4.903325, 14);
    expect(trackColumn(veh, 'fz_mps2')[0]).toBeCloseTo(9.80665, 14);
    expect(trackColumn(veh, 'wx_radps')[0]).toBeCloseTo(Math.PI / 2, 15);
    expect(trackColumn(veh, 'wz_radps')[0]).toBeCloseTo(-Math.PI, 15);
  });

  it('detects planar and hexapod layouts of pose and legs tracks, in any column order', () => {
    const planar = parseTrackText('yaw_deg,time_s,y_mm,x_m\n10,0,5,1\n20,0.5,6,2\n', { file: 'p.csv' });
    expect([planar.kind, planar.layout]).toEqual(['pose', 'planar3']);
    expect(planar.names).toEqual(['x_m', 'y_m', 'yaw_rad']);
    expect(Array.from(planar.time_s)).toEqual([0, 0.5]);
    expect(Array.from(trackColumn(planar, 'x_m'))).toEqual([1, 2]);
    const legs = parseTrackText('time_s,leg1_mm,leg2_mm,leg3_mm,leg4_mm,leg5_mm,leg6_mm\n0,1,2,3,4,5,6\n', {
      file: 'l.csv',
    });
    expect([legs.kind, legs.layout]).toEqual(['legs', 'hexapod']);
    const legs3 = parseTrackText('time_s,leg1_m,leg2_m,leg3_m\r\n0,1,2,3\r\n0.01,1,2,3', { file: 'l.csv' });
    expect([legs3.kind, legs3.layout, legs3.length]).toEqual(['legs', 'planar3', 2]);
  });

  it('accepts uneven spacing, a byte-order mark, quoted header names and surrounding blanks', () => {
    const t = parseTrackText('\uFEFF"time_s", "x_m" ,y_m,yaw_rad\n0, 1 ,2,3\n0.1,1,2,3\n0.35,1,2,3\n', {
      file: 'p.csv',
    });
    expect(Array.from(t.time_s)).toEqual([0, 0.1, 0.35]);
    expect(Array.from(t.lines ?? [])).toEqual([2, 3, 4]);
  });

  it('gives the same track however the text is split into chunks', () => {
    const rows = Array.from({ length: 3000 }, (_, i) => [i / 100, Math.sin(i) * 100, i * 1e-3, -(i % 360)]);
    const text = makeCsv(['time_s', 'x_mm', 'y_m', 'yaw_deg'], rows);
    const whole = parseTrackText(text, { file: 'p.csv' });
    const r = new TrackReader({ file: 'p.csv' });
    for (let i = 0; i < text.length; i += 7) r.push(text.slice(i, i + 7));
    const pieces = r.end();
    expect(pieces.length).toBe(3000);
    expect(Array.from(pieces.columns[0]!)).toEqual(Array.from(whole.columns[0]!));
    expect(Array.from(pieces.columns[2]!)).toEqual(Array.from(whole.columns[2]!));
  });

  it('reads .csv.gz through the streaming file reader, and rejects a bad gzip clearly', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'legwork-reader-'));
    const text = makeCsv(
      ['time_s', 'leg1_mm', 'leg2_mm', 'leg3_mm'],
      Array.from({ length: 5000 }, (_, i) => [i / 1000, 1800, 1801, 1802.5]),
    );
    writeFileSync(join(dir, 'legs.csv.gz'), gzipSync(text));
    const track = await readTrackFile(join(dir, 'legs.csv.gz'));
    expect(track.length).toBe(5000);
    expect(trackColumn(track, 'leg3_m')[4999]).toBeCloseTo(1.8025, 15);
    writeFileSync(join(dir, 'bad.csv.gz'), 'not gzip at all');
    await expect(readTrackFile(join(dir, 'bad.csv.gz'))).rejects.toThrow(CliInputError);
    await expect(readTrackFile(join(dir, 'bad.csv.gz'))).rejects.toThrow(
      /bad\.csv\.gz: the name ends in \.gz but the file is not gzip-compressed/,
    );
    await expect(readTrackFile(join(dir, 'missing.csv'))).rejects.toThrow(/missing\.csv: no such file/);
  });
});

describe('reading numbers from their characters', () => {
  // Oracle: ECMAScript's Number() (StringToNumber, correctly rounded by the language's definition).
  const agrees = (text: string) => {
    const v = parseDecimal(text, 0, text.length);
    if (Number.isNaN(v)) return; // left to the slow path, which is Number() itself
    expect(Object.is(v, Number(text))).toBe(true);
  };

  it('equals Number() on formatted doubles and on random digit strings, or leaves them to Number()', () => {
    fc.assert(
      fc.property(
        fc.double({ noNaN: true, noDefaultInfinity: true }),
        fc.integer({ min: 0, max: 20 }),
        (x, d) => {
          agrees(String(x));
          agrees(x.toExponential(Math.min(d, 20)));
          if (Math.abs(x) < 1e21) agrees(x.toFixed(d));
          agrees(x.toPrecision(Math.max(1, d)));
        },
      ),
      { numRuns: 3000 },
    );
    const digits = fc.string({ unit: fc.constantFrom(...'0123456789'.split('')), maxLength: 19 });
    fc.assert(
      fc.property(
        fc.constantFrom('', '-', '+'),
        digits,
        fc.boolean(),
        digits,
        fc.option(
          fc.tuple(
            fc.constantFrom('e', 'E'),
            fc.constantFrom('', '-', '+'),
            fc.integer({ min: 0, max: 400 }),
          ),
        ),
        (sign, a, point, b, exp) => {
          const text = `${sign}${a}${point ? '.' : ''}${b}${exp ? `${exp[0]}${exp[1]}${exp[2]}` : ''}`;
          agrees(text);
          if (!Number.isNaN(parseDecimal(text, 0, text.length))) {
            // Only text NUMBER_RE accepts takes the fast path: docs/motion-conventions.md section 3 syntax.
            expect(text).toMatch(/^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/);
          }
        },
      ),
      { numRuns: 5000 },
    );
  });

  it('takes the fast path for the fixed-point numbers track files hold, and not for odd text', () => {
    for (const t of ['0', '-0', '12.5', '0.000123', '-1.234567890123', '9.80665', '1e-3', '.5', '5.', '+2']) {
      expect(Number.isNaN(parseDecimal(t, 0, t.length))).toBe(false);
      agrees(t);
    }
    expect(Object.is(parseDecimal('-0', 0, 2), -0)).toBe(true);
    for (const t of [
      '',
      '-',
      '.',
      'e5',
      '1e',
      '1e+',
      ' 1',
      '1 ',
      '"1"',
      '0x1f',
      'Infinity',
      '1.2.3',
      '1234567890123456',
    ])
      expect(Number.isNaN(parseDecimal(t, 0, t.length))).toBe(true);
  });

  it('reads a track over many storage blocks exactly as Number() reads each field', () => {
    const rows = Array.from({ length: 40_000 }, (_, i) => [
      i / 1000,
      Math.sin(i) * 1234.5678,
      (i % 97) * 1e-7,
      -(i % 1000) * 0.3333333333333333,
    ]);
    const text = makeCsv(['time_s', 'x_mm', 'y_m', 'yaw_deg'], rows);
    const t = parseTrackText(text, { file: 'p.csv' });
    expect(t.length).toBe(rows.length);
    const lines = text.trim().split('\n').slice(1);
    // Source: 1 mm = 1e-3 m, 180 deg = pi rad (SI); the reader multiplies by the same factors.
    const factors = [1, 1e-3, 1, Math.PI / 180];
    const cols = [t.time_s, trackColumn(t, 'x_m'), trackColumn(t, 'y_m'), trackColumn(t, 'yaw_rad')];
    const mismatches: string[] = [];
    for (let r = 0; r < lines.length; r += 1) {
      const f = (lines[r] as string).split(',');
      for (let c = 0; c < 4; c++) {
        if (!Object.is(cols[c]![r], Number(f[c]) * factors[c]!))
          mismatches.push(`row ${r} field ${c}: ${f[c]}`);
      }
    }
    expect(mismatches).toEqual([]);
    expect(t.lines?.[39_999]).toBe(40_001);
    const e = failure(text, { maxRows: 20_000 });
    expect(e.code).toBe('tooManyRows');
    expect(e.line).toBe(20_002);
  });
});

describe('track reader under random and truncated input', () => {
  const valid = makeCsv(
    ['time_s', 'x_mm', 'y_mm', 'z_mm', 'roll_deg', 'pitch_deg', 'yaw_deg'],
    Array.from({ length: 20 }, (_, i) => [i * 0.01, i * 1.5, -i, 3.25e-1, 0.5, -0.25, 1e-3]),
  );

  function parsesOrThrowsTrackFileError(text: string, chunk: number): void {
    const r = new TrackReader({ file: 'fuzz.csv', maxRows: 1000, maxBytes: 100_000 });
    try {
      for (let i = 0; i < text.length; i += chunk) r.push(text.slice(i, i + chunk));
      const t = r.end();
      for (const c of [t.time_s, ...t.columns]) {
        expect(c.length).toBe(t.length);
        for (const v of c) expect(Number.isFinite(v)).toBe(true);
      }
      for (let i = 1; i < t.length; i++) expect(t.time_s[i]!).toBeGreaterThan(t.time_s[i - 1]!);
    } catch (e) {
      if (!(e instanceof TrackFileError)) throw e;
      expect(e.message.startsWith('fuzz.csv line ')).toBe(true);
    }
  }

  it('either parses with finite values or throws TrackFileError for random CSV-like text', () => {
    const alphabet = fc.constantFrom(...'0123456789.,-+eE\n\r _xyzmsdgtielrpa"'.split(''));
    fc.assert(
      fc.property(
        fc.string({ unit: alphabet, maxLength: 300 }),
        fc.integer({ min: 1, max: 50 }),
        (body, chunk) => {
          parsesOrThrowsTrackFileError(`time_s,x_m,y_m,yaw_rad\n${body}`, chunk);
          parsesOrThrowsTrackFileError(body, chunk);
        },
      ),
      { numRuns: 500 },
    );
  });

  it('either parses or throws TrackFileError for truncated and corrupted valid files', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: valid.length }),
        fc.integer({ min: 0, max: valid.length - 1 }),
        fc.string({ maxLength: 3 }),
        fc.integer({ min: 1, max: 64 }),
        (cut, at, junk, chunk) => {
          parsesOrThrowsTrackFileError(valid.slice(0, cut), chunk);
          parsesOrThrowsTrackFileError(valid.slice(0, at) + junk + valid.slice(at + 1), chunk);
        },
      ),
      { numRuns: 500 },
    );
  });
});
