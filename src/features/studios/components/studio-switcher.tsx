import type { Membership } from '../../../../shared/schemas/api';

/** A select of the studios the user belongs to; choosing one calls `onSwitch` with its id. */
export function StudioSwitcher({
  memberships,
  currentStudioId,
  onSwitch,
}: {
  memberships: readonly Membership[];
  currentStudioId: string;
  onSwitch: (studioId: string) => void;
}) {
  const sorted = [...memberships].sort((a, b) => a.studioName.localeCompare(b.studioName));
  return (
    <label className="inline-flex items-center gap-2 text-xs text-ink-200">
      <span aria-hidden="true">Studio</span>
      <select
        aria-label="Studio"
        value={currentStudioId}
        onChange={(event) => onSwitch(event.target.value)}
        className="max-w-64 rounded border border-ink-600 bg-ink-800 px-2 py-1 text-sm text-white"
      >
        {sorted.map((membership) => (
          <option key={membership.studioId} value={membership.studioId}>
            {membership.studioName}
          </option>
        ))}
      </select>
    </label>
  );
}
