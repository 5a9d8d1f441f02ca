// Which studio's rows a database query may see: the second wall behind `inStudio()`.
//
// Row-level security on every studio-owned table (drizzle/0009_row_security.sql) shows a connection
// only the rows its settings allow. The pool (openDb) applies the scope of the code that checks a
// connection out, taken from an AsyncLocalStorage context:
// - `inStudioScope(id, fn)`: fn's queries see studio `id` only (every request under /studios/:id);
// - `acrossStudios(fn)`: fn's queries see every studio (sign-in, API-token and invitation lookups,
//   the worker, background sweeps): each use is a deliberate choice, named at its call;
// - outside both, the pool's default: 'none' for the server, so a query that forgets its scope
//   finds no studio-owned row at all.
import { AsyncLocalStorage } from 'node:async_hooks';

export type Scope = { studioId: string } | 'all' | 'none';

const current = new AsyncLocalStorage<Scope>();

// fn's result is awaited inside the context: a Drizzle query is a lazy thenable that runs only
// when awaited, and an await outside would run it in the caller's scope.

/** Runs fn (and everything it starts) with queries that see studio `studioId` only. */
export function inStudioScope<T>(studioId: string, fn: () => T | PromiseLike<T>): Promise<T> {
  return current.run({ studioId }, async () => await fn());
}

/** Runs fn (and everything it starts) with queries that see every studio. */
export function acrossStudios<T>(fn: () => T | PromiseLike<T>): Promise<T> {
  return current.run('all', async () => await fn());
}

/** The scope in force here, or `outside` when none was set. */
export function currentScope(outside: Scope): Scope {
  return current.getStore() ?? outside;
}

/** The two settings the row policies read, for a scope. */
export function scopeSettings(scope: Scope): { scope: string; studioId: string } {
  if (scope === 'all') return { scope: 'all', studioId: '' };
  if (scope === 'none') return { scope: 'none', studioId: '' };
  return { scope: 'studio', studioId: scope.studioId };
}
