// @vitest-environment jsdom
// The fetch wrapper against the API contract: JSON both ways, same-origin credentials, the CSRF
// header on every non-GET, and errors shaped `{ error, issues? }` with their HTTP status.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ApiRequestError, api } from '../../../src/lib/api-client';
import { fakeApi, json } from './harness';

afterEach(() => {
  vi.unstubAllGlobals();
});

async function caught(promise: Promise<unknown>): Promise<ApiRequestError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof ApiRequestError) return error;
    throw error;
  }
  throw new Error('expected the call to fail');
}

describe('api client', () => {
  it('carries the status, message and issues of an error answer', async () => {
    fakeApi({
      'POST /api/things': () =>
        json({ error: 'Bad thing.', issues: [{ path: 'name', message: 'too long' }] }, 400),
    });
    const error = await caught(api.post('/api/things', { name: 'x' }, null));
    expect(error.status).toBe(400);
    expect(error.message).toBe('Bad thing.');
    expect(error.issues).toEqual([{ path: 'name', message: 'too long' }]);
  });

  it('names the status and the call when the error answer is not JSON (a proxy page)', async () => {
    fakeApi({
      'GET /api/things': () =>
        new Response('<html>Bad Gateway</html>', { status: 502, statusText: 'Bad Gateway' }),
    });
    const error = await caught(api.get('/api/things', z.unknown()));
    // RFC 9110 section 15.6.3: 502 Bad Gateway.
    expect(error.status).toBe(502);
    expect(error.message).toBe('The server answered 502 Bad Gateway to GET /api/things.');
  });

  it('says the server could not be reached when fetch itself fails', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => {
        throw new TypeError('Failed to fetch');
      }),
    );
    const error = await caught(api.get('/api/things', z.unknown()));
    expect(error.status).toBe(0);
    expect(error.message).toContain('Could not reach the Legwork server (GET /api/things)');
  });

  it('rejects an answer that does not match the expected shape, naming the field', async () => {
    fakeApi({ 'GET /api/things': () => json({ count: 'three' }) });
    const error = await caught(api.get('/api/things', z.object({ count: z.number() })));
    expect(error.message).toMatch(/^The server's answer to GET \/api\/things was not understood \(count: /);
  });

  it('sends the CSRF header on POST, PATCH and DELETE and never on GET', async () => {
    const { calls, csrfIssued } = fakeApi({
      'GET /api/things': () => json({}),
      'POST /api/things': () => json({}),
      'PATCH /api/things/1': () => json({}),
      'DELETE /api/things/1': () => new Response(null, { status: 204 }),
    });
    await api.get('/api/things', z.object({}));
    await api.post('/api/things', {}, z.object({}));
    await api.patch('/api/things/1', {}, z.object({}));
    await api.delete('/api/things/1');
    const byMethod = Object.fromEntries(
      calls.filter((call) => call.path.startsWith('/api/things')).map((call) => [call.method, call]),
    );
    expect(byMethod.GET?.headers['x-csrf-token']).toBeUndefined();
    for (const method of ['POST', 'PATCH', 'DELETE']) {
      expect(byMethod[method]?.headers['x-csrf-token']).toBe(csrfIssued[0]);
      expect(byMethod[method]?.credentials).toBe('same-origin');
    }
    // One token serves every call until the session changes.
    expect(csrfIssued).toHaveLength(1);
  });

  it('fetches a fresh token and retries once when the server calls the token stale', async () => {
    let attempts = 0;
    const { calls, csrfIssued } = fakeApi({
      'POST /api/things': (call) => {
        attempts += 1;
        return call.headers['x-csrf-token'] === csrfIssued[csrfIssued.length - 1] && attempts > 1
          ? json({ ok: true })
          : json({ error: 'Missing or wrong CSRF token.' }, 403);
      },
    });
    await expect(api.post('/api/things', {}, z.object({ ok: z.boolean() }))).resolves.toEqual({ ok: true });
    expect(attempts).toBe(2);
    expect(csrfIssued).toHaveLength(2);
    expect(
      calls.filter((call) => call.method === 'POST').map((call) => call.headers['x-csrf-token']),
    ).toEqual(csrfIssued);
  });

  it('does not retry a 403 that is about permissions, not the token', async () => {
    const { calls } = fakeApi({
      'POST /api/things': () => json({ error: 'Only a studio admin may do this.' }, 403),
    });
    const error = await caught(api.post('/api/things', {}, null));
    expect(error.status).toBe(403);
    expect(calls.filter((call) => call.method === 'POST')).toHaveLength(1);
  });

  it('puts defined query values in the address and leaves undefined ones out', async () => {
    const { calls } = fakeApi({ 'GET /api/things': () => json({}) });
    await api.get('/api/things', z.object({}), { before: undefined, limit: 50 });
    expect(calls[0]?.search).toBe('?limit=50');
  });
});
