// Which roles may do what in a studio. The server checks every route against this table; the
// route-by-role test walks it from the outside.
import type { Role } from '../../shared/schemas/roles';
import { ROLES } from '../../shared/schemas/roles';

const ALL: readonly Role[] = ROLES;

export const PERMISSIONS = {
  'studio.read': ALL,
  'venues.read': ALL,
  'members.manage': ['studio_admin'],
  'audit.read': ['studio_admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

/** True when any of `roles` grants `permission`. */
export function allows(roles: readonly string[], permission: Permission): boolean {
  const granted: readonly Role[] = PERMISSIONS[permission];
  return roles.some((r) => (granted as readonly string[]).includes(r));
}
