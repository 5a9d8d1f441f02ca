import type { ReactNode } from 'react';
import { PERMISSIONS } from '../../../shared/permissions';
import type { Permission } from '../../../shared/permissions';
import { ROLES, ROLE_LABELS } from '../../../shared/schemas/roles';
import { useCan } from '../../lib/membership';

/** The roles that hold a permission, in people words ("Producer or Motion engineer"). */
export function rolesThatCan(permission: Permission): string {
  const granted: readonly string[] = PERMISSIONS[permission];
  const names = ROLES.filter((role) => granted.includes(role)).map((role) => ROLE_LABELS[role]);
  return names.length <= 1 ? (names[0] ?? 'nobody') : `${names.slice(0, -1).join(', ')} or ${names.at(-1)}`;
}

/** A quiet note (not an error) where a page is not part of the member's work. */
export function OutsideRole({ permission, what }: { permission: Permission; what: string }) {
  return (
    <p role="note" className="rounded border border-ink-200 bg-white px-3 py-2 text-sm text-ink-600">
      {what} belong to the work of: {rolesThatCan(permission)}. Your roles in this studio do not include it.
    </p>
  );
}

/** Renders `children` when the member holds `permission`, otherwise the quiet note. */
export function RoleGate({
  permission,
  what,
  children,
}: {
  permission: Permission;
  what: string;
  children: ReactNode;
}) {
  return useCan(permission) ? children : <OutsideRole permission={permission} what={what} />;
}
