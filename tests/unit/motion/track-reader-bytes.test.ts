// TrackReader.pushBytes, the byte path the stream reader uses, against two outside references:
// ECMAScript's Number() (StringToNumber, correctly rounded by the language's definition) for each
// field's value, and the text path (push() of the same file decoded by Node's TextDecoder) for the
// whole track and every error, whatever the bytes are split into.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseDecimalBytes, TrackFileError, TrackReader } from '../../../shared/motion/track-reader';
import type { Track } from '../../../shared/motion/track-reader';

const enc = new TextEncoder();
const VEHICLE = 'time_s,fx_mps2,fy_mps2,fz_g,wx_radps,wy_degps,wz_radps';

type Outcome = { track: Track } | { error: string; line: number; code: string };

function outcome(read: (r: TrackReader) => void): Outcome {
  const r = new TrackReader({ file: 'ride.csv', maxLineChars: 200 });
  try {
    read(r);
    return { track: r.end() };
  } catch (e) {
    if (e instanceof TrackFileError) return { error: e.message, line: e.line, code: e.code };
    throw e;
  }
}

/** The text path on the whole file (decoded as the standard UTF-8 decoder decodes it). */
const viaText = (bytes: Uint8Array) => outcome((r) => r.push(new TextDecoder().decode(bytes)));
/** The byte path, the bytes cut at the given offsets. */
const viaBytes = (bytes: Uint8Array, cuts: number[] = []) =>
  outcome((r) => {
    let at = 0;
    for (const c of [...cuts].sort((a, b) => a - b)) {
      r.pushBytes(bytes.subarray(at, Math.max(at, c)));
      at = Math.max(at, c);
    }
    r.pushBytes(bytes.subarray(at));
  });

function expectSame(a: Outcome, b: Outcome): void {
  if ('track' in a && 'track' in b) {
    expect(b.track.length).toBe(a.track.length);
    expect(b.track.names).toEqual(a.track.names);
    // Bit for bit: Object.is tells -0 from 0.
    const pairs = [
      [a.track.time_s, b.track.time_s],
      ...a.track.columns.map((c, j) => [c, b.track.columns[j]]),
    ];
    let differ = 0;
    for (const [x, y] of pairs as [Float64Array, Float64Array][])
      for (let i = 0; i < x.length; i++) if (!Object.is(x[i], y[i])) differ++;
    expect(differ).toBe(0);
    expect(Array.from(b.track.lines ?? [])).toEqual(Array.from(a.track.lines ?? []));
  } else expect(b).toEqual(a);
}

describe('reading numbers from bytes', () => {
  const agrees = (text: string) => {
    const v = parseDecimalBytes(enc.encode(text), 0, text.length);
    if (Number.isNaN(v)) return; // left to the text path, which ends in Number()
    expect(Object.is(v, Number(text))).toBe(true);
  };

  it('equals Number() on formatted doubles, signs, exponents and random digit strings', () => {
    fc.assert(
      fc.property(
        fc.double({ noNaN: true, noDefaultInfinity: true }),
        fc.integer({ min: 0, max: 20 }),
        (x, d) => {
          agrees(String(x));
          agrees(x.toExponential(d));
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
        },
      ),
      { numRuns: 5000 },
    );
  });

  it('reads the usual forms fast and leaves odd ones to the text path', () => {
    for (const t of ['0', '-0', '+1.5', '1e3', '1E-3', '-2.5e+2', '.5', '5.', '0.000001', '123456.789012345'])
      expect(parseDecimalBytes(enc.encode(t), 0, t.length)).toBe(Number(t));
    expect(Object.is(parseDecimalBytes(enc.encode('-0.0'), 0, 4), -0)).toBe(true);
    for (const t of [
      '',
      '-',
      '.',
      'e5',
      '1e',
      '1e+',
      '1,5',
      ' 1',
      '1 ',
      '0x1f',
      'Infinity',
      '1.2.3',
      '1234567890123456',
    ])
      expect(Number.isNaN(parseDecimalBytes(enc.encode(t), 0, t.length))).toBe(true);
  });
});

