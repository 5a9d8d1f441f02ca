import type { z } from 'zod';
import { badRequest } from './http-error';

/** Parses `data` with `schema`, or throws a 400 listing each field's problem. */
export function parseBody<S extends z.ZodType>(schema: S, data: unknown, what = 'The request'): z.infer<S> {
  const r = schema.safeParse(data ?? {});
  if (!r.success) {
    const issues = r.error.issues.map((i) => ({ path: i.path.join('.') || '(body)', message: i.message }));
    throw badRequest(
      `${what} has ${issues.length === 1 ? 'a problem' : 'problems'}: ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`,
      issues,
    );
  }
  return r.data;
}

/** True for a UUID in its text form; route ids that are not one are simply not found. */
export const isUuid = (s: string): boolean =>
  /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(s);
