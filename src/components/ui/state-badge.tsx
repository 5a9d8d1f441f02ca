// The one look of every lifecycle state (runs and releases): the state scale of the palette with a
// mark whose shape says the same as its colour, for readers who do not tell the colours apart.
import type { ReactNode } from 'react';

/** Where a thing is in its life, whatever its kind. */
export type StateGroup = 'waiting' | 'decide' | 'done' | 'broken' | 'retired';

const BADGE: Record<StateGroup, string> = {
  waiting: 'border-lane-200 bg-white text-lane-900',
  decide: 'border-lane-500 bg-lane-50 text-lane-900',
  done: 'border-lane-700 bg-lane-700 text-white',
  broken: 'border-plum-500 bg-white text-plum-700',
  retired: 'border-dashed border-ink-200 bg-white text-ink-600',
};

// Hollow ring while waiting, a diamond where a person decides, a disc when done, a square when
// the machinery failed, a bar when retired.
const MARK: Record<StateGroup, string> = {
  waiting: 'h-2 w-2 rounded-full border border-current',
  decide: 'h-1.5 w-1.5 rotate-45 bg-current',
  done: 'h-2 w-2 rounded-full bg-current',
  broken: 'h-2 w-2 bg-current',
  retired: 'h-0.5 w-2 bg-current',
};

/** A lifecycle state as a small badge: mark and words. */
export function StateBadge({
  group,
  children,
  state,
}: {
  group: StateGroup;
  children: ReactNode;
  /** The state's key, kept on the badge for programs reading the page. */
  state: string;
}) {
  return (
    <span
      data-state={state}
      data-state-group={group}
      className={`inline-flex items-center gap-1 rounded border px-1.5 py-px text-xs font-medium whitespace-nowrap ${BADGE[group]}`}
    >
      <span aria-hidden="true" className={`inline-block shrink-0 ${MARK[group]}`} />
      {children}
    </span>
  );
}
