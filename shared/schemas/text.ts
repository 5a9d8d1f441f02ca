// Text that every layer can store: PostgreSQL's text and jsonb refuse the NUL character (U+0000), and
// a lone UTF-16 surrogate (U+D800 to U+DFFF without its pair) is no character at all, so it cannot be
// written as UTF-8 (RFC 3629 section 3) and jsonb refuses its \u escape. `text()` is the one string
// schema of every text field a person or a program sends; `textProblem` is the same rule for the
// server's guard over whole request bodies and queries (keys and nested values alike).
import { z } from 'zod';

/** A high surrogate not followed by a low one, or a low one not preceded by a high one. */
const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

export const NUL_MESSAGE = 'must not contain the NUL character (U+0000)';
export const SURROGATE_MESSAGE =
  'must not contain a lone UTF-16 surrogate (U+D800 to U+DFFF): not valid Unicode text';

/** Why `s` cannot be stored as text, or null when it can. */
export function textProblem(s: string): string | null {
  if (s.includes('\u0000')) return NUL_MESSAGE;
  if (LONE_SURROGATE.test(s)) return SURROGATE_MESSAGE;
  return null;
}

/** A string schema refusing NUL and lone surrogates; chain `.trim()`, `.min()`, `.max()` as usual. */
export function text(): z.ZodString {
  return z
    .string()
    .refine((s) => !s.includes('\u0000'), { message: NUL_MESSAGE, abort: true })
    .refine((s) => !LONE_SURROGATE.test(s), { message: SURROGATE_MESSAGE, abort: true });
}

/** Where a value sits: its key in its parent, and the parent's place (null at the top). */
interface Place {
  key: string | number;
  parent: Place | null;
}

/** A JSON path as people read it: `base.seats_m[2]`. */
function pathText(place: Place | null): string {
  const keys: (string | number)[] = [];
  for (let p = place; p; p = p.parent) keys.push(p.key);
  let out = '';
  for (const k of keys.reverse()) out += typeof k === 'number' ? `[${k}]` : out === '' ? k : `.${k}`;
  return out || '(body)';
}

/**
 * The first string in a JSON value (a key or a value, at any depth) that cannot be stored, with its
 * path (`base.name`, or `base key "x\u0000"` for a key), or null. Walks with its own stack and parent
 * links, so any nesting JSON.parse accepts is walked in time linear in its size, without recursion.
 */
export function findTextProblem(value: unknown): { path: string; message: string } | null {
  const stack: { value: unknown; place: Place | null }[] = [{ value, place: null }];
  while (stack.length > 0) {
    const { value: v, place } = stack.pop() as { value: unknown; place: Place | null };
    if (typeof v === 'string') {
      const m = textProblem(v);
      if (m) return { path: pathText(place), message: m };
    } else if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) stack.push({ value: v[i], place: { key: i, parent: place } });
    } else if (v !== null && typeof v === 'object') {
      const entries = Object.entries(v);
      for (const [k] of entries) {
        const m = textProblem(k);
        if (m) return { path: `${pathText(place)} key ${JSON.stringify(k)}`, message: m };
      }
      for (let i = entries.length - 1; i >= 0; i--) {
        const [k, item] = entries[i] as [string, unknown];
        stack.push({ value: item, place: { key: k, parent: place } });
      }
    }
  }
  return null;
}
