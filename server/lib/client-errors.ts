// What the API refuses before any handler runs, and how the errors of Express's own parts (the router's
// parameter decoding, the JSON body parser) become clear 4xx answers instead of 500s.
//
// - JSON bodies are UTF-8 (RFC 8259 section 8.1: JSON exchanged between systems MUST be UTF-8): any
//   other declared charset is 415, and bytes that are not valid UTF-8 are 400, never read with
//   replacement characters.
// - A Content-Encoding the parser does not know is 415; a body that does not decode as its declared
//   Content-Encoding (gzip that is not gzip) is 400.
// - Text that cannot be stored (NUL, lone surrogates: shared/schemas/text.ts) anywhere in a JSON body
//   or the query, in a key or a value, is 400 naming where, so nothing reaches the database half-made.
import { isUtf8 } from 'node:buffer';
import type { IncomingMessage } from 'node:http';
import type { RequestHandler } from 'express';
import express from 'express';
import { findTextProblem } from '../../shared/schemas/text';
import { HttpError } from './http-error';

/** An error that body-parser keeps the status of (it reads `status` from errors thrown in `verify`). */
function statusError(status: number, message: string, type: string): Error {
  return Object.assign(new Error(message), { status, statusCode: status, expose: true, type });
}

/** The JSON body parser of the API: UTF-8 only, and only valid UTF-8. */
export function jsonBody(limit = '1mb'): RequestHandler {
  return express.json({
    limit,
    verify: (_req: IncomingMessage, _res: unknown, buf: Buffer, encoding: string) => {
      const charset = encoding.toLowerCase();
      if (charset !== 'utf-8' && charset !== 'utf8') {
        throw statusError(
          415,
          `The request body's charset "${encoding}" is not supported: send JSON as UTF-8.`,
          'charset.unsupported',
        );
      }
      if (!isUtf8(buf)) {
        throw statusError(
          400,
          'The request body is declared as UTF-8 but is not valid UTF-8.',
          'entity.charset.mismatch',
        );
      }
    },
  });
}

/**
 * The first name or value of a raw query string that is not valid percent-encoded UTF-8, or null.
 * Node's query parser reads such a piece with replacement characters instead of refusing it.
 */
export function malformedQueryPiece(url: string): string | null {
  const at = url.indexOf('?');
  if (at < 0) return null;
  for (const part of url.slice(at + 1).split('&')) {
    for (const piece of part.split('=')) {
      try {
        decodeURIComponent(piece.replace(/\+/g, ' '));
      } catch {
        return piece;
      }
    }
  }
  return null;
}

/**
 * Refuses a query with malformed percent-encoding, and a JSON body or a query holding text that cannot
 * be stored; names the piece or the field.
 */
export const refuseUnstorableText: RequestHandler = (req, _res, next) => {
  const bad = malformedQueryPiece(req.originalUrl);
  if (bad !== null) {
    const shown = bad.length > 60 ? `${bad.slice(0, 60)}...` : bad;
    next(
      new HttpError(
        400,
        `The address has malformed percent-encoding in the query, in "${shown}": every % must start a valid UTF-8 escape such as %20.`,
      ),
    );
    return;
  }
  for (const [where, value] of [
    ['query', req.query],
    ['body', req.body],
  ] as const) {
    const found = findTextProblem(value);
    if (found) {
      const path =
        where === 'query' ? `query ${found.path === '(body)' ? '' : found.path}`.trim() : found.path;
      next(
        new HttpError(400, `The request ${where} cannot be stored: ${path}: ${found.message}.`, [
          { path, message: found.message },
        ]),
      );
      return;
    }
  }
  next();
};

interface ExpressPartError {
  status?: unknown;
  statusCode?: unknown;
  type?: unknown;
  message?: unknown;
  code?: unknown;
  encoding?: unknown;
  charset?: unknown;
}

/**
 * The answer to an error raised by Express's router or body parser with a 4xx status: a clear message
 * and that status. Null for anything else (a server fault, answered 500 and logged).
 */
export function clientErrorAnswer(err: unknown): { status: number; error: string } | null {
  if (err === null || typeof err !== 'object') return null;
  const e = err as ExpressPartError;
  const raw = typeof e.status === 'number' ? e.status : typeof e.statusCode === 'number' ? e.statusCode : NaN;
  if (!(raw >= 400 && raw < 500)) return null;
  const message = typeof e.message === 'string' ? e.message : '';
  switch (e.type) {
    case 'entity.parse.failed':
      return { status: 400, error: `The request body is not valid JSON: ${message}` };
    case 'entity.too.large':
      return { status: 413, error: 'The request body is too large.' };
    case 'charset.unsupported':
      return {
        status: 415,
        error: message.startsWith('The request')
          ? message
          : `The request body's charset "${String(e.charset ?? '')}" is not supported: send JSON as UTF-8.`,
      };
    case 'encoding.unsupported':
      return {
        status: 415,
        error: `The request's Content-Encoding "${String(e.encoding ?? '')}" is not supported: send the body as it is (identity), or gzip, deflate or br.`,
      };
    case 'request.aborted':
      return { status: 400, error: 'The request was cut off before its body was complete.' };
    case 'request.size.invalid':
      return { status: 400, error: 'The request body is not as long as its Content-Length says.' };
    default:
      break;
  }
  if (err instanceof URIError || /^Failed to decode param/.test(message)) {
    const param = /'(.*)'/.exec(message)?.[1];
    return {
      status: 400,
      error: `The address has malformed percent-encoding${param ? ` in "${param}"` : ''}: every % must start a valid UTF-8 escape such as %20.`,
    };
  }
  if (typeof e.code === 'string' && e.code.startsWith('Z_')) {
    return {
      status: 400,
      error: `The request body does not decode as its Content-Encoding: ${message}.`,
    };
  }
  return { status: raw, error: message || 'The request cannot be processed.' };
}
