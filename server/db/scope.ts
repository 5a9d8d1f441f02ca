// The one scoping helper for tenant-owned tables: every query on such a table adds its studio
// condition through `inStudio`, so a row of another studio is simply not found (404).
import { and, eq } from 'drizzle-orm';
import type { SQL } from 'drizzle-orm';
import type { PgColumn } from 'drizzle-orm/pg-core';

interface TenantTable {
  studioId: PgColumn;
}

/** `studio_id = studioId AND ...conditions` for a tenant-owned table. */
export function inStudio(table: TenantTable, studioId: string, ...conditions: (SQL | undefined)[]): SQL {
  return and(eq(table.studioId, studioId), ...conditions) as SQL;
}
