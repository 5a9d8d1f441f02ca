import { ROLES, ROLE_LABELS } from '../../../../shared/schemas/roles';
import type { Role } from '../../../../shared/schemas/roles';
import { CheckboxGroup } from '../../../components/ui/form';

export interface VenueChoice {
  id: string;
  name: string;
}

const ROLE_OPTIONS = ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role] }));

/** Role checkboxes, and the venue scope checkboxes once "Venue operator" is among the roles. */
export function RoleVenueFields({
  roles,
  venueIds,
  venues,
  onRolesChange,
  onVenueIdsChange,
  errors,
  disabled,
}: {
  roles: readonly Role[];
  venueIds: readonly string[];
  venues: readonly VenueChoice[];
  onRolesChange: (roles: Role[]) => void;
  onVenueIdsChange: (venueIds: string[]) => void;
  errors: Record<string, string>;
  disabled?: boolean;
}) {
  return (
    <>
      <CheckboxGroup
        legend="Roles"
        options={ROLE_OPTIONS}
        value={roles}
        onChange={onRolesChange}
        error={errors.roles}
        disabled={disabled}
      />
      {roles.includes('venue_operator') ? (
        <CheckboxGroup
          legend="Venues (for the venue operator role)"
          options={venues.map((venue) => ({ value: venue.id, label: venue.name }))}
          value={venueIds}
          onChange={onVenueIdsChange}
          error={errors.venueIds}
          disabled={disabled}
        />
      ) : null}
    </>
  );
}

/** What a member's or an invitation's venue scope means in words. */
export function describeVenueScope(
  roles: readonly Role[],
  venueIds: readonly string[],
  venues: readonly VenueChoice[],
): string {
  if (!roles.includes('venue_operator')) return '—';
  if (venueIds.length === 0) return 'No venues';
  return venueIds.map((id) => venues.find((venue) => venue.id === id)?.name ?? 'Unknown venue').join(', ');
}
