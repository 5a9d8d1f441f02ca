// JSON input with positions: one strict scanner that finds the line and column of a syntax error and
// of every value, so that schema problems in any JSON input file (budget, motion base, cueing profile)
// point into the file. Pure: used by the browser editor, the API, the worker and the CLI alike.
import type { z } from 'zod';

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

/** Scan result: where every value starts (keyed by its path joined with "/"), or the first syntax error. */
export type JsonScan =
  { ok: true; positions: Map<string, number> } | { ok: false; offset: number; reason: string };

class ScanStop extends Error {
  constructor(
    readonly at: number,
    readonly why: string,
  ) {
    super(why);
  }
}

const ESCAPES: Readonly<Record<string, string>> = {
  '"': '"',
  '\\': '\\',
  '/': '/',
  b: '\b',
  f: '\f',
  n: '\n',
  r: '\r',
  t: '\t',
};

/**
 * Strict JSON scan (RFC 8259) that records where every value starts, or the offset and reason of the
 * first syntax error. JSON.parse on Node 20 reports a position for some errors only.
 */
export function scanJson(text: string): JsonScan {
  const positions = new Map<string, number>();
  let i = 0;
  const ws = () => {
    while (i < text.length && ' \t\n\r'.includes(text[i] as string)) i++;
  };
  const fail = (why: string): never => {
    throw new ScanStop(i, i >= text.length ? `unexpected end of file, ${why}` : why);
  };
  const str = (): string => {
    const start = i;
    i++;
    let out = '';
    for (;;) {
      if (i >= text.length) throw new ScanStop(start, 'string is not closed');
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
        const m = e === undefined ? undefined : ESCAPES[e];
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
    if (e instanceof ScanStop) return { ok: false, offset: e.at, reason: e.why };
    // The scanner recurses per nesting level; only a nesting deep enough to exhaust the stack gets here.
    if (e instanceof RangeError) return { ok: false, offset: 0, reason: 'nested too deeply' };
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
 * Offset of the value at a path, or of the deepest enclosing value that exists in the file (a missing
 * key has no position of its own); undefined when not even the root was scanned.
 */
export function nearestValueOffset(
  positions: ReadonlyMap<string, number>,
  path: readonly PropertyKey[],
): number | undefined {
  for (let k = path.length; k >= 0; k--) {
    const at = positions.get(path.slice(0, k).map(String).join('/'));
    if (at !== undefined) return at;
  }
  return undefined;
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
    const at = nearestValueOffset(scan.positions, issue.path);
    return {
      file,
      ...(at !== undefined ? lineColumn(text, at) : {}),
      path: formatJsonPath(issue.path),
      reason: issue.message,
    };
  });
  throw new JsonInputError(problems);
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
  const at = nearestValueOffset(scan.positions, parts);
  return at === undefined ? undefined : lineColumn(text, at);
}
