// Which roles may do what in a studio. The server checks every route against this table; the
// route-by-role test walks it from the outside.
import type { Role } from '../../shared/schemas/roles';
import { ROLES } from '../../shared/schemas/roles';

/** A per-studio API token acts as this pseudo-role: it may push tracks and takes, nothing else. */
export const TOKEN_ROLE = 'api_token';
type Actor = Role | typeof TOKEN_ROLE;

const ALL: readonly Actor[] = ROLES;
const STUDIO_DESK: readonly Actor[] = ['producer', 'motion_engineer', 'safety_reviewer', 'studio_admin'];

export const PERMISSIONS = {
  'studio.read': ALL,
  'venues.read': ALL,
  'members.manage': ['studio_admin'],
  'audit.read': ['studio_admin'],
  'tokens.manage': ['studio_admin'],
  'tracks.read': STUDIO_DESK,
  'tracks.write': ['producer', TOKEN_ROLE],
  'takes.upload': ['producer', TOKEN_ROLE],
  'runs.request': ['producer', 'motion_engineer'],
  'runs.read': STUDIO_DESK,
  'profiles.read': STUDIO_DESK,
  'profiles.cueing.write': ['motion_engineer'],
  'profiles.budget.write': ['safety_reviewer'],
  'venues.configure': ['motion_engineer', 'studio_admin'],
  'venues.create': ['studio_admin'],
} as const satisfies Record<string, readonly Actor[]>;

export type Permission = keyof typeof PERMISSIONS;

/** True when any of `roles` grants `permission`. */
export function allows(roles: readonly string[], permission: Permission): boolean {
  const granted: readonly string[] = PERMISSIONS[permission];
  return roles.some((r) => granted.includes(r));
}
