// The role table lives in shared/ so the client shows the same actions the server allows.
export { PERMISSIONS, TOKEN_ROLE, allows, canSeeVenue, venueScope } from '../../shared/permissions';
export type { Actor, Permission } from '../../shared/permissions';
