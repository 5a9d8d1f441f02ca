/** An error with an HTTP status that the error middleware turns into `{ error, issues? }`. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly issues?: { path: string; message: string }[],
  ) {
    super(message);
  }
}

export const notFound = (what = 'Not found.') => new HttpError(404, what);
export const forbidden = (what = 'Your role in this studio does not allow that.') => new HttpError(403, what);
export const badRequest = (what: string, issues?: { path: string; message: string }[]) =>
  new HttpError(400, what, issues);
