// The text rule (shared/schemas/text.ts) against outside definitions: a string holds a lone surrogate
// exactly when ECMAScript's String.prototype.isWellFormed (ES2024) says it is not well formed, and
// exactly then does it fail to survive a UTF-8 round trip (WHATWG Encoding's UTF-8 encoder writes
// U+FFFD for it); NUL is U+0000, which PostgreSQL's text and jsonb refuse (PostgreSQL manual, "Character
// Types" and "JSON Types"). Every text field of the request schemas uses the rule.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  NUL_MESSAGE,
  SURROGATE_MESSAGE,
  findTextProblem,
  text,
  textProblem,
} from '../../../shared/schemas/text';
import {
  acceptInvitationBody,
  loginBody,
  resetConfirmBody,
  resetRequestBody,
} from '../../../shared/schemas/api';
import { auditQuery } from '../../../shared/schemas/audit';
import {
  createProfileBody,
  createTokenBody,
  createTrackBody,
  createVenueBody,
  newVersionBody,
  tracksQuery,
  uploadQuery,
} from '../../../shared/schemas/pipeline';
import { acknowledgeBody, problemBody, withdrawBody } from '../../../shared/schemas/release';
import { reviewBody } from '../../../shared/schemas/review';

const wellFormed = (s: string) => (s as string & { isWellFormed(): boolean }).isWellFormed();
const utf8RoundTrip = (s: string) => new TextDecoder().decode(new TextEncoder().encode(s)) === s;

/** Strings of single UTF-16 code units, surrogate halves often (fast-check's own units keep pairs whole). */
const codeUnits = fc.string({
  unit: fc.oneof(
    fc.integer({ min: 0xd800, max: 0xdfff }).map((c) => String.fromCharCode(c)),
    fc.integer({ min: 1, max: 0xffff }).map((c) => String.fromCharCode(c)),
    fc.constantFrom('a', '\ud83d\ude00'),
  ),
  maxLength: 12,
});

describe('text rule', () => {
  it('the generated strings hold both kinds: well formed and not', () => {
    const xs = fc.sample(codeUnits, 500);
    expect(xs.filter(wellFormed).length).toBeGreaterThan(50);
    expect(xs.filter((x) => !wellFormed(x)).length).toBeGreaterThan(50);
  });

  it('finds a lone surrogate exactly when isWellFormed is false and UTF-8 cannot carry the string', () => {
    fc.assert(
      fc.property(codeUnits, (raw) => {
        const s = raw.split('\u0000').join('a');
        const lone = textProblem(s) === SURROGATE_MESSAGE;
        expect(lone).toBe(!wellFormed(s));
        expect(lone).toBe(!utf8RoundTrip(s));
        expect(text().safeParse(s).success).toBe(!lone);
      }),
      { numRuns: 2000 },
    );
  });

  it('a pair is a character, either half alone is not; NUL is refused anywhere in the string', () => {
    expect(textProblem('\ud83d\ude00')).toBeNull(); // U+1F600 as its pair
    expect(textProblem('a\ud83d')).toBe(SURROGATE_MESSAGE);
    expect(textProblem('\ude00a')).toBe(SURROGATE_MESSAGE);
    expect(textProblem('\ude00\ud83d')).toBe(SURROGATE_MESSAGE); // reversed halves are no pair
    expect(textProblem('ok\u0000')).toBe(NUL_MESSAGE);
    expect(textProblem('tab\tand line\nfeed')).toBeNull();
  });

  it('finds the first problem in nested JSON with its path, in keys too, and walks deep nesting without recursion', () => {
    expect(findTextProblem({ base: { seats_m: [[0, 0, 1]], park: 'x\u0000' } })).toEqual({
      path: 'base.park',
      message: NUL_MESSAGE,
    });
    expect(findTextProblem({ a: [1, { ['k\ud800']: 1 }] })?.path).toBe('a[1] key "k\\ud800"');
    expect(findTextProblem({ a: ['fine', 2, null, true] })).toBeNull();
    let deep: unknown = 'x\u0000';
    for (let i = 0; i < 200_000; i++) deep = [deep];
    expect(findTextProblem(deep)?.message).toBe(NUL_MESSAGE);
  });

  it('every text field of the request schemas refuses NUL and lone surrogates', () => {
    const valid: [
      string,
      { safeParse(v: unknown): { success: boolean } },
      Record<string, unknown>,
      string[],
    ][] = [
      ['loginBody', loginBody, { email: 'a@example.test', password: 'pw' }, ['password']],
      ['resetRequestBody', resetRequestBody, { email: 'a@example.test' }, []],
      [
        'resetConfirmBody',
        resetConfirmBody,
        { token: 'x'.repeat(20), password: 'y'.repeat(12) },
        ['token', 'password'],
      ],
      [
        'acceptInvitationBody',
        acceptInvitationBody,
        { name: 'Noor', password: 'y'.repeat(12) },
        ['name', 'password'],
      ],
      ['createTrackBody', createTrackBody, { title: 'T', film: 'F' }, ['title', 'film']],
      ['tracksQuery', tracksQuery, { q: 'x' }, ['q']],
      ['uploadQuery', uploadQuery, { fileName: 'take.csv' }, ['fileName']],
      [
        'createProfileBody',
        createProfileBody,
        { kind: 'cueing', name: 'N', params: {}, note: 'n' },
        ['name', 'note'],
      ],
      ['newVersionBody', newVersionBody, { params: {}, note: 'n' }, ['note']],
      ['createTokenBody', createTokenBody, { name: 'farm' }, ['name']],
      [
        'createVenueBody',
        createVenueBody,
        { name: 'N', site: 'S', timeZone: 'UTC', base: {} },
        ['name', 'site', 'timeZone'],
      ],
      ['reviewBody', reviewBody, { decision: 'hold', reason: 'r' }, ['reason']],
      ['auditQuery', auditQuery, { person: 'p' }, ['person']],
      ['withdrawBody', withdrawBody, { reason: 'r' }, ['reason']],
      ['problemBody', problemBody, { text: 't' }, ['text']],
      ['acknowledgeBody', acknowledgeBody, { note: 'n' }, ['note']],
    ];
    for (const [name, schema, good, fields] of valid) {
      expect(schema.safeParse(good).success, name).toBe(true);
      for (const field of fields) {
        const v = String(good[field]);
        // Inside the value, so that a file-name pattern or a trim does not decide it instead.
        const at = Math.max(1, v.length - 4);
        for (const bad of ['\u0000', '\ud800']) {
          const value = `${v.slice(0, at)}${bad}${v.slice(at)}`;
          expect(
            schema.safeParse({ ...good, [field]: value }).success,
            `${name}.${field} ${JSON.stringify(bad)}`,
          ).toBe(false);
        }
      }
      // The e-mail fields refuse them too (their pattern would, but the rule comes first).
      if ('email' in good) {
        expect(schema.safeParse({ ...good, email: 'a\u0000@example.test' }).success, name).toBe(false);
      }
    }
  });
});
