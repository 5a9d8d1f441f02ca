import type { ReactNode, TdHTMLAttributes, ThHTMLAttributes } from 'react';

/** A dense table with a caption for screen readers and a horizontal scroll on narrow screens. */
export function Table({ caption, children }: { caption: string; children: ReactNode }) {
  return (
    <div className="overflow-x-auto rounded border border-ink-200 bg-white">
      <table className="w-full border-collapse text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function Th({ className = '', ...rest }: ThHTMLAttributes<HTMLTableCellElement>) {
  return (
    <th
      scope="col"
      {...rest}
      className={`border-b border-ink-200 bg-ink-50 px-3 py-1.5 text-xs font-semibold text-ink-600 ${className}`}
    />
  );
}

export function Td({ className = '', ...rest }: TdHTMLAttributes<HTMLTableCellElement>) {
  return (
    <td {...rest} className={`border-b border-ink-100 px-3 py-1.5 align-top text-ink-800 ${className}`} />
  );
}
