// Small status graphics shared by the tracks table, the track page and the run page.
import { RUN_STATE_LABELS } from '../../../shared/schemas/pipeline';
import type { RunStateName } from '../../../shared/schemas/pipeline';
import { StateBadge } from '../ui/state-badge';
import type { StateGroup } from '../ui/state-badge';

const STATE_GROUP: Record<RunStateName, StateGroup> = {
  queued: 'waiting',
  cueing: 'waiting',
  awaiting_review: 'decide',
  held_by_budget: 'decide',
  held: 'decide',
  cleared: 'done',
  released: 'done',
  failed: 'broken',
  withdrawn: 'retired',
  superseded: 'retired',
};

/** A run state as a small labelled badge (the state scale, never the use scale). */
export function RunStateBadge({ state }: { state: RunStateName }) {
  return (
    <StateBadge group={STATE_GROUP[state]} state={state}>
      {RUN_STATE_LABELS[state]}
    </StateBadge>
  );
}

/** Use ratio bands: comfortable below 0.8, close from 0.8 to 1, over the limit at 1 and above. */
export function ratioTone(ratio: number): 'ok' | 'close' | 'over' {
  if (ratio >= 1) return 'over';
  return ratio >= 0.8 ? 'close' : 'ok';
}

const BAR_TONE = { ok: 'bg-tealdeep-500', close: 'bg-signal-400', over: 'bg-stop-500' } as const;
const TEXT_TONE = { ok: 'text-ink-800', close: 'text-signal-600', over: 'text-stop-700' } as const;
// The bar spans 0..1.25 so a ratio over 1 still shows how far over; the tick marks the limit.
const BAR_FULL = 1.25;

/** A budget use ratio (worst value / limit) as a bar with its number; over 1 is over the limit. */
export function UseRatioBar({ ratio, label }: { ratio: number | null; label?: string | undefined }) {
  if (ratio === null || !Number.isFinite(ratio)) return <span className="text-xs text-ink-400">—</span>;
  const tone = ratioTone(ratio);
  // Two decimals cut (not rounded) so the number never lands in another band than its colour:
  // 0.7996 reads 0.79 and 0.996 reads 0.99; the exact value is in the tooltip and aria-valuenow.
  const shown = (Math.floor(ratio * 100 + 1e-9) / 100).toFixed(2);
  const width = `${(Math.min(Math.max(ratio, 0), BAR_FULL) / BAR_FULL) * 100}%`;
  return (
    <span
      className="inline-flex items-center gap-1.5"
      title={`${label ? `${label}: ` : ''}${ratio.toPrecision(4)} of the limit`}
    >
      <span
        role="meter"
        aria-label={label ? `Use ratio ${label}` : 'Use ratio'}
        aria-valuemin={0}
        aria-valuemax={BAR_FULL}
        aria-valuenow={Number(ratio.toPrecision(4))}
        className="relative inline-block h-2 w-20 overflow-hidden rounded-sm bg-ink-100"
      >
        <span className={`absolute inset-y-0 left-0 ${BAR_TONE[tone]}`} style={{ width }} />
        <span className="absolute inset-y-0 w-px bg-ink-800" style={{ left: `${100 / BAR_FULL}%` }} />
      </span>
      <span className={`font-mono text-xs ${TEXT_TONE[tone]}`}>{shown}</span>
    </span>
  );
}

/** A progress bar from 0 to 100 per cent with its number. */
export function ProgressBar({ percent, label }: { percent: number; label: string }) {
  const clamped = Math.min(Math.max(Number.isFinite(percent) ? percent : 0, 0), 100);
  return (
    <span className="inline-flex items-center gap-2">
      <span
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={Math.round(clamped)}
        className="relative inline-block h-2 w-40 overflow-hidden rounded-sm bg-ink-100"
      >
        <span
          className="absolute inset-y-0 left-0 bg-tealdeep-500 transition-[width]"
          style={{ width: `${clamped}%` }}
        />
      </span>
      <span className="font-mono text-xs text-ink-600">{Math.round(clamped)} %</span>
    </span>
  );
}
