import type { ReactNode } from 'react';
import { errorMessage } from '../../lib/api-client';

/** A quiet line shown while data loads. */
export function Loading({ what = 'Loading' }: { what?: string }) {
  return (
    <p role="status" className="py-3 text-sm text-ink-400">
      {what}…
    </p>
  );
}

/** The API's error text in a red box; `retry` offers to try again. */
export function ErrorNotice({ error, retry }: { error: unknown; retry?: () => void }) {
  return (
    <div
      role="alert"
      className="flex items-start justify-between gap-3 rounded border border-stop-500 bg-white px-3 py-2 text-sm text-stop-700"
    >
      <span>{errorMessage(error)}</span>
      {retry ? (
        <button type="button" onClick={retry} className="shrink-0 text-xs font-medium underline">
          Try again
        </button>
      ) : null}
    </div>
  );
}

/** A confirmation line after an action went through. */
export function Notice({ children }: { children: ReactNode }) {
  return (
    <p
      role="status"
      className="rounded border border-tealdeep-500 bg-white px-3 py-2 text-sm text-tealdeep-700"
    >
      {children}
    </p>
  );
}

/** The line shown where a list has nothing in it. */
export function Empty({ children }: { children: ReactNode }) {
  return <p className="py-3 text-sm text-ink-400">{children}</p>;
}
