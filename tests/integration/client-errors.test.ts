// Every client error is a 4xx with a clear message, never a 500, and a refused request stores nothing:
// malformed percent-encoding in the address (RFC 3986 section 2.1: "%" followed by two hex digits, and
// the octets must be UTF-8 here, RFC 3629), charsets other than UTF-8 (RFC 8259 section 8.1: JSON
// exchanged between systems MUST be UTF-8), unknown or mismatched Content-Encodings (RFC 9110 section
// 8.4), bytes that are not the UTF-8 they claim to be, NUL and lone surrogates in any text field (not
// storable in PostgreSQL's text and jsonb; a lone surrogate is not a Unicode scalar value, Unicode
// section 3.9 D76), and an empty venue settings body. The server's log must hold no error line for any
// of them (a 500 is logged; these are not server faults).
import { gzipSync } from 'node:zlib';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count, sql } from 'drizzle-orm';
import { errorForLog, errorText } from '../../server/lib/error-text';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { auditEvents, tracks, venueSettings } from '../../server/db/schema';

let t: TestApp;
let producer: Client;
let engineer: Client;
let admin: Client;
let reviewer: Client;
const logs: string[] = [];
let s = '';

beforeAll(async () => {
  t = await startTestApp({ log: (m) => logs.push(m) });
  s = `/api/studios/${t.seed.studioId}`;
  producer = new Client(t.app);
  engineer = new Client(t.app);
  admin = new Client(t.app);
  reviewer = new Client(t.app);
  await producer.signIn('pia.producer@lanternfish.example');
  await engineer.signIn('eli.engineer@lanternfish.example');
  await admin.signIn('ada.admin@lanternfish.example');
  await reviewer.signIn('rosa.reviewer@lanternfish.example');
});
afterAll(async () => t.close());

/** What is stored that a refused request could have changed. */
async function stored() {
  const [tr] = await t.tdb.db.select({ n: count() }).from(tracks);
  const [au] = await t.tdb.db.select({ n: count() }).from(auditEvents);
  const settings = await t.tdb.db.select().from(venueSettings);
  return { tracks: tr!.n, audit: au!.n, settings };
}

/** Raw bytes as the body, sent as they are (supertest would otherwise serialise a Buffer as JSON). */
const asIs = (x: unknown) => x as string;

function errorOf(r: { body: unknown }): string {
  return String((r.body as { error?: unknown }).error ?? '');
}

