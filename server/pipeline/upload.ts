// Receives an uploaded take as a stream: each chunk goes to object storage, into the SHA-256 and
// through the track reader at once, so the server never holds the whole file. A file the reader
// refuses is removed from storage again before the error answer; nothing stored earlier is touched,
// because every upload gets a new key.
import { createHash } from 'node:crypto';
import { once } from 'node:events';
import { PassThrough } from 'node:stream';
import type { Readable } from 'node:stream';
import { StringDecoder } from 'node:string_decoder';
import { createGunzip } from 'node:zlib';
import { DeleteObjectCommand } from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import type { Storage } from '../storage';
import { TrackFileError, TrackReader } from '../../shared/motion/track-reader';
import type { Track } from '../../shared/motion/track-reader';
import { HttpError } from '../lib/http-error';

export interface ReceivedTake {
  track: Track;
  sizeBytes: number;
  sha256: string;
}

/** Streams `body` to `key`, validating it as a track file named `fileName`; throws HttpError 400/413. */
export async function receiveTake(
  body: Readable,
  opts: { storage: Storage; key: string; fileName: string; maxBytes: number },
): Promise<ReceivedTake> {
  const gz = opts.fileName.toLowerCase().endsWith('.gz');
  const hash = createHash('sha256');
  const reader = new TrackReader({ file: opts.fileName, maxBytes: Number.MAX_SAFE_INTEGER });
  const decoder = new StringDecoder('utf8');
  const toStorage = new PassThrough();
  const upload = new Upload({
    client: opts.storage.client,
    params: {
      Bucket: opts.storage.bucket,
      Key: opts.key,
      Body: toStorage,
      ContentType: gz ? 'application/gzip' : 'text/csv',
    },
    queueSize: 2,
    partSize: 8 * 1024 * 1024,
  });
  const stored = upload.done();
  // Keep a rejection from going unhandled while the body is still being read.
  stored.catch(() => undefined);

  let failure: unknown = null;
  const gunzip = gz ? createGunzip() : null;
  if (gunzip) {
    gunzip.on('data', (d: Buffer) => {
      if (failure) return;
      try {
        reader.push(decoder.write(d));
      } catch (e) {
        failure = e;
      }
    });
    gunzip.on('error', (e) => {
      failure ??= new HttpError(400, `${opts.fileName}: not a readable gzip file (${e.message}).`);
    });
  }

  let size = 0;
  try {
    for await (const chunk of body) {
      const b = chunk as Buffer;
      size += b.byteLength;
      if (size > opts.maxBytes) {
        throw new HttpError(
          413,
          `${opts.fileName}: the file is larger than the limit of ${opts.maxBytes} bytes.`,
        );
      }
      hash.update(b);
      if (!toStorage.write(b)) await once(toStorage, 'drain');
      if (gunzip) {
        if (!gunzip.write(b)) await once(gunzip, 'drain');
      } else {
        reader.push(decoder.write(b));
      }
      if (failure) throw failure;
    }
    if (gunzip) {
      gunzip.end();
      await once(gunzip, 'end').catch(() => undefined);
    }
    if (failure) throw failure;
    reader.push(decoder.end());
    const track = reader.end();
    toStorage.end();
    await stored;
    return { track, sizeBytes: size, sha256: hash.digest('hex') };
  } catch (e) {
    toStorage.destroy();
    await upload.abort().catch(() => undefined);
    await opts.storage.client
      .send(new DeleteObjectCommand({ Bucket: opts.storage.bucket, Key: opts.key }))
      .catch(() => undefined);
    body.resume();
    if (e instanceof TrackFileError) {
      throw new HttpError(400, e.message, [
        {
          path: e.column === null ? `line ${e.line}` : `line ${e.line}, column ${e.column}`,
          message: e.reason,
        },
      ]);
    }
    throw e;
  }
}
