// The motion-safety budget (motion-spec sections 5-7): actuator margin, the rider's acceleration-duration
// envelope and the comfort limits. Written once here and used by the form, the API, the worker and the CLI.
//
// The envelope numbers of a real venue come from its safety engineering and the code that applies
// there (for example ASTM F2291 or EN 13814 / ISO 17842-1); Legwork ships demo numbers only.
import { z } from 'zod';

export const ENVELOPE_AXES = ['x', 'y', 'z'] as const;
export type EnvelopeAxis = (typeof ENVELOPE_AXES)[number];

/** Specific force of a rider sitting still on a level platform, per axis, in g (z at rest = +1 g). */
export const REST_G: Readonly<Record<EnvelopeAxis, number>> = { x: 0, y: 0, z: 1 };

const finite = (what: string) =>
  z
    .number({ error: (iss) => (iss.input === undefined ? `${what} is missing` : `${what} must be a number`) })
    .refine(Number.isFinite, `${what} must be finite`);

/** One envelope row [duration_s, lower_g, upper_g]: outside [lower, upper] for less than duration_s at a time. */
export const envelopeRowSchema = z.tuple([
  finite('duration_s').refine((d) => d >= 0, 'duration_s must not be negative'),
  finite('lower_g'),
  finite('upper_g'),
]);
export type EnvelopeRow = z.infer<typeof envelopeRowSchema>;

// Row checks sit on each axis (not on the whole budget) so that they run, and are reported, even when
// another part of the file is wrong: zod runs a refinement only on a value that parsed.
const envelopeAxisSchema = (axis: EnvelopeAxis) =>
  z
    .array(envelopeRowSchema)
    .min(1, 'needs at least one row')
    .superRefine((rows, ctx) => {
      const rest = REST_G[axis];
      rows.forEach(([duration_s, lower_g, upper_g], i) => {
        if (!(lower_g < upper_g)) {
          ctx.addIssue({
            code: 'custom',
            path: [i],
            message: `lower_g (${lower_g}) must be less than upper_g (${upper_g})`,
          });
        } else if (!(lower_g < rest && rest < upper_g)) {
          // A rider sitting still must be inside every row, or every ride would fail at the load position.
          ctx.addIssue({
            code: 'custom',
            path: [i],
            message: `[${lower_g}, ${upper_g}] g must contain the at-rest value ${rest} g strictly`,
          });
        }
        const prev = i > 0 ? rows[i - 1] : undefined;
        if (prev && !(duration_s > prev[0])) {
          ctx.addIssue({
            code: 'custom',
            path: [i, 0],
            message: `rows must be sorted by strictly increasing duration_s (${duration_s} after ${prev[0]})`,
          });
        }
      });
    });

const positive = (what: string) => finite(what).refine((v) => v > 0, `${what} must be greater than 0`);

export const comfortLimitsSchema = z.strictObject({
  jerkMax_mps3: positive('jerkMax_mps3'),
  angularSpeedMax_radps: positive('angularSpeedMax_radps'),
  angularAccelMax_radps2: positive('angularAccelMax_radps2'),
  msdvZMax_mps1_5: positive('msdvZMax_mps1_5'),
  wrmsMax_mps2: positive('wrmsMax_mps2'),
  // Dimensionless; a condition number is at least 1, so a limit at or below 1 could never be met.
  conditioningMax: finite('conditioningMax')
    .refine((v) => v > 1, 'conditioningMax must be greater than 1')
    .optional(),
});

export const budgetSchema = z.strictObject({
  name: z.string().trim().min(1).max(200).optional(),
  version: z.union([z.string().trim().min(1).max(50), z.number().int().nonnegative()]).optional(),
  /** Where the numbers come from (the venue's engineering, the applicable code); free text. */
  source: z.string().max(2000).optional(),
  strokeMargin_m: finite('strokeMargin_m').refine((v) => v >= 0, 'strokeMargin_m must not be negative'),
  envelope: z.strictObject({
    x: envelopeAxisSchema('x'),
    y: envelopeAxisSchema('y'),
    z: envelopeAxisSchema('z'),
  }),
  comfort: comfortLimitsSchema,
});

