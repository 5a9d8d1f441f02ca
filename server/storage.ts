// Object storage through the S3 API: the local fake or any S3-compatible store.
import { HeadBucketCommand, S3Client } from '@aws-sdk/client-s3';
import type { Env } from './env';
import { HttpError } from './lib/http-error';

export interface Storage {
  client: S3Client;
  bucket: string;
  check: () => Promise<void>;
  close: () => void;
}

/** A store that does not accept a connection within this time counts as down (ms). */
export const STORAGE_CONNECT_TIMEOUT_MS = 3000;
/** A connection on which nothing moves for this long is abandoned (ms). */
export const STORAGE_IDLE_TIMEOUT_MS = 20_000;
/** Attempts per request, the first included: one quick retry, then the caller decides. */
export const STORAGE_MAX_ATTEMPTS = 2;

/**
 * Builds the S3 client from the environment; checksums only when required, as the fake needs. Short
 * timeouts and few attempts: a request to a dead store fails in seconds, not minutes, so an upload
 * answers 503 at once and the worker's own retries (with backoff) take over.
 */
export function createStorage(env: Env): Storage {
  const client = new S3Client({
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION,
    forcePathStyle: env.S3_FORCE_PATH_STYLE,
    credentials: { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY },
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    maxAttempts: STORAGE_MAX_ATTEMPTS,
    requestHandler: {
      connectionTimeout: STORAGE_CONNECT_TIMEOUT_MS,
      socketTimeout: STORAGE_IDLE_TIMEOUT_MS,
    },
  });
  return {
    client,
    bucket: env.S3_BUCKET,
    check: async () => {
      await client.send(new HeadBucketCommand({ Bucket: env.S3_BUCKET }));
    },
    close: () => client.destroy(),
  };
}

interface S3ErrorShape {
  name?: string;
  code?: string;
  Code?: string;
  $metadata?: { httpStatusCode?: number };
}

/** The object (or bucket key) does not exist: a genuine "not found", not an outage. */
export function isMissingObject(e: unknown): boolean {
  const x = (e ?? {}) as S3ErrorShape;
  return (
    x.name === 'NoSuchKey' ||
    x.name === 'NotFound' ||
    x.Code === 'NoSuchKey' ||
    x.$metadata?.httpStatusCode === 404
  );
}

/** The store could not be reached or failed on its side (connection refused or reset, timeout, 5xx). */
export function isStorageOutage(e: unknown): boolean {
  if (isMissingObject(e)) return false;
  const x = (e ?? {}) as S3ErrorShape;
  const status = x.$metadata?.httpStatusCode;
  if (status !== undefined && status >= 500) return true;
  if (x.name === 'TimeoutError' || x.name === 'RequestTimeout') return true;
  const code = x.code ?? '';
  return [
    'ECONNREFUSED',
    'ECONNRESET',
    'ETIMEDOUT',
    'EPIPE',
    'ENOTFOUND',
    'EAI_AGAIN',
    'EHOSTUNREACH',
    'ENETUNREACH',
    'ECONNABORTED',
  ].includes(code);
}

/** A short description of a storage failure for logs and run reasons. */
export function describeStorageError(e: unknown): string {
  const x = (e ?? {}) as S3ErrorShape & { message?: string };
  return [x.name && x.name !== 'Error' ? x.name : '', x.code ?? '', x.message ?? String(e)]
    .filter(Boolean)
    .join(': ');
}

/** The answer for a storage call that failed: 404 when the object is missing, 503 when the store is down. */
export function storageHttpError(e: unknown, what: string, consequence = 'could not be read'): HttpError {
  if (isMissingObject(e)) return new HttpError(404, `${what} is missing from storage.`);
  const why = isStorageOutage(e) ? 'is not answering' : 'refused the request';
  return new HttpError(
    503,
    `Object storage ${why} (${describeStorageError(e)}); ${what} ${consequence}. Try again shortly.`,
  );
}