describe('pushBytes gives what push gives', () => {
  const cases: [string, string][] = [
    ['plain rows', `${VEHICLE}\n0,0.1,-0.2,1,0,0,0\n0.001,0.2,-0.3,1.01,0.001,0.05,-0.002\n`],
    ['CRLF line ends', `${VEHICLE}\r\n0,0.1,-0.2,1,0,0,0\r\n0.001,0.2,-0.3,1.01,0.001,0.05,-0.002\r\n`],
    ['exponents and signs', `${VEHICLE}\n0,1e-1,-2E-1,+1,-0,+0.0,5e-3\n1e-3,+.2,-3.e-1,1.0E0,1e-20,-0e5,0\n`],
    ['blank trailing lines', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,0,1,0,0,0\n\n  \n\t\r\n\n`],
    ['no final newline', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,0,1,0,0,0`],
    ['a byte-order mark', `\uFEFF${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,0,1,0,0,0\n`],
    ['quoted fields and blanks', `${VEHICLE}\n0, 0 ,"0",1,0,0,0\n0.001,0,0,1,0,0,0\n`],
    ['long digit strings', `${VEHICLE}\n0,0.12345678901234567890,0,1,0,0,0\n0.001,0,0,1,0,0,0\n`],
    ['a bad number', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,abc,1,0,0,0\n`],
    ['an empty field', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,,1,0,0,0\n`],
    ['a number with junk after it', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,1.5x,1,0,0,0\n`],
    ['too few fields', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,0,1,0,0\n`],
    ['too many fields', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,0,1,0,0,0,0\n`],
    ['time going back', `${VEHICLE}\n0,0,0,1,0,0,0\n0.002,0,0,1,0,0,0\n0.001,0,0,1,0,0,0\n`],
    ['an implausible value', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,0,25,0,0,0\n`],
    ['an infinite number', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,1e999,1,0,0,0\n`],
    ['a bad number after blank lines', `${VEHICLE}\n\n0,0,0,1,0,0,0\n\n\n0.001,0,-,1,0,0,0\n`],
    ['non-ASCII in a field', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,0,1,0,0,0\u00b5\n`],
    ['non-ASCII in the header', `time_s,fx_m\u00b5ps2\n0,0\n`],
    ['a 4-byte character', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,\u{1F600},0,1,0,0,0\n`],
    ['a byte-order mark inside', `${VEHICLE}\n0,0,0,1,0,0,0\n\uFEFF0.001,0,0,1,0,0,0\n`],
    ['a line too long', `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,0,1,0,0,${'0'.repeat(300)}\n`],
    [
      'a long non-ASCII line within the limit',
      `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,0,1,0,0,0${'\u00b5'.repeat(150)}\n`,
    ],
    [
      'a long non-ASCII line over the limit',
      `${VEHICLE}\n0,0,0,1,0,0,0\n0.001,0,0,1,0,0,0${'\u00b5'.repeat(190)}\n`,
    ],
    ['only a header', `${VEHICLE}\n`],
    ['empty', ''],
  ];

  it.each(cases)('%s', (_, text) => {
    const bytes = enc.encode(text);
    const want = viaText(bytes);
    expectSame(want, viaBytes(bytes));
    // Split at every offset (inside numbers, line ends, CR LF pairs and multi-byte characters).
    for (let c = 0; c <= bytes.length; c++) expectSame(want, viaBytes(bytes, [c]));
  });

  it('names the line of a bad number (file line, blank lines and header counted)', () => {
    const got = viaBytes(
      enc.encode(`${VEHICLE}\n0,0,0,1,0,0,0\n\n0.001,0,0,1,0,0,0\n0.002,0,0,1.2.3,0,0,0\n`),
    );
    expect(got).toMatchObject({ line: 5, code: 'notNumber' });
    expect((got as { error: string }).error).toBe('ride.csv line 5, column 4 (fz_g): not a number: "1.2.3"');
  });

  it('gives the same track and errors for random CSV-like bytes cut anywhere', () => {
    const alphabet = fc.constantFrom(...'0123456789.,-+eE\n\r _\u00b5"'.split(''));
    fc.assert(
      fc.property(
        fc.string({ unit: alphabet, maxLength: 300 }),
        fc.array(fc.nat(), { maxLength: 4 }),
        (body, cuts) => {
          const bytes = enc.encode(`${VEHICLE}\n${body}`);
          expectSame(
            viaText(bytes),
            viaBytes(
              bytes,
              cuts.map((c) => c % (bytes.length + 1)),
            ),
          );
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('gives the same values as Number() on each field of a generated track', () => {
    let text = `${VEHICLE}\n`;
    const fields: string[][] = [];
    for (let i = 0; i < 40_000; i++) {
      const row = [
        (i / 1000).toFixed(3),
        Math.sin(i).toFixed(5),
        (-Math.cos(i) * 3).toExponential(4),
        (1 + 0.1 * Math.sin(i / 7)).toPrecision(7),
        String(Math.sin(i / 3) / 50),
        (Math.cos(i / 5) * 10).toFixed(6),
        (-1e-7 * i).toFixed(9),
      ];
      fields.push(row);
      text += `${row.join(',')}${i % 2 ? '\r\n' : '\n'}`;
    }
    const bytes = enc.encode(text);
    const got = viaBytes(bytes, [1 << 16, 123_457, 500_000]);
    if (!('track' in got)) throw new Error(got.error);
    const factor = [1, 1, 1, 9.80665, 1, Math.PI / 180, 1];
    for (let i = 0; i < fields.length; i += 97) {
      const f = fields[i] as string[];
      expect(got.track.time_s[i]).toBe(Number(f[0]));
      for (let j = 1; j < 7; j++)
        expect(
          Object.is((got.track.columns[j - 1] as Float64Array)[i], Number(f[j]) * (factor[j] as number)),
        ).toBe(true);
    }
    expectSame(viaText(bytes), got);
  });

  it('refuses mixing text and bytes in one file', () => {
    const r = new TrackReader({ file: 'x.csv' });
    r.pushBytes(enc.encode(`${VEHICLE}\n`));
    expect(() => r.push('0,0,0,1,0,0,0\n')).toThrow(/mixed/);
  });
});