export type Budget = z.infer<typeof budgetSchema>;
export type ComfortLimits = z.infer<typeof comfortLimitsSchema>;

/**
 * Demo budget: invented round numbers to try the product with, not taken from any standard or code.
 * A venue's safety reviewer replaces the envelope with the one that applies to the ride.
 */
export const DEMO_BUDGET: Budget = {
  name: 'DEMO budget - invented values, not from any standard',
  version: 1,
  source:
    'Demo numbers shipped with Legwork for trying the product. Replace them with the envelope and limits ' +
    "from the venue's safety engineering and the code that applies to the ride.",
  strokeMargin_m: 0.02,
  envelope: {
    x: [
      [0, -1.0, 1.0],
      [1.0, -0.5, 0.5],
    ],
    y: [
      [0, -0.8, 0.8],
      [1.0, -0.4, 0.4],
    ],
    z: [
      [0, 0.2, 1.8],
      [1.0, 0.5, 1.5],
    ],
  },
  comfort: {
    jerkMax_mps3: 25,
    angularSpeedMax_radps: 0.7,
    angularAccelMax_radps2: 4,
    msdvZMax_mps1_5: 12,
    wrmsMax_mps2: 0.8,
  },
};

/** One problem in an input file: where (file, line, column, JSON path) and why. */
export interface InputProblem {
  file: string;
  line?: number;
  column?: number;
  path: string;
  reason: string;
}

/** Error naming every problem found in a JSON input file. */
export class JsonInputError extends Error {
  override name = 'JsonInputError';
  constructor(readonly problems: InputProblem[]) {
    super(problems.map(formatProblem).join('\n'));
  }
}

/** "file:line:column: path: reason", leaving out the parts that are unknown. */
export function formatProblem(p: InputProblem): string {
  const where = [p.file, p.line, p.line !== undefined ? p.column : undefined].filter((v) => v !== undefined);
  return `${where.join(':')}: ${p.path ? `${p.path}: ` : ''}${p.reason}`;
}

/** JSON path as written in the file: envelope.x[1][2]. */
export function formatJsonPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out === '' ? String(key) : `.${String(key)}`;
  }
  return out;
}

type JsonScan = { ok: true; positions: Map<string, number> } | { ok: false; offset: number; reason: string };

/**
 * Strict JSON scan that records where every value starts (keyed by its path joined with "/"), or the
 * offset and reason of the first syntax error. JSON.parse does not always report a position.
 */
