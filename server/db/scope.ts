// The one scoping helper for tenant-owned tables: every query on such a table adds its studio
// condition through `inStudio`, so a row of another studio is simply not found (404).
import { and, eq, inArray } from 'drizzle-orm';
import type { SQL } from 'drizzle-orm';
import type { PgColumn } from 'drizzle-orm/pg-core';
import { venues } from './schema';
import { venueScope } from '../../shared/permissions';
import type { VenueScopeMember } from '../../shared/permissions';

interface TenantTable {
  studioId: PgColumn;
}

/** `studio_id = studioId AND ...conditions` for a tenant-owned table. */
export function inStudio(table: TenantTable, studioId: string, ...conditions: (SQL | undefined)[]): SQL {
  return and(eq(table.studioId, studioId), ...conditions) as SQL;
}

/** The condition on `venues` for the venues this member may see (undefined: all of the studio's). */
export function visibleVenues(member: VenueScopeMember): SQL | undefined {
  const scope = venueScope(member);
  if (scope === null) return undefined;
  // An empty scope matches nothing (no venue has the nil UUID).
  return inArray(venues.id, scope.length ? [...scope] : ['00000000-0000-0000-0000-000000000000']);
}
