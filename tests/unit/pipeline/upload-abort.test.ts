// A refused or interrupted take larger than one part is an S3 multipart upload; its parts must not stay
// in the bucket. Amazon S3's API (AbortMultipartUpload: "aborts a multipart upload... the storage
// consumed by any previously uploaded parts will be freed") is the contract: receiveTake must send it
// for every upload it created, before its error reaches the caller, even for an upload whose create
// answers only after the refusal. The S3 client is the real one; a middleware answers in place of S3
// and records each command.
import { Readable } from 'node:stream';
import { S3Client } from '@aws-sdk/client-s3';
import { describe, expect, it } from 'vitest';
import { receiveTake } from '../../../server/pipeline/upload';
import type { Storage } from '../../../server/storage';

interface Call {
  name: string;
  uploadId?: string;
}

function fakeStorage(opts: { createDelay_ms?: number } = {}) {
  const calls: Call[] = [];
  const client = new S3Client({
    region: 'us-east-1',
    endpoint: 'http://127.0.0.1:9',
    credentials: { accessKeyId: 'x', secretAccessKey: 'y' },
    forcePathStyle: true,
  });
  let next = 0;
  client.middlewareStack.add(
    (_next, context) => async (args) => {
      const input = args.input as { UploadId?: string; Body?: unknown };
      const name = String(context.commandName);
      calls.push({ name, ...(input.UploadId ? { uploadId: input.UploadId } : {}) });
      const $metadata = {};
      if (name === 'CreateMultipartUploadCommand') {
        if (opts.createDelay_ms) await new Promise((r) => setTimeout(r, opts.createDelay_ms));
        next += 1;
        return { output: { UploadId: `upload-${next}`, $metadata }, response: {} };
      }
      if (name === 'UploadPartCommand') return { output: { ETag: '"part"', $metadata }, response: {} };
      return { output: { $metadata }, response: {} };
    },
    { step: 'initialize', name: 'answerInPlaceOfS3' },
  );
  const storage: Storage = { client, bucket: 'takes', check: async () => undefined, close: () => undefined };
  return { storage, calls };
}

/** A pose track of `rows` rows (about 20 bytes each), then `tail`. */
function* poseLines(rows: number, tail: string): Generator<Buffer> {
  yield Buffer.from('time_s,x_m,y_m,z_m,roll_rad,pitch_rad,yaw_rad\n');
  const block = 10_000;
  for (let start = 0; start < rows; start += block) {
    let text = '';
    for (let i = start; i < Math.min(rows, start + block); i++)
      text += `${(i / 1000).toFixed(3)},0,0,0,0,0,0\n`;
    yield Buffer.from(text);
  }
  if (tail) yield Buffer.from(tail);
}

// About 20 MB: past two 8 MiB parts (the library reads one part ahead before it starts a multipart upload).
const ROWS = 900_000;

describe('multipart uploads of refused takes', () => {
  it('a take refused after its first part aborts its multipart upload before the 400', async () => {
    const { storage, calls } = fakeStorage();
    const body = Readable.from(poseLines(ROWS, 'not,a,number,row,at,all,x\n'));
    await expect(
      receiveTake(body, { storage, key: 'studios/s/takes/t/take.csv', fileName: 'take.csv', maxBytes: 1e9 }),
    ).rejects.toMatchObject({ status: 400 });
    const names = calls.map((c) => c.name);
    expect(names).toContain('CreateMultipartUploadCommand');
    expect(calls).toContainEqual({ name: 'AbortMultipartUploadCommand', uploadId: 'upload-1' });
    expect(names).not.toContain('CompleteMultipartUploadCommand');
  });

  it('an interrupted body (the client went away) aborts it too', async () => {
    const { storage, calls } = fakeStorage();
    const lines = poseLines(ROWS, '');
    const body = new Readable({
      read() {
        const n = lines.next();
        if (n.done) this.destroy(Object.assign(new Error('aborted'), { code: 'ECONNRESET' }));
        else this.push(n.value);
      },
    });
    await expect(
      receiveTake(body, { storage, key: 'studios/s/takes/t/cut.csv', fileName: 'cut.csv', maxBytes: 1e9 }),
    ).rejects.toThrow();
    expect(calls).toContainEqual({ name: 'AbortMultipartUploadCommand', uploadId: 'upload-1' });
    expect(calls.map((c) => c.name)).not.toContain('CompleteMultipartUploadCommand');
  });

  it('an upload whose create answers only after the refusal is aborted when the answer comes', async () => {
    const { storage, calls } = fakeStorage({ createDelay_ms: 300 });
    const body = Readable.from(poseLines(ROWS, 'bad\n'));
    await expect(
      receiveTake(body, { storage, key: 'studios/s/takes/t/slow.csv', fileName: 'slow.csv', maxBytes: 1e9 }),
    ).rejects.toMatchObject({ status: 400 });
    const until = Date.now() + 5000;
    while (Date.now() < until && !calls.some((c) => c.name === 'AbortMultipartUploadCommand')) {
      await new Promise((r) => setTimeout(r, 20));
    }
    expect(calls).toContainEqual({ name: 'AbortMultipartUploadCommand', uploadId: 'upload-1' });
  });

  it('a take that is accepted completes its upload and aborts nothing', async () => {
    const { storage, calls } = fakeStorage();
    const got = await receiveTake(Readable.from(poseLines(ROWS, '')), {
      storage,
      key: 'studios/s/takes/t/good.csv',
      fileName: 'good.csv',
      maxBytes: 1e9,
    });
    expect(got.track.length).toBe(ROWS);
    const names = calls.map((c) => c.name);
    expect(names).toContain('CompleteMultipartUploadCommand');
    expect(names).not.toContain('AbortMultipartUploadCommand');
  });
});
