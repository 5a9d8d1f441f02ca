import { RELEASE_STATE_LABELS } from '../../../shared/schemas/release';
import type { ReleaseState } from '../../../shared/schemas/release';

const TONE: Record<ReleaseState, string> = {
  building: 'border-ink-400 bg-ink-50 text-ink-800',
  ready: 'border-tealdeep-700 bg-tealdeep-700 text-white',
  failed: 'border-stop-500 bg-white text-stop-700',
  superseded: 'border-ink-200 bg-white text-ink-400',
  withdrawn: 'border-stop-500 bg-white text-stop-700',
};

/** A release state as a small labelled badge. */
export function ReleaseStateBadge({ state }: { state: ReleaseState }) {
  return (
    <span
      className={`inline-flex items-center rounded border px-1.5 py-px text-xs font-medium whitespace-nowrap ${TONE[state]}`}
    >
      {RELEASE_STATE_LABELS[state]}
    </span>
  );
}

/** A byte count in people units (kB = 1000 B, as SI writes it). */
export function formatBytes(bytes: number | null): string {
  if (bytes === null || !Number.isFinite(bytes)) return '—';
  if (bytes < 1000) return `${bytes} B`;
  if (bytes < 1e6) return `${(bytes / 1e3).toFixed(1)} kB`;
  if (bytes < 1e9) return `${(bytes / 1e6).toFixed(1)} MB`;
  return `${(bytes / 1e9).toFixed(2)} GB`;
}
