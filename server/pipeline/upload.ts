// Receives an uploaded take as a stream: each chunk goes to object storage, into the SHA-256 and
// through the track stream reader at once, so the server never holds the whole file. A file the
// reader refuses is removed from storage again before the error answer; nothing stored earlier is
// touched, because every upload gets a new key. A take over one part (8 MiB) goes up as an S3
// multipart upload; a refused or interrupted one is aborted (AbortMultipartUpload) before the answer,
// so its parts do not linger in the bucket (README, Operations: a lifecycle rule catches the rest).
//
// A refusal usually comes before the whole body has arrived. The rest of the body is then read and
// thrown away (up to a bound), so the connection is free for the browser's next request; beyond the
// bound the answer says `Connection: close` and the connection is closed after it.
import { once } from 'node:events';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { PassThrough } from 'node:stream';
import type { Readable } from 'node:stream';
import {
  AbortMultipartUploadCommand,
  CreateMultipartUploadCommand,
  DeleteObjectCommand,
} from '@aws-sdk/client-s3';
import type { S3Client } from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import type { Storage } from '../storage';
import { TrackFileError } from '../../shared/motion/track-reader';
import type { Track } from '../../shared/motion/track-reader';
import { HttpError } from '../lib/http-error';
import { TrackStreamError, isGzipName, readTrackStream } from './track-stream';

export interface ReceivedTake {
  track: Track;
  sizeBytes: number;
  sha256: string;
}

/** Most bytes of a refused upload's remaining body read and discarded to keep the connection open. */
export const DISCARD_MAX_BYTES = 64 * 1024 * 1024;

/**
 * After a refusal: reads and discards what is left of the request body, so a keep-alive connection
 * can carry the next request. When more than `bound` bytes are (or may be) left, the answer closes
 * the connection instead of making the client send them all.
 */
export function discardRestOfBody(
  req: IncomingMessage,
  res: ServerResponse,
  bound = DISCARD_MAX_BYTES,
): void {
  if (req.complete || req.destroyed) return;
  const declared = Number(req.headers['content-length']);
  const received = req.socket?.bytesRead ?? 0;
  const leftKnown = Number.isFinite(declared) ? declared - received : Number.POSITIVE_INFINITY;
  let discarded = 0;
  if (leftKnown > bound && !res.headersSent) res.setHeader('connection', 'close');
  req.on('data', (c: Buffer) => {
    discarded += c.byteLength;
    if (discarded > bound && !req.destroyed) {
      // The answer has gone out (or goes with Connection: close); stop reading a body nobody wants.
      if (res.writableEnded) req.socket?.destroy();
      else if (!res.headersSent) res.setHeader('connection', 'close');
    }
  });
  req.resume();
}

/**
 * Streams `body` to `key` in object storage while `consume` reads it: `consume` gets the body's
 * chunks and a `store` to pass each one on (awaiting it is the back-pressure). When `consume` throws,
 * nothing is left in storage: the upload and every multipart upload it started are aborted and the
 * object deleted, and (given `res`) the rest of the body is discarded so the connection stays usable.
 */
export async function storeStream<T>(
  body: Readable,
  opts: {
    storage: Storage;
    key: string;
    contentType: string;
    res?: ServerResponse;
    consume: (source: AsyncIterable<Buffer>, store: (b: Buffer) => Promise<void>) => Promise<T>;
  },
): Promise<T> {
  const toStorage = new PassThrough();
  const { bucket } = opts.storage;
  // Every multipart upload this one starts, so a refusal can abort each one itself: the library's
  // abort() only stops its own loop, and a create still in flight has no id to abort yet.
  const created: string[] = [];
  let refused = false;
  const abortMultipart = (uploadId: string) =>
    opts.storage.client
      .send(new AbortMultipartUploadCommand({ Bucket: bucket, Key: opts.key, UploadId: uploadId }))
      .then(
        () => undefined,
        () => undefined,
      );
  const client = new Proxy(opts.storage.client, {
    get(target, prop, receiver) {
      if (prop !== 'send') return Reflect.get(target, prop, receiver) as unknown;
      return async (...args: Parameters<S3Client['send']>) => {
        const out = (await target.send(...args)) as unknown as { UploadId?: string } | undefined;
        if (args[0] instanceof CreateMultipartUploadCommand && out?.UploadId) {
          created.push(out.UploadId);
          // Created after the refusal: abort it at once.
          if (refused) await abortMultipart(out.UploadId);
        }
        return out;
      };
    },
  });
  const upload = new Upload({
    client,
    params: { Bucket: bucket, Key: opts.key, Body: toStorage, ContentType: opts.contentType },
    queueSize: 2,
    partSize: 8 * 1024 * 1024,
  });
  const stored = upload.done();
  // Keep a rejection from going unhandled while the body is still being read.
  stored.catch(() => undefined);
  try {
    // The request is read without being destroyed when the reader stops early (see the file comment).
    const source = body.iterator({ destroyOnReturn: false }) as AsyncIterable<Buffer>;
    const got = await opts.consume(source, async (b) => {
      // A storage failure rejects `stored`; it must end the wait for drain, not leave it hanging.
      if (!toStorage.write(b)) await Promise.race([once(toStorage, 'drain'), stored]);
    });
    toStorage.end();
    await stored;
    return got;
  } catch (e) {
    if (opts.res) discardRestOfBody(body as IncomingMessage, opts.res);
    refused = true;
    await upload.abort().catch(() => undefined);
    toStorage.destroy();
    await Promise.all(created.map(abortMultipart));
    await opts.storage.client
      .send(new DeleteObjectCommand({ Bucket: bucket, Key: opts.key }))
      .catch(() => undefined);
    throw e;
  }
}

/** Streams `body` to `key`, validating it as a track file named `fileName`; throws HttpError 400/413. */
export async function receiveTake(
  body: Readable,
  opts: {
    storage: Storage;
    key: string;
    fileName: string;
    maxBytes: number;
    /** The answer to the request `body` is, so a refusal can free or close the connection. */
    res?: ServerResponse;
  },
): Promise<ReceivedTake> {
  try {
    return await storeStream(body, {
      storage: opts.storage,
      key: opts.key,
      contentType: isGzipName(opts.fileName) ? 'application/gzip' : 'text/csv',
      ...(opts.res ? { res: opts.res } : {}),
      consume: (source, store) =>
        readTrackStream(source, { fileName: opts.fileName, maxBytes: opts.maxBytes, onChunk: store }),
    });
  } catch (e) {
    if (e instanceof TrackFileError) {
      throw new HttpError(400, e.message, [
        {
          path: e.column === null ? `line ${e.line}` : `line ${e.line}, column ${e.column}`,
          message: e.reason,
        },
      ]);
    }
    if (e instanceof TrackStreamError) throw new HttpError(e.status, e.message);
    throw e;
  }
}
