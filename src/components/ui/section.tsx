import type { ReactNode } from 'react';

/** A titled block on a page; `testId` lets browser tests find it. */
export function Section({
  title,
  aside,
  children,
  testId,
}: {
  title: string;
  aside?: ReactNode;
  children: ReactNode;
  testId?: string;
}) {
  return (
    <section data-testid={testId} className="flex flex-col gap-3 rounded border border-ink-200 bg-white p-4">
      <div className="flex items-baseline justify-between gap-3">
        <h2 className="text-base font-semibold text-ink-900">{title}</h2>
        {aside}
      </div>
      {children}
    </section>
  );
}

/** A number with its label, for the counts on home screens. */
export function Stat({
  label,
  value,
  tone = 'plain',
}: {
  label: string;
  value: number;
  tone?: 'plain' | 'hold';
}) {
  return (
    <div className="flex min-w-32 flex-col rounded border border-ink-100 bg-ink-50 px-3 py-2">
      <span className="text-xs text-ink-600">{label}</span>
      <span
        className={`font-mono text-2xl ${tone === 'hold' && value > 0 ? 'text-lane-700' : 'text-ink-900'}`}
      >
        {value}
      </span>
    </div>
  );
}

/** The page's main heading with an optional line under it. */
export function PageHeading({ title, subtitle }: { title: string; subtitle?: ReactNode }) {
  return (
    <header className="flex flex-col gap-0.5">
      <h1 className="text-xl font-semibold tracking-tight text-ink-900">{title}</h1>
      {subtitle ? <p className="text-sm text-ink-600">{subtitle}</p> : null}
    </header>
  );
}
