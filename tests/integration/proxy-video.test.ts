// A take's proxy video over HTTP against the real services: stored as sent, served back whole and
// by byte ranges (RFC 9110, section 14: `Range: bytes=a-b`, `bytes=a-`, `bytes=-n`; 206 with
// Content-Range; 416 for a range outside the file), refused by its first bytes when it is not the
// container it claims (MP4's `ftyp` box, ISO/IEC 14496-12 section 4.3; WebM's EBML header
// 0x1A45DFA3, RFC 8794), and a refusal stores nothing and keeps the video already there.
import { createHash, randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { makeVehicleCsv } from '../factories/takes';
import { createStorage } from '../../server/storage';
import { testEnv } from './support/services';

const MAX = 300_000;
let t: TestApp;
let producer: Client;
let engineer: Client;
let operator: Client;
let base: string;
let takeId: string;
let csv: Buffer;
let takeSha: string;

/** An MP4-looking file: a 24-byte `ftyp` box (size, type, major brand, version, a brand) and filler. */
function mp4(bytes: number): Buffer {
  const head = Buffer.alloc(24);
  head.writeUInt32BE(24, 0);
  head.write('ftyp', 4, 'latin1');
  head.write('isom', 8, 'latin1');
  head.writeUInt32BE(512, 12);
  head.write('isom', 16, 'latin1');
  head.write('mp41', 20, 'latin1');
  return Buffer.concat([head, randomBytes(bytes - head.length)]);
}
/** A WebM-looking file: the EBML header ID, then filler. */
function webm(bytes: number): Buffer {
  return Buffer.concat([Buffer.from([0x1a, 0x45, 0xdf, 0xa3]), randomBytes(bytes - 4)]);
}
const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');

async function storedProxies(): Promise<string[]> {
  const storage = createStorage(testEnv(t.tdb.url));
  try {
    const out = await storage.client.send(
      new ListObjectsV2Command({
        Bucket: storage.bucket,
        Prefix: `studios/${t.seed.studioId}/takes/${takeId}/`,
      }),
    );
    return (out.Contents ?? []).map((o) => o.Key!).filter((k) => k.includes('/proxy-'));
  } finally {
    storage.close();
  }
}

const put = (c: Client, type: string, body: Buffer) =>
  c.raw('put', `${base}/takes/${takeId}/proxy-video`).set('content-type', type).send(body);

beforeAll(async () => {
  t = await startTestApp({ env: { PROXY_VIDEO_MAX_BYTES: String(MAX), LOGIN_RATE_LIMIT: '1000' } });
  producer = new Client(t.app);
  await producer.signIn('pia.producer@lanternfish.example');
  engineer = new Client(t.app);
  await engineer.signIn('eli.engineer@lanternfish.example');
  operator = new Client(t.app);
  await operator.signIn('otto.operator@lanternfish.example');
  base = `/api/studios/${t.seed.studioId}`;
  const track = (
    await producer.send('post', `${base}/tracks`, { title: 'Proxy Ride', film: 'Undertow (fictional)' })
  ).body as { id: string };
  const take = await producer
    .raw('post', `${base}/tracks/${track.id}/takes?fileName=proxy.csv`)
    .set('content-type', 'application/octet-stream')
    .send((csv = Buffer.from(makeVehicleCsv({ duration_s: 2 }))));
  expect(take.status, JSON.stringify(take.body)).toBe(201);
  takeId = (take.body as { id: string }).id;
  takeSha = (take.body as { sha256: string }).sha256;
});
afterAll(async () => t.close());

describe("the take's own file", () => {
  it('comes back byte for byte as uploaded, named as uploaded', async () => {
    const r = await engineer.get(`${base}/takes/${takeId}/file`).expect(200);
    const got = Buffer.from(r.text, 'utf8');
    expect(Buffer.compare(got, csv)).toBe(0);
    expect(sha(got)).toBe(takeSha);
    expect(r.headers['content-disposition']).toMatch(/proxy\.csv/);
    expect((await operator.get(`${base}/takes/${takeId}/file`)).status).toBe(403);
  });
});

describe('proxy video', () => {
  const first = mp4(200_000);

  it('stores a video as sent and names it on the take', async () => {
    const r = await put(producer, 'video/mp4', first);
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.proxyVideo).toMatchObject({
      type: 'video/mp4',
      sizeBytes: first.length,
      sha256: sha(first),
    });
    const track = await producer.get(`${base}/tracks/${r.body.trackId}`).expect(200);
    const listed = (track.body.takes as { id: string; proxyVideo: unknown }[]).find((k) => k.id === takeId);
    expect(listed?.proxyVideo).toMatchObject({ sha256: sha(first) });
    expect(await storedProxies()).toHaveLength(1);
  });

  it('serves it whole and by byte ranges', async () => {
    const url = `${base}/takes/${takeId}/proxy-video`;
    const whole = await engineer.get(url).buffer(true).expect(200);
    expect(whole.headers['accept-ranges']).toBe('bytes');
    expect(sha(whole.body as Buffer)).toBe(sha(first));
    const mid = await engineer.get(url).set('range', 'bytes=100-199').buffer(true).expect(206);
    expect(mid.headers['content-range']).toBe(`bytes 100-199/${first.length}`);
    expect(Buffer.compare(mid.body as Buffer, first.subarray(100, 200))).toBe(0);
    const open = await engineer
      .get(url)
      .set('range', `bytes=${first.length - 5}-`)
      .buffer(true)
      .expect(206);
    expect(Buffer.compare(open.body as Buffer, first.subarray(first.length - 5))).toBe(0);
    const tail = await engineer.get(url).set('range', 'bytes=-10').buffer(true).expect(206);
    expect(Buffer.compare(tail.body as Buffer, first.subarray(first.length - 10))).toBe(0);
    const past = await engineer.get(url).set('range', `bytes=${first.length}-`);
    expect(past.status).toBe(416);
    expect(past.headers['content-range']).toBe(`bytes */${first.length}`);
  });

  it('refuses what is not the video it claims, too large, or empty, and keeps the one it has', async () => {
    const cases: [string, Buffer, number, RegExp][] = [
      ['text/plain', mp4(1000), 415, /video\/mp4 or video\/webm/],
      ['video/mp4', webm(50_000), 400, /is video\/webm but was sent as video\/mp4/],
      ['video/webm', randomBytes(50_000), 400, /not an MP4 or WebM video/],
      ['video/mp4', mp4(MAX + 1), 413, new RegExp(`larger than ${MAX} bytes`)],
      ['video/mp4', Buffer.alloc(0), 400, /empty/],
      ['video/mp4', Buffer.from('ftyp'), 400, /too short/],
    ];
    for (const [type, body, status, message] of cases) {
      const r = await put(producer, type, body);
      expect(r.status, `${type} ${body.length}: ${JSON.stringify(r.body)}`).toBe(status);
      expect(r.body.error).toMatch(message);
    }
    const still = await producer.get(`${base}/takes/${takeId}/proxy-video`).buffer(true).expect(200);
    expect(sha(still.body as Buffer)).toBe(sha(first));
    expect(await storedProxies()).toHaveLength(1);
  });

  it('a new video replaces the old one in storage; removing it leaves none', async () => {
    const second = webm(120_000);
    const r = await put(producer, 'video/webm', second);
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.proxyVideo).toMatchObject({ type: 'video/webm', sha256: sha(second) });
    expect(await storedProxies()).toHaveLength(1);
    const got = await producer.get(`${base}/takes/${takeId}/proxy-video`).buffer(true).expect(200);
    expect(got.headers['content-type']).toBe('video/webm');
    expect(sha(got.body as Buffer)).toBe(sha(second));
    const gone = await producer.send('delete', `${base}/takes/${takeId}/proxy-video`);
    expect(gone.status).toBe(200);
    expect(gone.body.proxyVideo).toBeNull();
    expect(await storedProxies()).toEqual([]);
    expect((await producer.get(`${base}/takes/${takeId}/proxy-video`)).status).toBe(404);
    const audit = await t.tdb.pool.query<{ action: string }>(
      "SELECT action FROM audit_events WHERE subject_id = $1 AND action LIKE 'take.proxy_video%' ORDER BY id",
      [takeId],
    );
    expect(audit.rows.map((a) => a.action)).toEqual([
      'take.proxy_video_set',
      'take.proxy_video_set',
      'take.proxy_video_removed',
    ]);
  });

  it('lets only producers upload, and keeps it from roles that do not read tracks', async () => {
    expect((await put(engineer, 'video/mp4', mp4(1000))).status).toBe(403);
    expect((await operator.get(`${base}/takes/${takeId}/proxy-video`)).status).toBe(403);
  });
});
