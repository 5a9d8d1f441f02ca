// Which roles may do what in a studio, and which venues a member may see. The server checks every
// route against this table; the client reads the same table to show only the actions a member can
// take. The role-by-route integration test walks the server from the outside with its own table.
import type { Role } from './schemas/roles';
import { ROLES } from './schemas/roles';

/** A per-studio API token acts as this pseudo-role: it may push tracks and takes, nothing else. */
export const TOKEN_ROLE = 'api_token';
export type Actor = Role | typeof TOKEN_ROLE;

const ALL: readonly Actor[] = ROLES;
const STUDIO_DESK: readonly Actor[] = ['producer', 'motion_engineer', 'safety_reviewer', 'studio_admin'];

export const PERMISSIONS = {
  'studio.read': ALL,
  'venues.read': ALL,
  'members.manage': ['studio_admin'],
  'audit.read': ['studio_admin', 'safety_reviewer'],
  'tokens.manage': ['studio_admin'],
  'tracks.read': STUDIO_DESK,
  'tracks.write': ['producer', TOKEN_ROLE],
  'takes.upload': ['producer', TOKEN_ROLE],
  'runs.request': ['producer', 'motion_engineer'],
  'runs.read': STUDIO_DESK,
  // Moving a run's motion against the picture (a new run with another film offset).
  'runs.sync': ['producer'],
  'profiles.read': STUDIO_DESK,
  'profiles.cueing.write': ['motion_engineer'],
  'profiles.budget.write': ['safety_reviewer'],
  'venues.configure': ['motion_engineer', 'studio_admin'],
  'venues.create': ['studio_admin'],
  'runs.review': ['safety_reviewer'],
  'releases.create': ['producer'],
  'releases.withdraw': ['producer'],
  // Operators see, download and answer for their own venues' releases only (venueScope).
  'releases.read': ALL,
  'releases.download': ALL,
  'releases.acknowledge': ['venue_operator'],
  'releases.report': ['venue_operator'],
  'home.review': ['safety_reviewer'],
  'home.producer': ['producer'],
  'home.engineer': ['motion_engineer'],
  'home.operator': ['venue_operator'],
} as const satisfies Record<string, readonly Actor[]>;

export type Permission = keyof typeof PERMISSIONS;

/** True when any of `roles` grants `permission`. */
export function allows(roles: readonly string[], permission: Permission): boolean {
  const granted: readonly string[] = PERMISSIONS[permission];
  return roles.some((r) => granted.includes(r));
}

/** The part of a membership that decides venue scope. */
export interface VenueScopeMember {
  roles: readonly string[];
  venueIds: readonly string[];
}

/**
 * The venues a member is limited to, or null when the member sees every venue of the studio.
 * A member whose only role is venue operator works at the venues assigned to them; any other role
 * (or an API token) sees them all.
 */
export function venueScope(member: VenueScopeMember): readonly string[] | null {
  const onlyOperator = member.roles.every((r) => r === 'venue_operator');
  return onlyOperator ? member.venueIds : null;
}

/** True when the member may see this venue (its list entry, its settings, its runs). */
export function canSeeVenue(member: VenueScopeMember, venueId: string): boolean {
  const scope = venueScope(member);
  return scope === null || scope.includes(venueId);
}
