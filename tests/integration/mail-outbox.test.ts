// The outbox on a real PostgreSQL: queueMail writes one row per recipient address inside the caller's
// transaction (the transactional outbox, common practice), skips opted-out users, and
// recipientsByRole picks members by role with venue operators limited to their assigned venues. The
// expected people are the demo scenario's (shared/demo.ts), looked up by address, not by the code
// under test.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { createTestDb } from './support/services';
import type { TestDb } from './support/services';
import { seedDemo } from '../../server/db/seed';
import { mailOptOuts, mailOutbox, memberships, users } from '../../server/db/schema';
import { queueMail, recipientsByRole } from '../../server/notifications/outbox';
import { ROLE } from '../../shared/schemas/roles';
import { appPaths } from '../../shared/app-paths';

let tdb: TestDb;
let seed: Awaited<ReturnType<typeof seedDemo>>;
const REVIEWER = 'rosa.reviewer@lanternfish.example';
const PRODUCER = 'pia.producer@lanternfish.example';
const ENGINEER = 'eli.engineer@lanternfish.example';
const OPERATOR = 'otto.operator@lanternfish.example';
const ADMIN = 'ada.admin@lanternfish.example';
const id = (email: string) => seed.userIds[email]!;
const rows = () => tdb.db.select().from(mailOutbox).orderBy(mailOutbox.toEmail);
const clear = () => tdb.db.delete(mailOutbox);

beforeAll(async () => {
  tdb = await createTestDb();
  seed = await seedDemo(tdb.db);
}, 60_000);
afterAll(async () => {
  await tdb.drop();
});

const mail = (userIds: string[]) => ({
  studioId: seed.studioId,
  kind: 'run_held' as const,
  userIds,
  subject: 'Legwork: a run is held',
  text: 'A run is held.',
  path: appPaths.run(seed.studioId, '00000000-0000-4000-8000-000000000001'),
});

describe('queueMail', () => {
  it('queues one row per recipient address, with the kind, subject, text and page', async () => {
    await clear();
    const n = await queueMail(tdb.db, mail([id(PRODUCER), id(ENGINEER), id(PRODUCER)]));
    expect(n).toBe(2);
    const got = await rows();
    expect(got.map((r) => r.toEmail)).toEqual([ENGINEER, PRODUCER]);
    for (const r of got) {
      expect(r).toMatchObject({
        studioId: seed.studioId,
        kind: 'run_held',
        subject: 'Legwork: a run is held',
        text: 'A run is held.',
        path: `/s/${seed.studioId}/runs/00000000-0000-4000-8000-000000000001`,
        attempts: 0,
        sentAt: null,
        lastError: null,
      });
    }
  });

  it('writes inside the caller transaction: rolled back, nothing is queued', async () => {
    await clear();
    await expect(
      tdb.db.transaction(async (tx) => {
        expect(await queueMail(tx, mail([id(PRODUCER)]))).toBe(1);
        throw new Error('the change failed');
      }),
    ).rejects.toThrow('the change failed');
    expect(await rows()).toHaveLength(0);
    await tdb.db.transaction(async (tx) => {
      await queueMail(tx, mail([id(PRODUCER)]));
    });
    expect((await rows()).map((r) => r.toEmail)).toEqual([PRODUCER]);
  });

  it('skips a user who turned the kind off, and only that kind', async () => {
    await clear();
    await tdb.db.insert(mailOptOuts).values({ userId: id(ENGINEER), kind: 'run_held' });
    expect(await queueMail(tdb.db, mail([id(PRODUCER), id(ENGINEER)]))).toBe(1);
    expect((await rows()).map((r) => r.toEmail)).toEqual([PRODUCER]);
    await clear();
    expect(await queueMail(tdb.db, { ...mail([id(ENGINEER)]), kind: 'run_awaiting_review' })).toBe(1);
    expect((await rows()).map((r) => r.toEmail)).toEqual([ENGINEER]);
    await tdb.db.delete(mailOptOuts).where(eq(mailOptOuts.userId, id(ENGINEER)));
  });

  it('queues nothing for nobody or for unknown ids', async () => {
    await clear();
    expect(await queueMail(tdb.db, mail([]))).toBe(0);
    expect(await queueMail(tdb.db, mail(['00000000-0000-4000-8000-00000000dead']))).toBe(0);
    expect(await rows()).toHaveLength(0);
  });
});

describe('recipientsByRole', () => {
  it('answers the members holding any of the roles, of this studio only', async () => {
    expect(await recipientsByRole(tdb.db, seed.studioId, [ROLE.safety_reviewer])).toEqual([id(REVIEWER)]);
    expect(
      (await recipientsByRole(tdb.db, seed.studioId, [ROLE.producer, ROLE.motion_engineer])).sort(),
    ).toEqual([id(PRODUCER), id(ENGINEER)].sort());
    // The admin is a producer in the second studio only, so not a producer here.
    expect(await recipientsByRole(tdb.db, seed.secondStudioId, [ROLE.producer])).toEqual([id(ADMIN)]);
    expect(await recipientsByRole(tdb.db, seed.studioId, [])).toEqual([]);
  });

  it('with a venue, counts a venue operator only where that venue is assigned', async () => {
    const { dome, arcade } = seed.venueIds;
    expect(await recipientsByRole(tdb.db, seed.studioId, [ROLE.venue_operator], { venueId: dome })).toEqual([
      id(OPERATOR),
    ]);
    expect(await recipientsByRole(tdb.db, seed.studioId, [ROLE.venue_operator], { venueId: arcade })).toEqual(
      [],
    );
    expect(await recipientsByRole(tdb.db, seed.studioId, [ROLE.venue_operator])).toEqual([id(OPERATOR)]);

    // A producer who also operates the dome: an operator of the dome only, a producer everywhere.
    const [both] = await tdb.db
      .insert(users)
      .values({ email: 'nia.both@lanternfish.example', name: 'Nia Both' })
      .returning();
    await tdb.db.insert(memberships).values({
      studioId: seed.studioId,
      userId: both!.id,
      roles: [ROLE.producer, ROLE.venue_operator],
      venueIds: [dome],
    });
    expect(await recipientsByRole(tdb.db, seed.studioId, [ROLE.venue_operator], { venueId: arcade })).toEqual(
      [],
    );
    expect(
      (await recipientsByRole(tdb.db, seed.studioId, [ROLE.venue_operator], { venueId: dome })).sort(),
    ).toEqual([id(OPERATOR), both!.id].sort());
    expect(
      (
        await recipientsByRole(tdb.db, seed.studioId, [ROLE.producer, ROLE.venue_operator], {
          venueId: arcade,
        })
      ).sort(),
    ).toEqual([id(PRODUCER), both!.id].sort());
  });

  it('works inside a transaction, seeing its uncommitted members', async () => {
    let inside: string[] = [];
    let added = '';
    await expect(
      tdb.db.transaction(async (tx) => {
        const [u] = await tx
          .insert(users)
          .values({ email: 'ivo.new@lanternfish.example', name: 'Ivo New' })
          .returning();
        added = u!.id;
        await tx
          .insert(memberships)
          .values({ studioId: seed.studioId, userId: u!.id, roles: [ROLE.safety_reviewer] });
        inside = await recipientsByRole(tx, seed.studioId, [ROLE.safety_reviewer]);
        throw new Error('roll back');
      }),
    ).rejects.toThrow('roll back');
    expect(inside.sort()).toEqual([id(REVIEWER), added].sort());
    expect(await recipientsByRole(tdb.db, seed.studioId, [ROLE.safety_reviewer])).toEqual([id(REVIEWER)]);
  });
});
