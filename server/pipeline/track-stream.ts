// The one track stream reader of the upload, the worker and the CLI: bytes in (a request, a storage
// object, a file), through gunzip when the name ends in .gz (any case) and the pure TrackReader (which
// reads the UTF-8 bytes itself), out a Track with the byte count and SHA-256 of what came in. An
// error in any stage (the source, gunzip, the parser) reaches the caller and stops the other stages;
// nothing is left waiting.
//
// Bounds: the bytes as sent (maxBytes), the decompressed text (maxTextBytes), one line
// (TrackReader's maxLineChars) and the rows (maxRows, blank lines counted). The reader looks at each
// byte once, so the work is linear in the input.
import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import { createGunzip } from 'node:zlib';
import { DEFAULT_MAX_BYTES, TrackReader } from '../../shared/motion/track-reader';
import type { Track, TrackReaderOptions } from '../../shared/motion/track-reader';
import type { Storage } from '../storage';

/** A take that cannot be read as bytes (too large, not gzip though named so): 400 or 413 at the API. */
export class TrackStreamError extends Error {
  override name = 'TrackStreamError';
  constructor(
    readonly status: 400 | 413,
    message: string,
  ) {
    super(message);
  }
}

export interface TrackStreamOptions extends Omit<TrackReaderOptions, 'file' | 'maxBytes'> {
  /** The file's name: messages use it, and a name ending in .gz (any case) means gzip. */
  fileName: string;
  /** Most bytes as sent (compressed, for .gz); default no limit beyond maxTextBytes. */
  maxBytes?: number;
  /** Most bytes of text after decompression; default 1 GiB (DEFAULT_MAX_BYTES). */
  maxTextBytes?: number;
  /** Called with each chunk as sent, in order, before it is parsed (e.g. to store it); awaited. */
  onChunk?: (chunk: Buffer) => Promise<void> | void;
}

export interface TrackStreamResult {
  track: Track;
  /** Bytes as sent. */
  sizeBytes: number;
  /** SHA-256 (hex) of the bytes as sent. */
  sha256: string;
}

/** True for a name ending in .gz, whatever its case. */
export const isGzipName = (fileName: string): boolean => /\.gz$/i.test(fileName);

const GZIP_MAGIC = [0x1f, 0x8b] as const;

/** Reads a track from `source` (see the file comment); throws TrackStreamError, TrackFileError or the source's error. */
export async function readTrackStream(
  source: AsyncIterable<Uint8Array>,
  opts: TrackStreamOptions,
): Promise<TrackStreamResult> {
  const { fileName } = opts;
  const gz = isGzipName(fileName);
  const maxBytes = opts.maxBytes ?? Number.POSITIVE_INFINITY;
  const maxText = opts.maxTextBytes ?? DEFAULT_MAX_BYTES;
  const hash = createHash('sha256');
  const reader = new TrackReader({
    file: fileName,
    maxBytes: Number.MAX_SAFE_INTEGER,
    ...(opts.maxRows !== undefined ? { maxRows: opts.maxRows } : {}),
    ...(opts.maxLineChars !== undefined ? { maxLineChars: opts.maxLineChars } : {}),
    ...(opts.sharedMemory !== undefined ? { sharedMemory: opts.sharedMemory } : {}),
  });
  let size = 0;
  let head: number[] = [];

  // Stage 1: the bytes as sent: counted, hashed, handed on, and (for .gz) checked for the gzip magic.
  async function* sent(): AsyncGenerator<Buffer> {
    for await (const c of source) {
      const b = Buffer.isBuffer(c) ? c : Buffer.from(c.buffer, c.byteOffset, c.byteLength);
      size += b.byteLength;
      if (size > maxBytes) {
        throw new TrackStreamError(
          413,
          `${fileName}: the file is larger than the limit of ${maxBytes} bytes.`,
        );
      }
      if (head.length < 2) {
        for (let i = 0; i < b.length && head.length < 2; i++) head.push(b[i] as number);
        if (head.length === 2) checkMagic(head);
      }
      hash.update(b);
      if (opts.onChunk) await opts.onChunk(b);
      yield b;
    }
    if (head.length > 0 && head.length < 2) checkMagic(head);
  }
  function checkMagic(bytes: number[]): void {
    const isGzip = bytes[0] === GZIP_MAGIC[0] && bytes[1] === GZIP_MAGIC[1];
    if (gz && !isGzip) {
      throw new TrackStreamError(
        400,
        `${fileName}: the name ends in .gz but the file is not gzip-compressed; send it as .csv, or gzip it.`,
      );
    }
    if (!gz && isGzip) {
      throw new TrackStreamError(
        400,
        `${fileName}: the file is gzip-compressed but its name does not end in .gz; name it .csv.gz.`,
      );
    }
    head = [-1, -1];
  }

  // Last stage: decompressed bytes, counted and parsed (TrackReader.pushBytes reads the UTF-8 bytes).
  let text = 0;
  async function parse(input: AsyncIterable<Buffer>): Promise<void> {
    for await (const b of input) {
      text += b.byteLength;
      if (text > maxText) {
        throw new TrackStreamError(
          413,
          `${fileName}: the text is larger than the limit of ${maxText} bytes${gz ? ' after decompression' : ''}.`,
        );
      }
      reader.pushBytes(b);
    }
  }

  // Plain text is parsed straight from the source, one chunk at a time (so a source may hand out the
  // same buffer again once its chunk was taken); gzip goes through a stream.
  let raw: Readable | null = null;
  let out: Readable | null = null;
  if (gz) {
    raw = Readable.from(sent());
    const gunzip = createGunzip();
    // pipe() does not pass errors on: a source error ends the gunzip stream with that error.
    raw.once('error', (e) => gunzip.destroy(e));
    out = raw.pipe(gunzip);
  }
  try {
    await parse(out ?? sent());
  } catch (e) {
    const code = (e as { code?: string }).code;
    if (gz && typeof code === 'string' && code.startsWith('Z_')) {
      throw new TrackStreamError(400, `${fileName}: not a readable gzip file (${(e as Error).message}).`);
    }
    throw e;
  } finally {
    out?.destroy();
    raw?.destroy();
  }
  if (gz && size === 0) {
    throw new TrackStreamError(400, `${fileName}: the file is empty, so not a gzip file.`);
  }
  return { track: reader.end(), sizeBytes: size, sha256: hash.digest('hex') };
}

/** Reads a stored take from object storage; a storage error (missing object, broken stream) is thrown as is. */
export async function readStoredTake(storage: Storage, key: string, fileName: string): Promise<Track> {
  // Loaded here, not at the top: the `legwork` command imports this module and never reads storage.
  const { GetObjectCommand } = await import('@aws-sdk/client-s3');
  const obj = await storage.client.send(new GetObjectCommand({ Bucket: storage.bucket, Key: key }));
  const body = obj.Body as AsyncIterable<Uint8Array> | undefined;
  if (!body) throw new Error(`storage returned no body for ${key}`);
  return (await readTrackStream(body, { fileName })).track;
}
