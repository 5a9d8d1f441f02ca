// Errors as text for the log and for stored failure reasons, without the values of a failed query:
// drizzle's DrizzleQueryError puts every bound parameter in its message ("params: ..."), and those
// can be password hashes, tokens or e-mail addresses. The SQL text, PostgreSQL's reason (without a value
// it quotes) and its SQLSTATE are kept.
import { DrizzleQueryError } from 'drizzle-orm';

function queryReason(e: DrizzleQueryError): string {
  const cause = e.cause as { message?: unknown; code?: unknown } | undefined;
  // PostgreSQL quotes the refused value in its input-syntax reasons ('... for type uuid: "<value>"');
  // constraint and column names it quotes elsewhere are kept.
  const reason =
    typeof cause?.message === 'string'
      ? cause.message.replace(/(for type [\w ]+): ".*"$/s, '$1: (value not shown)')
      : 'no reason given';
  const code = typeof cause?.code === 'string' ? ` (SQLSTATE ${cause.code})` : '';
  return `Failed query: ${e.query}: ${reason}${code}`;
}

/** One line saying what went wrong; a failed query gives its SQL and the database's reason only. */
export function errorText(e: unknown): string {
  if (e instanceof DrizzleQueryError) return queryReason(e);
  if (e instanceof Error) return e.message || e.name;
  return String(e);
}

/** For the server log: errorText and the stack's frames (never a failed query's parameters). */
export function errorForLog(e: unknown): string {
  if (!(e instanceof Error)) return String(e);
  const frames = (e.stack ?? '')
    .split('\n')
    .filter((l) => /^\s+at /.test(l))
    .join('\n');
  return `${e.name}: ${errorText(e)}${frames ? `\n${frames}` : ''}`;
}
