import { RELEASE_STATE_LABELS } from '../../../shared/schemas/release';
import type { ReleaseState } from '../../../shared/schemas/release';
import { StateBadge } from '../ui/state-badge';
import type { StateGroup } from '../ui/state-badge';

const GROUP: Record<ReleaseState, StateGroup> = {
  building: 'waiting',
  ready: 'done',
  failed: 'broken',
  superseded: 'retired',
  withdrawn: 'retired',
};

/** A release state as a small labelled badge (the state scale, never the use scale). */
export function ReleaseStateBadge({ state }: { state: ReleaseState }) {
  return (
    <StateBadge group={GROUP[state]} state={state}>
      {RELEASE_STATE_LABELS[state]}
    </StateBadge>
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
