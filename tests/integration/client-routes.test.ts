// The client fallback of createApp: every client route, '/' included, loads the app's page, while
// unknown API paths stay JSON 404s. Express 5 matches paths with path-to-regexp 8, where '/*splat'
// needs at least one segment (expressjs.com/en/guide/migrating-5.html, "Path route matching syntax").
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startTestApp } from './support/app';
import type { TestApp } from './support/app';

const dir = mkdtempSync(join(tmpdir(), 'legwork-static-'));
const PAGE = '<!doctype html><html><body><div id="root"></div></body></html>';
let t: TestApp;
beforeAll(async () => {
  writeFileSync(join(dir, 'index.html'), PAGE);
  writeFileSync(join(dir, 'app.js'), 'console.log(1);');
  t = await startTestApp({ env: { STATIC_DIR: dir } });
});
afterAll(async () => {
  await t.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('client routes', () => {
  for (const path of [
    '/',
    '/sign-in',
    '/s/00000000-0000-4000-8000-000000000000/tracks?state=failed',
    '/mailbox/',
    '/account',
    '/s/00000000-0000-4000-8000-000000000000/releases?state=ready',
    '/s/00000000-0000-4000-8000-000000000000/releases/00000000-0000-4000-8000-000000000001',
    '/s/00000000-0000-4000-8000-000000000000/runs/00000000-0000-4000-8000-000000000002',
  ]) {
    it(`serves the app's page at ${path}`, async () => {
      const res = await request(t.app).get(path);
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toMatch(/^text\/html/);
      expect(res.text).toBe(PAGE);
    });
  }

  it('serves built files as themselves and keeps API misses as JSON 404s', async () => {
    const js = await request(t.app).get('/app.js');
    expect(js.status).toBe(200);
    expect(js.text).toBe('console.log(1);');
    const api = await request(t.app).get('/api/no-such-route');
    expect(api.status).toBe(404);
    expect(api.body.error).toMatch(/No API route GET \/api\/no-such-route/);
  });
});
