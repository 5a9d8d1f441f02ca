import { asc, eq } from 'drizzle-orm';
import type { Db } from '../db/client';
import { memberships, studios } from '../db/schema';
import type { Me } from '../../shared/schemas/api';
import type { Role } from '../../shared/schemas/roles';

/** The signed-in user with every studio membership. */
export async function loadMe(db: Db, user: Express.User): Promise<Me> {
  const rows = await db
    .select({
      studioId: studios.id,
      studioName: studios.name,
      studioSlug: studios.slug,
      roles: memberships.roles,
      venueIds: memberships.venueIds,
    })
    .from(memberships)
    .innerJoin(studios, eq(studios.id, memberships.studioId))
    .where(eq(memberships.userId, user.id))
    .orderBy(asc(studios.name));
  return {
    user: { id: user.id, email: user.email, name: user.name },
    memberships: rows.map((m) => ({ ...m, roles: m.roles as Role[] })),
  };
}
