import type { ReactNode } from 'react';

/**
 * A section folded away until asked for (a native <details>, closed unless `open`): the run page keeps
 * the decision and the charts first and the reference material (spectra, tables, hashes) one click away.
 */
export function Fold({
  title,
  aside,
  children,
  open = false,
  testId,
}: {
  title: string;
  aside?: ReactNode;
  children: ReactNode;
  open?: boolean;
  testId?: string;
}) {
  return (
    <details
      className="group rounded border border-ink-200 bg-white [&[open]>summary]:border-b [&[open]>summary]:border-ink-100"
      open={open}
      data-testid={testId}
    >
      <summary className="flex cursor-pointer list-none items-baseline justify-between gap-3 px-4 py-3 [&::-webkit-details-marker]:hidden">
        <span className="flex items-baseline gap-2">
          <span
            aria-hidden="true"
            className="inline-block w-3 text-ink-600 transition-transform group-open:rotate-90"
          >
            ▸
          </span>
          <span className="text-base font-semibold text-ink-900">{title}</span>
        </span>
        {aside}
      </summary>
      <div className="flex flex-col gap-3 p-4">{children}</div>
    </details>
  );
}
