// The one way the browser talks to /api: JSON both ways, the session cookie, the CSRF header on
// every state-changing call, and one error type that carries the server's message and field issues.
import { z } from 'zod';
import { apiErrorSchema } from '../../shared/schemas/api';

export interface FieldIssue {
  path: string;
  message: string;
}

/** An answer from the API that was not a success, or a call that never got an answer (status 0). */
export class ApiRequestError extends Error {
  readonly status: number;
  readonly issues: FieldIssue[];

  constructor(status: number, message: string, issues: FieldIssue[] = []) {
    super(message);
    this.name = 'ApiRequestError';
    this.status = status;
    this.issues = issues;
  }
}

/** True when the error says the session is missing or expired. */
export function isUnauthorized(error: unknown): boolean {
  return error instanceof ApiRequestError && error.status === 401;
}

/** The text to show a person for any error thrown by a call. */
export function errorMessage(error: unknown): string {
  if (error instanceof Error && error.message) return error.message;
  return 'Something went wrong.';
}

const csrfResponse = z.object({ csrfToken: z.string().min(1) });

let csrfToken: string | null = null;
let csrfPending: Promise<string> | null = null;

/** Fetches a fresh CSRF token; call after load and after the session changes (sign-in, sign-out). */
export function refreshCsrfToken(): Promise<string> {
  csrfPending = request('GET', '/api/auth/csrf', csrfResponse)
    .then((answer) => {
      csrfToken = answer.csrfToken;
      return answer.csrfToken;
    })
    .finally(() => {
      csrfPending = null;
    });
  return csrfPending;
}

/** Forgets the held CSRF token, so the next state-changing call fetches one first. */
export function forgetCsrfToken(): void {
  csrfToken = null;
}

async function currentCsrfToken(): Promise<string> {
  if (csrfToken) return csrfToken;
  return csrfPending ?? refreshCsrfToken();
}

type Method = 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';

export type Query = Record<string, string | number | undefined>;

function withQuery(path: string, query: Query | undefined): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined) params.set(key, String(value));
  }
  const text = params.toString();
  return text ? `${path}?${text}` : path;
}

async function errorFromResponse(method: Method, path: string, response: Response): Promise<ApiRequestError> {
  let body: unknown = null;
  try {
    body = await response.json();
  } catch {
    // Not JSON (a proxy page, an empty body): fall through to a message built from the status.
  }
  const parsed = apiErrorSchema.safeParse(body);
  if (parsed.success)
    return new ApiRequestError(response.status, parsed.data.error, parsed.data.issues ?? []);
  const reason = response.statusText ? ` ${response.statusText}` : '';
  return new ApiRequestError(
    response.status,
    `The server answered ${response.status}${reason} to ${method} ${path}.`,
  );
}

async function request<T>(
  method: Method,
  path: string,
  schema: z.ZodType<T> | null,
  body?: unknown,
  retried = false,
): Promise<T> {
  const headers: Record<string, string> = { accept: 'application/json' };
  if (body !== undefined) headers['content-type'] = 'application/json';
  if (method !== 'GET') headers['x-csrf-token'] = await currentCsrfToken();

  let response: Response;
  try {
    response = await fetch(path, {
      method,
      headers,
      credentials: 'same-origin',
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch (cause) {
    throw new ApiRequestError(
      0,
      `Could not reach the Legwork server (${method} ${path}): ${errorMessage(cause)}`,
    );
  }

  if (!response.ok) {
    const error = await errorFromResponse(method, path, response);
    // A session that was renewed on the server makes the held token stale; fetch a new one once.
    if (method !== 'GET' && response.status === 403 && /csrf/i.test(error.message) && !retried) {
      await refreshCsrfToken();
      return request(method, path, schema, body, true);
    }
    throw error;
  }

  if (schema === null || response.status === 204) return undefined as T;

  let json: unknown;
  try {
    json = await response.json();
  } catch {
    throw new ApiRequestError(response.status, `The server's answer to ${method} ${path} was not JSON.`);
  }
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    const first = parsed.error.issues[0];
    const where = first ? `${first.path.join('.') || '(root)'}: ${first.message}` : 'unknown shape';
    throw new ApiRequestError(
      response.status,
      `The server's answer to ${method} ${path} was not understood (${where}).`,
    );
  }
  return parsed.data;
}

/** Typed calls to the JSON API; pass a zod schema to check the answer, or null when none is expected. */
export const api = {
  get: <T>(path: string, schema: z.ZodType<T>, query?: Query) =>
    request('GET', withQuery(path, query), schema),
  post: <T>(path: string, body: unknown, schema: z.ZodType<T> | null) => request('POST', path, schema, body),
  patch: <T>(path: string, body: unknown, schema: z.ZodType<T>) => request('PATCH', path, schema, body),
  put: <T>(path: string, body: unknown, schema: z.ZodType<T>) => request('PUT', path, schema, body),
  delete: (path: string) => request<void>('DELETE', path, null),
};
