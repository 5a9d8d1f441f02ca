// The track stream reader shared by the upload, the worker and the CLI: gzip by name in any case,
// every stage's error reaching the caller, and the bounds on text, line length and lines.
import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import { createGzip, gzipSync } from 'node:zlib';
import { TrackFileError } from '../../../shared/motion/track-reader';
import { TrackStreamError, readTrackStream } from '../../../server/pipeline/track-stream';
import { makeCsv } from '../../factories/motion';

const legsCsv = (rows = 2000) =>
  makeCsv(
    ['time_s', 'leg1_mm', 'leg2_mm', 'leg3_mm'],
    Array.from({ length: rows }, (_, i) => [i / 100, 1800, 1801, 1802.5]),
  );

/** Chunks of `total` bytes of `fill`, made on the fly (nothing that size is ever held). */
function* repeated(fill: number, total: number, chunk = 1 << 20): Generator<Buffer> {
  const block = Buffer.alloc(chunk, fill);
  for (let sent = 0; sent < total; sent += chunk) yield block.subarray(0, Math.min(chunk, total - sent));
}

/** A gzip stream of `prefix` then `total` bytes of `fill`, compressed as it is read. */
function gzipOf(prefix: string, fill: number, total: number): Readable {
  return Readable.from(
    (function* () {
      yield Buffer.from(prefix);
      yield* repeated(fill, total);
    })(),
  ).pipe(createGzip());
}

describe('track stream reader', () => {
  it('reads a gzip whose name ends in .GZ (any case), and hashes the bytes as sent', async () => {
    const gz = gzipSync(legsCsv());
    const got = await readTrackStream(Readable.from([gz.subarray(0, 7), gz.subarray(7)]), {
      fileName: 'LEGS.CSV.GZ',
    });
    expect(got.track.length).toBe(2000);
    expect(got.sizeBytes).toBe(gz.byteLength);
    // node:crypto over the whole buffer at once, against the streamed hash.
    expect(got.sha256).toBe(createHash('sha256').update(gz).digest('hex'));
  });

  it('refuses a plain file named .gz, and a gzip named .csv, saying which', async () => {
    await expect(
      readTrackStream(Readable.from([Buffer.from(legsCsv())]), { fileName: 'a.csv.gz' }),
    ).rejects.toThrow(/a\.csv\.gz: the name ends in \.gz but the file is not gzip-compressed/);
    await expect(
      readTrackStream(Readable.from([gzipSync(legsCsv())]), { fileName: 'a.csv' }),
    ).rejects.toThrow(/a\.csv: the file is gzip-compressed but its name does not end in \.gz/);
  });

  it('refuses a truncated gzip as a gzip problem', async () => {
    const gz = gzipSync(legsCsv());
    const e = await readTrackStream(Readable.from([gz.subarray(0, gz.length - 20)]), {
      fileName: 'cut.csv.gz',
    }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(TrackStreamError);
    expect((e as TrackStreamError).status).toBe(400);
    expect((e as Error).message).toMatch(/cut\.csv\.gz: not a readable gzip file/);
  });

  it("passes the source's own error on (a storage read that breaks mid-file)", async () => {
    async function* broken() {
      yield Buffer.from(legsCsv(10));
      throw new Error('connection reset by the storage');
    }
    await expect(readTrackStream(broken(), { fileName: 'x.csv' })).rejects.toThrow(
      'connection reset by the storage',
    );
  });

  it('refuses a gzip of a gigabyte of newlines after reading a sliver of it', async () => {
    const gz = gzipOf('time_s,leg1_m,leg2_m,leg3_m\n', 0x0a, 1 << 30);
    const e = await readTrackStream(gz, { fileName: 'blank.csv.gz' }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(TrackFileError);
    expect((e as TrackFileError).code).toBe('tooManyRows');
    expect((e as Error).message).toMatch(/too many blank lines/);
  });

  it('refuses a gzip of one 32 MiB line at the line-length bound', async () => {
    const gz = gzipOf('time_s,leg1_m,leg2_m,leg3_m\n', 0x37, 32 << 20);
    const e = await readTrackStream(gz, { fileName: 'long.csv.gz' }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(TrackFileError);
    expect((e as TrackFileError).code).toBe('lineTooLong');
    expect((e as TrackFileError).line).toBe(2);
  });

  it('bounds the decompressed text and the bytes as sent', async () => {
    const gz = gzipSync(legsCsv());
    await expect(
      readTrackStream(Readable.from([gz]), { fileName: 'a.csv.gz', maxTextBytes: 1000 }),
    ).rejects.toThrow(/a\.csv\.gz: the text is larger than the limit of 1000 bytes after decompression/);
    await expect(
      readTrackStream(Readable.from([gz]), { fileName: 'a.csv.gz', maxBytes: 100 }),
    ).rejects.toThrow(/larger than the limit of 100 bytes/);
  });
});
