// Upload edges against the real services: a refused upload leaves the keep-alive connection usable,
// the same bytes again are flagged, and bodies that inflate without bound are refused quickly.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { Readable } from 'node:stream';
import { createGzip } from 'node:zlib';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { makeVehicleCsv } from '../factories/takes';
import { uploadedTakeSchema } from '../../shared/schemas/pipeline';

let t: TestApp;
let producer: Client;
let server: http.Server;
let port = 0;
beforeAll(async () => {
  t = await startTestApp({ env: { LOGIN_RATE_LIMIT: '1000' } });
  producer = new Client(t.app);
  await producer.signIn('pia.producer@lanternfish.example');
  server = http.createServer(t.app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  port = (server.address() as AddressInfo).port;
}, 60_000);
afterAll(async () => {
  await new Promise((r) => server.close(r));
  await t.close();
});

const base = () => `/api/studios/${t.seed.studioId}`;
const newTrack = async (title: string) =>
  (await producer.send('post', `${base()}/tracks`, { title })).body as { id: string };

describe('uploads', () => {
  it('a refused upload does not hold up the next request on the same keep-alive connection', async () => {
    const track = await newTrack('Stuck Socket');
    // A bad first data row, then 8 MiB more that the server no longer needs.
    const body = Buffer.concat([Buffer.from('time_s,fx_mps2\nx\n'), Buffer.alloc(8 << 20, 0x30)]);
    const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
    // Pushed with an API token so the raw http client needs no session.
    const admin = new Client(t.app);
    await admin.signIn('ada.admin@lanternfish.example');
    const token = (await admin.send('post', `${base()}/tokens`, { name: 'socket test' })).body
      .token as string;
    const send = (method: string, path: string, data?: Buffer) =>
      new Promise<{ status: number; ms: number }>((resolve, reject) => {
        const t0 = Date.now();
        const req = http.request(
          {
            host: '127.0.0.1',
            port,
            method,
            path,
            agent,
            headers: {
              authorization: `Bearer ${token}`,
              'content-type': 'application/octet-stream',
              ...(data ? { 'content-length': String(data.length) } : {}),
            },
          },
          (res) => {
            res.resume();
            res.on('end', () => resolve({ status: res.statusCode ?? 0, ms: Date.now() - t0 }));
          },
        );
        // A stuck connection answers only when the server gives up on it (about 6 s here): 3 s is a
        // stall. A timer from the start, not the socket's idle timeout: a request queued behind a
        // stuck connection has no socket yet.
        const timer = setTimeout(
          () => req.destroy(new Error(`${method} ${path}: no answer within 3 s: the connection is stuck`)),
          3_000,
        );
        req.on('close', () => clearTimeout(timer));
        req.on('error', reject);
        req.end(data);
      });
    const refused = await send('POST', `${base()}/tracks/${track.id}/takes?fileName=bad.csv`, body);
    expect(refused.status).toBe(400);
    // Any answer will do: health says 503 here because this app runs without the job queue. A stuck
    // connection gives none (the 3 s timeout fails the test).
    const next = await send('GET', '/api/health');
    expect([200, 503]).toContain(next.status);
    console.log(`refused upload ${refused.ms} ms, next request ${next.ms} ms`);
    agent.destroy();
  });

  it('the same file again becomes a new take and the answer names the earlier one', async () => {
    const track = await newTrack('Twice Told');
    const csv = Buffer.from(makeVehicleCsv({ duration_s: 2 }));
    const up = (name: string) =>
      producer
        .raw('post', `${base()}/tracks/${track.id}/takes?fileName=${name}`)
        .set('content-type', 'application/octet-stream')
        .send(csv);
    const first = uploadedTakeSchema.parse((await up('a.csv')).body);
    expect(first.duplicateOf).toBeNull();
    const second = uploadedTakeSchema.parse((await up('b.csv')).body);
    expect(second.number).toBe(2);
    expect(second.duplicateOf).toEqual({ id: first.id, number: 1 });
  });

  it('refuses a gzip of a gigabyte of newlines and a gzip of one 32 MiB line, clearly', async () => {
    const track = await newTrack('Bottomless');
    const gz = async (fill: number, total: number) => {
      const chunks: Buffer[] = [];
      const block = Buffer.alloc(1 << 20, fill);
      const src = Readable.from(
        (function* () {
          yield Buffer.from('time_s,fx_mps2,fy_mps2,fz_mps2,wx_radps,wy_radps,wz_radps\n');
          for (let s = 0; s < total; s += block.length) yield block;
        })(),
      ).pipe(createGzip());
      for await (const c of src) chunks.push(c as Buffer);
      return Buffer.concat(chunks);
    };
    for (const [fill, total, pattern] of [
      [0x0a, 1 << 30, /too many blank lines/],
      [0x37, 32 << 20, /line too long/],
    ] as const) {
      const body = await gz(fill, total);
      const r = await producer
        .raw('post', `${base()}/tracks/${track.id}/takes?fileName=big.csv.gz`)
        .set('content-type', 'application/octet-stream')
        .send(body);
      expect([400, 413]).toContain(r.status);
      expect(r.body.error).toMatch(pattern);
    }
    const detail = await producer.get(`${base()}/tracks/${track.id}`).expect(200);
    expect(detail.body.takes).toEqual([]);
  });
});