describe('client errors answer 4xx with what was wrong', () => {
  it('malformed percent-encoding in the address is 400, at the studio and at a resource id', async () => {
    for (const path of [`/api/studios/%E0%A4%A/tracks`, `${s}/tracks/%ZZ`, `${s}/venues/%ED%A0%80`]) {
      const r = await producer.get(path);
      expect(r.status, path).toBe(400);
      expect(errorOf(r), path).toMatch(/malformed percent-encoding in "%/);
    }
    // In the query too: an escape of a lone surrogate and one that is no escape at all.
    for (const path of [`${s}/tracks?q=%ED%A0%80`, `${s}/tracks?q=%ZZ`, `${s}/tracks?%E0=1`]) {
      const r = await producer.get(path);
      expect(r.status, path).toBe(400);
      expect(errorOf(r), path).toMatch(/malformed percent-encoding in the query, in "/);
    }
    // A well-formed escape and a plus for a space are read as usual.
    expect((await producer.get(`${s}/tracks?q=caf%C3%A9+run`)).status).toBe(200);
  });

  it('a JSON body in another charset than UTF-8 is 415 naming the charset', async () => {
    for (const charset of ['latin1', 'utf-16', 'utf-7', 'utf-32le']) {
      const r = await producer
        .raw('post', `${s}/tracks`)
        .set('content-type', `application/json; charset=${charset}`)
        .send('{"title":"Charset Track"}');
      expect(r.status, charset).toBe(415);
      expect(errorOf(r).toLowerCase(), charset).toContain(`charset "${charset}" is not supported`);
    }
    // utf-8 spelled in capitals is still UTF-8.
    const ok = await producer
      .raw('post', `${s}/tracks`)
      .set('content-type', 'application/json; charset=UTF-8')
      .send('{"title":"Capital Charset"}');
    expect(ok.status).toBe(201);
  });

  it('an unknown Content-Encoding is 415; a body that is not the gzip it claims is 400; real gzip works', async () => {
    let r = await producer
      .raw('post', `${s}/tracks`)
      .set('content-type', 'application/json')
      .set('content-encoding', 'compress')
      .send('{"title":"x"}');
    expect(r.status).toBe(415);
    expect(errorOf(r)).toContain('Content-Encoding "compress" is not supported');

    r = await producer
      .raw('post', `${s}/tracks`)
      .set('content-type', 'application/json')
      .set('content-encoding', 'gzip')
      .send('{"title":"Not Gzip"}');
    expect(r.status).toBe(400);
    expect(errorOf(r)).toMatch(/does not decode as its Content-Encoding/);

    r = await producer
      .raw('post', `${s}/tracks`)
      .set('content-type', 'application/json')
      .set('content-encoding', 'gzip')
      .serialize(asIs)
      .send(gzipSync('{"title":"Gzipped Track"}'));
    expect(r.status).toBe(201);
    expect((r.body as { title: string }).title).toBe('Gzipped Track');
  });

  it('bytes that are not valid UTF-8 are 400, never stored with replacement characters', async () => {
    const before = await stored();
    // {"title":"<FF FE>"}: 0xFF and 0xFE never occur in UTF-8 (RFC 3629 section 1).
    const body = Buffer.concat([Buffer.from('{"title":"'), Buffer.from([0xff, 0xfe]), Buffer.from('"}')]);
    const r = await producer
      .raw('post', `${s}/tracks`)
      .set('content-type', 'application/json')
      .serialize(asIs)
      .send(body);
    expect(r.status).toBe(400);
    expect(errorOf(r)).toBe('The request body is declared as UTF-8 but is not valid UTF-8.');
    expect(await stored()).toEqual(before);
  });

  it('NUL and lone surrogates are 400 naming the field, in bodies, nested keys and queries, and nothing is stored', async () => {
    const [track] = await t.tdb.db
      .insert(tracks)
      .values({ studioId: t.seed.studioId, title: 'Upload Target' })
      .returning();
    const before = await stored();
    const dome = t.seed.venueIds.dome;
    const someRun = '00000000-0000-4000-8000-000000000000';
    const cases: { who: Client; method: 'post' | 'put'; path: string; json: string; field: string }[] = [
      { who: producer, method: 'post', path: `${s}/tracks`, json: '{"title":"a\\u0000b"}', field: 'title' },
      { who: producer, method: 'post', path: `${s}/tracks`, json: '{"title":"a\\ud800b"}', field: 'title' },
      {
        who: producer,
        method: 'post',
        path: `${s}/tracks`,
        json: '{"title":"ok","film":"\\udc00"}',
        field: 'film',
      },
      {
        who: engineer,
        method: 'put',
        path: `${s}/venues/${dome}/base`,
        json: '{"base":{"kind":"hexapod","park":"x\\u0000"}}',
        field: 'base.park',
      },
      {
        who: engineer,
        method: 'put',
        path: `${s}/venues/${dome}/base`,
        json: '{"base":{"seats_m":[[0,0,1]],"x\\u0000":1}}',
        field: 'base key "x\\u0000"',
      },
      {
        who: engineer,
        method: 'post',
        path: `${s}/profiles`,
        json: '{"kind":"cueing","name":"Soft\\ud83d","params":{}}',
        field: 'name',
      },
      {
        who: admin,
        method: 'post',
        path: `${s}/venues`,
        json: '{"name":"Pier","site":"\\u0000","base":{}}',
        field: 'site',
      },
      { who: admin, method: 'post', path: `${s}/tokens`, json: '{"name":"farm\\u0000"}', field: 'name' },
      {
        who: reviewer,
        method: 'post',
        path: `${s}/runs/${someRun}/review`,
        json: '{"decision":"hold","reason":"\\ud800"}',
        field: 'reason',
      },
    ];
    for (const c of cases) {
      const r = await c.who.raw(c.method, c.path).set('content-type', 'application/json').send(c.json);
      expect(r.status, c.json).toBe(400);
      expect(errorOf(r), c.json).toContain(`cannot be stored: ${c.field}: must not contain`);
      expect((r.body as { issues?: { path: string }[] }).issues?.[0]?.path, c.json).toBe(c.field);
    }
    // Queries: the tracks search, the audit filter and the upload's file name.
    for (const [who, path, field] of [
      [producer, `${s}/tracks?q=a%00b`, 'q'],
      [reviewer, `${s}/audit?person=rosa%00`, 'person'],
    ] as const) {
      const r = await who.get(path);
      expect(r.status, path).toBe(400);
      expect(errorOf(r), path).toContain(
        `The request query cannot be stored: query ${field}: must not contain`,
      );
    }
    const up = await producer
      .raw('post', `${s}/tracks/${track!.id}/takes?fileName=take%00.csv`)
      .set('content-type', 'text/csv')
      .send('time_s,x_m\n0,0\n');
    expect(up.status).toBe(400);
    expect(errorOf(up)).toContain('query fileName: must not contain the NUL character');
    expect(await stored()).toEqual(before);
  });

  it('an empty venue settings body is 400 naming the fields, and the settings stay as they were', async () => {
    const before = await stored();
    const r = await engineer.send('put', `${s}/venues/${t.seed.venueIds.dome}/settings`, {});
    expect(r.status).toBe(400);
    expect(errorOf(r)).toContain('give cueingVersionId or budgetVersionId');
    expect(await stored()).toEqual(before);
  });

  it('a member who may write no profile is refused (403) before the body is read', async () => {
    const r = await producer.raw('post', `${s}/profiles`).set('content-type', 'application/json').send('{}');
    expect(r.status).toBe(403);
  });

  it('logged no server error for any of these', () => {
    expect(logs.filter((l) => l.startsWith('error'))).toEqual([]);
  });
});

describe('failed queries in the log', () => {
  it('name the SQL and the database reason, never the bound parameters', async () => {
    const secret = '$argon2id$v=19$m=65536,t=3,p=4$c2VjcmV0$secret-hash-value';
    let caught: unknown;
    try {
      // A value PostgreSQL refuses as a uuid: the query fails with the secret as its parameter.
      await t.tdb.db.execute(sql`select ${secret}::uuid`);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(Error);
    // drizzle's own message carries the parameter; that is what must not reach the log.
    expect((caught as Error).message).toContain('secret-hash-value');
    const logged = errorForLog(caught);
    const stored = errorText(caught);
    for (const text of [logged, stored]) {
      expect(text).toContain('Failed query: select $1::uuid');
      expect(text).toMatch(/invalid input syntax for type uuid/);
      expect(text).toContain('SQLSTATE 22P02'); // invalid_text_representation (PostgreSQL Appendix A)
      expect(text).not.toContain('params');
      expect(text).not.toContain('secret-hash-value');
      expect(text).not.toContain('argon2');
    }
  });
});

describe('security headers', () => {
  // Header meanings: W3C Content Security Policy Level 3; RFC 6797 (HSTS); WHATWG Fetch (nosniff).
  it('a CSP allowing only this origin, nothing inline, no framing; no HSTS over plain HTTP', async () => {
    const r = await producer.get('/api/health');
    const csp = String(r.headers['content-security-policy']);
    for (const d of [
      "default-src 'self'",
      "script-src 'self'",
      "object-src 'none'",
      "frame-ancestors 'none'",
    ]) {
      expect(csp).toContain(d);
    }
    expect(csp).not.toContain('unsafe-inline');
    expect(csp).not.toContain('unsafe-eval');
    expect(csp).not.toContain('upgrade-insecure-requests');
    expect(r.headers['x-content-type-options']).toBe('nosniff');
    expect(r.headers['strict-transport-security']).toBeUndefined();
  });

  it('behind HTTPS (COOKIE_SECURE=true) adds HSTS and upgrade-insecure-requests', async () => {
    const secure = await startTestApp({ env: { COOKIE_SECURE: 'true' } });
    try {
      const r = await request(secure.app).get('/api/health');
      expect(String(r.headers['strict-transport-security'])).toMatch(/max-age=\d+/);
      expect(String(r.headers['content-security-policy'])).toContain('upgrade-insecure-requests');
    } finally {
      await secure.close();
    }
  });
});
