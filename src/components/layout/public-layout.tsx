import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { CautionStrip } from './caution-strip';

/** The frame of screens used before signing in: a narrow column under the product name. */
export function PublicLayout({
  title,
  children,
  wide = false,
}: {
  title: string;
  children: ReactNode;
  wide?: boolean;
}) {
  return (
    <div className="flex min-h-screen flex-col">
      <header className="border-b border-ink-800 bg-ink-900 px-4 py-2">
        <Link to="/" className="font-mono text-base font-semibold tracking-tight text-white">
          Legwork
        </Link>
      </header>
      <main
        className={`mx-auto flex w-full flex-1 flex-col gap-4 px-4 py-8 ${wide ? 'max-w-5xl' : 'max-w-md'}`}
      >
        <h1 className="text-xl font-semibold tracking-tight text-ink-900">{title}</h1>
        {children}
      </main>
      <CautionStrip />
    </div>
  );
}
