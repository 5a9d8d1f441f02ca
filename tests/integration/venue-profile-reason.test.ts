// Changing the profile versions a venue uses needs a reason, and the audit log keeps it with what
// changed: PUT .../venues/:venue/settings against the seeded demo studio.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, desc, eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { auditEvents, profileVersions, profiles, venueSettings } from '../../server/db/schema';
import { auditPageSchema } from '../../shared/schemas/audit';
import { VENUE_CHANGE_REASON_MESSAGE, venueDetailSchema } from '../../shared/schemas/pipeline';

let t: TestApp;
let reviewer: Client;
let engineer: Client;
const settingsPath = () => `/api/studios/${t.seed.studioId}/venues/${t.seed.venueIds.arcade}/settings`;
const stored = async () =>
  (await t.tdb.db.select().from(venueSettings).where(eq(venueSettings.venueId, t.seed.venueIds.arcade)))[0];
const changes = () =>
  t.tdb.db
    .select()
    .from(auditEvents)
    .where(
      and(
        eq(auditEvents.action, 'venue.profiles_changed'),
        eq(auditEvents.subjectId, t.seed.venueIds.arcade),
      ),
    )
    .orderBy(desc(auditEvents.id));

beforeAll(async () => {
  t = await startTestApp();
  reviewer = new Client(t.app);
  await reviewer.signIn('rosa.reviewer@lanternfish.example');
  engineer = new Client(t.app);
  await engineer.signIn('eli.engineer@lanternfish.example');
});
afterAll(async () => t.close());

describe('the reason for changing what a venue uses', () => {
  it('is kept in the audit event with the version before and after', async () => {
    const before = await stored();
    expect(before?.budgetVersionId, 'the demo seed sets a budget at the arcade').toBeTruthy();
    const reason = 'Budget cleared off for the arcade while its envelope is re-measured.';
    const r = await reviewer.send('put', settingsPath(), { budgetVersionId: null, reason: `  ${reason} ` });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(venueDetailSchema.parse(r.body).budgetVersion).toBeNull();

    const [event] = await changes();
    expect(event?.actorEmail).toBe('rosa.reviewer@lanternfish.example');
    const venueName = venueDetailSchema.parse(r.body).name;
    const [budgetBefore] = await t.tdb.db
      .select({ name: profiles.name, version: profileVersions.version })
      .from(profileVersions)
      .innerJoin(profiles, eq(profiles.id, profileVersions.profileId))
      .where(eq(profileVersions.id, before!.budgetVersionId!));
    const labelBefore = `${budgetBefore!.name} v${budgetBefore!.version}`;
    expect(event?.detail).toEqual({
      venueName,
      budgetVersionId: null,
      budgetVersionBefore: before!.budgetVersionId,
      budgetLabel: null,
      budgetLabelBefore: labelBefore,
      reason,
    });

    // The audit page (what a reviewer reads) carries the same detail.
    const page = auditPageSchema.parse(
      (await reviewer.get(`/api/studios/${t.seed.studioId}/audit?kind=venue`)).body,
    );
    const shown = page.events.find((e) => e.id === event!.id);
    expect(shown?.detail.reason).toBe(reason);
    // ... and says it in words: what changed, from what to what, where, and why.
    expect(shown?.words).toBe(
      `rosa.reviewer@lanternfish.example changed the budget profile from ${labelBefore} to none at ${venueName}. Reason: ${reason}`,
    );
  });

  it('is required: without one the change is a 400 naming the field, and nothing changes', async () => {
    const before = await stored();
    const eventsBefore = (await changes()).length;
    for (const body of [
      { cueingVersionId: t.seed.cueingVersionId },
      { cueingVersionId: t.seed.cueingVersionId, reason: '   ' },
    ]) {
      const r = await engineer.send('put', settingsPath(), body);
      expect(r.status).toBe(400);
      const error = (r.body as { error: string; issues: { path: string; message: string }[] }).error;
      expect(error).toContain(`reason: ${VENUE_CHANGE_REASON_MESSAGE}`);
      expect((r.body as { issues: { path: string }[] }).issues.map((i) => i.path)).toEqual(['reason']);
    }
    expect(await stored()).toEqual(before);
    expect((await changes()).length).toBe(eventsBefore);
  });
});