export function scanJson(text: string): JsonScan {
  const positions = new Map<string, number>();
  let i = 0;
  class Stop extends Error {
    constructor(
      readonly at: number,
      readonly why: string,
    ) {
      super(why);
    }
  }
  const ws = () => {
    while (i < text.length && ' \t\n\r'.includes(text[i] as string)) i++;
  };
  const fail = (why: string): never => {
    throw new Stop(i, i >= text.length ? `unexpected end of file, ${why}` : why);
  };
  const str = (): string => {
    const start = i;
    i++;
    let out = '';
    for (;;) {
      if (i >= text.length) throw new Stop(start, 'string is not closed');
      const c = text[i] as string;
      if (c === '"') {
        i++;
        return out;
      }
      if (c < ' ') fail('control character inside a string');
      if (c === '\\') {
        const e = text[i + 1];
        if (e === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) fail('bad \\u escape');
          out += String.fromCharCode(parseInt(text.slice(i + 2, i + 6), 16));
          i += 6;
          continue;
        }
        const map: Record<string, string> = {
          '"': '"',
          '\\': '\\',
          '/': '/',
          b: '\b',
          f: '\f',
          n: '\n',
          r: '\r',
          t: '\t',
        };
        const m = e === undefined ? undefined : map[e];
        if (m === undefined) fail('bad escape in a string');
        out += m;
        i += 2;
        continue;
      }
      out += c;
      i++;
    }
  };
  const value = (path: string): void => {
    ws();
    positions.set(path, i);
    const c = text[i];
    const child = (k: string | number) => (path === '' ? String(k) : `${path}/${k}`);
    if (c === '{') {
      i++;
      ws();
      if (text[i] === '}') {
        i++;
        return;
      }
      for (;;) {
        ws();
        if (text[i] !== '"') fail('expected a quoted property name');
        const key = str();
        ws();
        if (text[i] !== ':') fail(`expected ':' after "${key}"`);
        i++;
        value(child(key));
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        if (text[i] === '}') {
          i++;
          return;
        }
        fail("expected ',' or '}'");
      }
    }
    if (c === '[') {
      i++;
      ws();
      if (text[i] === ']') {
        i++;
        return;
      }
      for (let k = 0; ; k++) {
        value(child(k));
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        if (text[i] === ']') {
          i++;
          return;
        }
        fail("expected ',' or ']'");
      }
    }
    if (c === '"') {
      str();
      return;
    }
    const lit = /^(?:true|false|null|-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?)/.exec(
      text.slice(i, i + 400),
    );
    if (!lit) fail('expected a value (number, string, true, false, null, object or array)');
    i += (lit as RegExpExecArray)[0].length;
  };
  try {
    value('');
    ws();
    if (i < text.length) fail('unexpected text after the end of the JSON value');
    return { ok: true, positions };
  } catch (e) {
    if (e instanceof Stop) return { ok: false, offset: e.at, reason: e.why };
    throw e;
  }
}

/** 1-based line and column of a character offset. */
export function lineColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let k = 0; k < offset && k < text.length; k++) {
    if (text.charCodeAt(k) === 10) {
      line++;
      lineStart = k + 1;
    }
  }
  return { line, column: offset - lineStart + 1 };
}

/**
 * Parses JSON text against a zod schema; throws JsonInputError naming every bad field with its
 * file, line, column and path. Shared by every JSON input (budget, base, profile) that wants it.
 */
export function parseJsonWith<T>(schema: z.ZodType<T>, text: string, file: string): T {
  const scan = scanJson(text);
  if (!scan.ok) {
    throw new JsonInputError([
      { file, ...lineColumn(text, scan.offset), path: '', reason: `not valid JSON: ${scan.reason}` },
    ]);
  }
  const data: unknown = JSON.parse(text);
  const result = schema.safeParse(data);
  if (result.success) return result.data;
  const problems = result.error.issues.map((issue): InputProblem => {
    // Point at the deepest part of the path that exists in the file (a missing key points at its parent).
    let at: number | undefined;
    for (let k = issue.path.length; k >= 0 && at === undefined; k--) {
      at = scan.positions.get(issue.path.slice(0, k).map(String).join('/'));
    }
    return {
      file,
      ...(at !== undefined ? lineColumn(text, at) : {}),
      path: formatJsonPath(issue.path),
      reason: issue.message,
    };
  });
  throw new JsonInputError(problems);
}

/** Parses and validates budget JSON text; throws JsonInputError naming every bad field. */
export function parseBudgetText(text: string, file = 'budget.json'): Budget {
  return parseJsonWith(budgetSchema, text, file);
}

/**
 * Line and column of the value at a written path such as "leg.min_m" or "baseJoints_m[2]" in JSON
 * text (the nearest enclosing value when the key is missing); undefined for text that is not JSON.
 */
export function locateJsonPath(text: string, path: string): { line: number; column: number } | undefined {
  const scan = scanJson(text);
  if (!scan.ok) return undefined;
  const parts =
    path === '(root)' || path === ''
      ? []
      : path.split(/\.|\[(\d+)\]/).filter((p) => p !== undefined && p !== '');
  for (let k = parts.length; k >= 0; k--) {
    const at = scan.positions.get(parts.slice(0, k).join('/'));
    if (at !== undefined) return lineColumn(text, at);
  }
  return undefined;
}
