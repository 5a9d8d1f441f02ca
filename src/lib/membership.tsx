// The current member of the studio in the address, for any component inside a studio page. What a
// member may do comes from the shared permission table, the same one the server enforces.
import { createContext, useContext } from 'react';
import type { ReactNode } from 'react';
import type { Membership } from '../../shared/schemas/api';
import { allows, venueScope } from '../../shared/permissions';
import type { Permission } from '../../shared/permissions';

const MembershipContext = createContext<Membership | null>(null);

export function MembershipProvider({
  membership,
  children,
}: {
  membership: Membership;
  children: ReactNode;
}) {
  return <MembershipContext.Provider value={membership}>{children}</MembershipContext.Provider>;
}

/** The membership of the current studio; only valid inside a studio page. */
export function useMembership(): Membership {
  const membership = useContext(MembershipContext);
  if (!membership) throw new Error('useMembership is only available inside a studio page.');
  return membership;
}

/** True when the current member's roles grant `permission` (the server still decides). */
export function useCan(permission: Permission): boolean {
  return allows(useMembership().roles, permission);
}

/** The venues the current member is limited to, or null when they see every venue. */
export function useVenueScope(): readonly string[] | null {
  return venueScope(useMembership());
}
