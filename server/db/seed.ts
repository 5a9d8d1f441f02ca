// The demo studio, seeded into an empty database by `npm start` (fictional names and numbers).
import { count } from 'drizzle-orm';
import { openDb } from './client';
import type { Db } from './client';
import { memberships, profileVersions, profiles, studios, users, venueSettings, venues } from './schema';
import { hashPassword } from '../auth/passwords';
import { DEMO_PASSWORD, DEMO_SECOND_STUDIO, DEMO_STUDIO, DEMO_USERS, DEMO_VENUES } from '../../shared/demo';
import { demoHexapodBase, demoPlanar3Base } from '../../shared/schemas/motion-base';
import { defaultCueingProfile } from '../../shared/schemas/cueing-profile';
import { DEMO_BUDGET } from '../../shared/schemas/budget';

/** Seeds the demo scenario into `db`; returns the ids made. */
export async function seedDemo(db: Db) {
  const hash = await hashPassword(DEMO_PASSWORD);
  return db.transaction(async (tx) => {
    const [studio] = await tx.insert(studios).values(DEMO_STUDIO).returning();
    const [second] = await tx.insert(studios).values(DEMO_SECOND_STUDIO).returning();
    const [dome] = await tx
      .insert(venues)
      .values({ studioId: studio!.id, ...DEMO_VENUES.dome, base: demoHexapodBase })
      .returning();
    const [arcade] = await tx
      .insert(venues)
      .values({ studioId: studio!.id, ...DEMO_VENUES.arcade, base: demoPlanar3Base })
      .returning();
    const venueIds = { dome: dome!.id, arcade: arcade!.id };
    // Starting profiles: the common-practice washout defaults and the clearly marked demo budget.
    const [cueing] = await tx
      .insert(profiles)
      .values({ studioId: studio!.id, kind: 'cueing', name: 'House washout (common-practice defaults)' })
      .returning();
    const [cueingV] = await tx
      .insert(profileVersions)
      .values({
        studioId: studio!.id,
        profileId: cueing!.id,
        version: 1,
        params: defaultCueingProfile(),
        note: 'Defaults as shipped: common practice, not a standard.',
      })
      .returning();
    const [budget] = await tx
      .insert(profiles)
      .values({ studioId: studio!.id, kind: 'budget', name: 'DEMO budget (invented values)' })
      .returning();
    const [budgetV] = await tx
      .insert(profileVersions)
      .values({
        studioId: studio!.id,
        profileId: budget!.id,
        version: 1,
        params: DEMO_BUDGET,
        note: 'Demo numbers only: replace with the envelope that applies to the venue.',
      })
      .returning();
    for (const id of [dome!.id, arcade!.id]) {
      await tx
        .insert(venueSettings)
        .values({
          venueId: id,
          studioId: studio!.id,
          cueingVersionId: cueingV!.id,
          budgetVersionId: budgetV!.id,
        });
    }
    const userIds: Record<string, string> = {};
    for (const u of DEMO_USERS) {
      const [row] = await tx
        .insert(users)
        .values({ email: u.email, name: u.name, passwordHash: hash })
        .returning();
      userIds[u.email] = row!.id;
      await tx.insert(memberships).values({
        studioId: studio!.id,
        userId: row!.id,
        roles: u.roles,
        venueIds: (u.venues ?? []).map((k) => venueIds[k]),
      });
    }
    // The admin also produces for a second studio, so the studio switcher has something to switch.
    const admin = DEMO_USERS.find((u) => u.roles.includes('studio_admin'))!;
    await tx
      .insert(memberships)
      .values({ studioId: second!.id, userId: userIds[admin.email]!, roles: ['producer', 'studio_admin'] });
    return {
      studioId: studio!.id,
      secondStudioId: second!.id,
      venueIds,
      userIds,
      cueingVersionId: cueingV!.id,
      budgetVersionId: budgetV!.id,
    };
  });
}

/** Seeds the demo studio when the database has no studio yet; true when it did. */
export async function seedDemoIfEmpty(url: string): Promise<boolean> {
  const { db, pool } = openDb(url, 2);
  try {
    const [row] = await db.select({ n: count() }).from(studios);
    if ((row?.n ?? 0) > 0) return false;
    await seedDemo(db);
    return true;
  } finally {
    await pool.end();
  }
}
