import { apiErrorSchema } from '../../../../shared/schemas/api';
import { ApiRequestError, errorMessage, refreshCsrfToken } from '../../../lib/api-client';

// The shared API client has no PUT; this is the same contract (cookie, CSRF header, JSON both ways,
// `{ error, issues }` on failure) for the venue calls that need it.
/** Sends `body` as JSON with PUT and returns the parsed answer; failures throw ApiRequestError with the server's issues. */
export async function putJson(path: string, body: unknown): Promise<unknown> {
  const csrfToken = await refreshCsrfToken();
  let response: Response;
  try {
    response = await fetch(path, {
      method: 'PUT',
      credentials: 'same-origin',
      headers: { accept: 'application/json', 'content-type': 'application/json', 'x-csrf-token': csrfToken },
      body: JSON.stringify(body),
    });
  } catch (cause) {
    throw new ApiRequestError(0, `Could not reach the Legwork server (PUT ${path}): ${errorMessage(cause)}`);
  }
  let json: unknown = null;
  try {
    json = await response.json();
  } catch {
    // An empty or non-JSON body is reported from the status below.
  }
  if (!response.ok) {
    const parsed = apiErrorSchema.safeParse(json);
    if (parsed.success)
      throw new ApiRequestError(response.status, parsed.data.error, parsed.data.issues ?? []);
    throw new ApiRequestError(response.status, `The server answered ${response.status} to PUT ${path}.`);
  }
  return json;
}
