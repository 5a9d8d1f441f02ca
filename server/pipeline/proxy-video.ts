// Stored files sent back, and a take's proxy video: a copy of the ride film to watch in step with the motion on the run page.
// It is streamed to object storage as it arrives (never held whole), checked by its first bytes
// against the type the upload declares, and served back with byte ranges, which a <video> element
// needs to seek.
import { createHash } from 'node:crypto';
import type { ServerResponse } from 'node:http';
import type { Readable } from 'node:stream';
import type { Response } from 'express';
import { GetObjectCommand } from '@aws-sdk/client-s3';
import type { Storage } from '../storage';
import { HttpError } from '../lib/http-error';
import { PROXY_VIDEO_TYPES } from '../../shared/schemas/pipeline';
import type { ProxyVideoType } from '../../shared/schemas/pipeline';
import { storeStream } from './upload';

/** The container a file's first bytes announce, or null. */
export function sniffVideo(head: Uint8Array): ProxyVideoType | null {
  // ISO base media file format (MP4; ISO/IEC 14496-12): the first box is `ftyp`, its type at byte 4.
  if (head.length >= 8 && String.fromCharCode(head[4]!, head[5]!, head[6]!, head[7]!) === 'ftyp') {
    return 'video/mp4';
  }
  // WebM is Matroska, an EBML document: it starts with the EBML header ID 0x1A45DFA3 (RFC 8794).
  if (head.length >= 4 && head[0] === 0x1a && head[1] === 0x45 && head[2] === 0xdf && head[3] === 0xa3) {
    return 'video/webm';
  }
  return null;
}

/** The declared Content-Type as a proxy video type (parameters ignored), or a 415 naming the choices. */
export function declaredVideoType(contentType: string | undefined): ProxyVideoType {
  const bare = (contentType ?? '').split(';')[0]!.trim().toLowerCase();
  const found = PROXY_VIDEO_TYPES.find((t) => t === bare);
  if (!found) {
    throw new HttpError(
      415,
      `A proxy video is sent as ${PROXY_VIDEO_TYPES.join(' or ')} (Content-Type), not ${bare || 'no type'}.`,
    );
  }
  return found;
}

export interface StoredVideo {
  sizeBytes: number;
  sha256: string;
}

/** Streams a proxy video to `key`; a refused one (wrong bytes, empty, too large) leaves nothing stored. */
export async function receiveProxyVideo(
  body: Readable,
  opts: { storage: Storage; key: string; type: ProxyVideoType; maxBytes: number; res?: ServerResponse },
): Promise<StoredVideo> {
  return storeStream(body, {
    storage: opts.storage,
    key: opts.key,
    contentType: opts.type,
    ...(opts.res ? { res: opts.res } : {}),
    consume: async (source, store) => {
      const hash = createHash('sha256');
      let size = 0;
      let head: Buffer | null = Buffer.alloc(0);
      for await (const chunk of source) {
        size += chunk.byteLength;
        if (size > opts.maxBytes) {
          throw new HttpError(413, `The proxy video is larger than ${opts.maxBytes} bytes.`);
        }
        if (head) {
          head = Buffer.concat([head, chunk]);
          if (head.length >= 8) {
            const seen = sniffVideo(head);
            if (seen !== opts.type) {
              throw new HttpError(
                400,
                seen
                  ? `The file is ${seen} but was sent as ${opts.type}.`
                  : `The file is not an MP4 or WebM video (its first bytes are neither an MP4 'ftyp' box nor a WebM header).`,
              );
            }
            head = null;
          }
        }
        hash.update(chunk);
        await store(chunk);
      }
      if (size === 0) throw new HttpError(400, 'The proxy video is empty.');
      if (head) throw new HttpError(400, 'The file is too short to be a video.');
      return { sizeBytes: size, sha256: hash.digest('hex') };
    },
  });
}

/**
 * The one byte range of a `Range` header over `size` bytes ("bytes=a-b", "bytes=a-", "bytes=-n"), null
 * for none, 'unsatisfiable' for a range outside the file. Several ranges are answered as the whole
 * file (RFC 9110 lets a server ignore Range).
 */
export function byteRange(
  header: string | undefined,
  size: number,
): { start: number; end: number } | null | 'unsatisfiable' {
  if (!header) return null;
  const m = /^bytes=(\d*)-(\d*)$/.exec(header.trim());
  if (!m) return null;
  const [, a, b] = m;
  if (a === '' && b === '') return null;
  let start: number;
  let end: number;
  if (a === '') {
    const n = Number(b);
    if (n === 0) return 'unsatisfiable';
    start = Math.max(0, size - n);
    end = size - 1;
  } else {
    start = Number(a);
    end = b === '' ? size - 1 : Math.min(Number(b), size - 1);
  }
  if (start >= size || start > end) return 'unsatisfiable';
  return { start, end };
}

/** Answers a GET with a stored object, whole, as a download named `fileName`. */
export async function sendStoredFile(
  res: Response,
  opts: { storage: Storage; key: string; type: string; fileName: string; sizeBytes: number },
): Promise<void> {
  const got = await opts.storage.client.send(
    new GetObjectCommand({ Bucket: opts.storage.bucket, Key: opts.key }),
  );
  res.status(200);
  res.set('content-type', opts.type);
  res.set('content-length', String(opts.sizeBytes));
  res.set('cache-control', 'private, max-age=3600');
  res.attachment(opts.fileName);
  await pipeBody(got.Body as Readable, res);
}

function pipeBody(body: Readable, res: Response): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    body.on('error', reject);
    res.on('close', () => {
      body.destroy();
      resolve();
    });
    body.pipe(res);
  });
}

/** Answers a GET for the stored video: the whole file (200) or the asked range (206). */
export async function sendProxyVideo(
  res: Response,
  opts: { storage: Storage; key: string; type: ProxyVideoType; sizeBytes: number; range: string | undefined },
): Promise<void> {
  const range = byteRange(opts.range, opts.sizeBytes);
  if (range === 'unsatisfiable') {
    res
      .status(416)
      .set('content-range', `bytes */${opts.sizeBytes}`)
      .json({
        error: `The range ${opts.range} is outside the video's ${opts.sizeBytes} bytes.`,
      });
    return;
  }
  const got = await opts.storage.client.send(
    new GetObjectCommand({
      Bucket: opts.storage.bucket,
      Key: opts.key,
      ...(range ? { Range: `bytes=${range.start}-${range.end}` } : {}),
    }),
  );
  res.set('content-type', opts.type);
  res.set('accept-ranges', 'bytes');
  res.set('cache-control', 'private, max-age=3600');
  if (range) {
    res.status(206);
    res.set('content-range', `bytes ${range.start}-${range.end}/${opts.sizeBytes}`);
    res.set('content-length', String(range.end - range.start + 1));
  } else {
    res.status(200);
    res.set('content-length', String(opts.sizeBytes));
  }
  await pipeBody(got.Body as Readable, res);
}
