// Test harness for client components: a fake /api answered from a table of handlers, and renderers
// that wrap a component in the same query client and a memory router.
import { QueryClientProvider } from '@tanstack/react-query';
import { render } from '@testing-library/react';
import type { ReactElement } from 'react';
import { RouterProvider, createMemoryRouter } from 'react-router-dom';
import type { RouteObject } from 'react-router-dom';
import { vi } from 'vitest';
import { createQueryClient } from '../../../src/app/providers';
import { forgetCsrfToken } from '../../../src/lib/api-client';
import type { Venue } from '../../../shared/schemas/api';

export interface RecordedCall {
  method: string;
  path: string;
  search: string;
  headers: Record<string, string>;
  credentials: RequestCredentials | undefined;
  body: unknown;
}

export type Handler = (call: RecordedCall) => Response | Promise<Response>;

/** A JSON answer with the given status. */
export function json(body: unknown, status = 200): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });
}

/** An empty answer (204 No Content unless told). */
export function empty(status = 204): Response {
  return new Response(null, { status });
}

let csrfCounter = 0;

/**
 * Replaces fetch with a table of handlers keyed "METHOD /path" (path without the query). The CSRF
 * endpoint answers a new token each time unless the table overrides it; an unknown route is a 404.
 */
export function fakeApi(handlers: Record<string, Handler>) {
  const calls: RecordedCall[] = [];
  const csrfIssued: string[] = [];
  forgetCsrfToken();
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const url = new URL(String(input), 'http://legwork.test');
    const headers: Record<string, string> = {};
    for (const [key, value] of Object.entries((init.headers ?? {}) as Record<string, string>)) {
      headers[key.toLowerCase()] = value;
    }
    const call: RecordedCall = {
      method: init.method ?? 'GET',
      path: url.pathname,
      search: url.search,
      headers,
      credentials: init.credentials,
      body: typeof init.body === 'string' ? JSON.parse(init.body) : undefined,
    };
    calls.push(call);
    const handler = handlers[`${call.method} ${call.path}`];
    if (handler) return handler(call);
    if (call.method === 'GET' && call.path === '/api/auth/csrf') {
      csrfCounter += 1;
      csrfIssued.push(`token-${csrfCounter}`);
      return json({ csrfToken: `token-${csrfCounter}` });
    }
    return json({ error: `No fake for ${call.method} ${call.path}` }, 404);
  });
  vi.stubGlobal('fetch', fetchMock);
  return { calls, csrfIssued, fetchMock };
}

/** Renders one element inside the app's providers at `path`. */
export function renderWithApp(element: ReactElement, path = '/') {
  return renderRoutes([{ path: '*', element }], path);
}

/** Renders a route table inside the app's providers, starting at `path`. */
export function renderRoutes(routes: RouteObject[], path: string) {
  const queryClient = createQueryClient();
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  const view = render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return { ...view, router, queryClient };
}

/** Ids of the demo studio and its two venues as the fake API answers them. */
export const FAKE_IDS = {
  studio: 'a3c1e7b2-5d4f-4e8a-9b6c-1d2e3f4a5b6c',
  dome: 'e7a5c1f6-9b8d-4c2e-8f0a-5b6c7d8e9f0a',
  arcade: 'f8b6d2a7-0c9e-4d3f-9a1b-6c7d8e9f0a1b',
} as const;

/** GET /api/studios/:id/venues as the fake API answers it: the demo studio's two venues. */
export const FAKE_VENUES: Venue[] = [
  {
    id: FAKE_IDS.dome,
    name: 'Harbour Lights Dome',
    site: 'Port Meridian pier',
    timeZone: 'Europe/Lisbon',
    baseKind: 'hexapod',
    controllerRate_hz: 100,
    seatCount: 4,
  },
  {
    id: FAKE_IDS.arcade,
    name: 'Tidewater Arcade',
    site: 'Saltmarsh boardwalk',
    timeZone: 'America/Halifax',
    baseKind: 'planar3',
    controllerRate_hz: 100,
    seatCount: 2,
  },
];
