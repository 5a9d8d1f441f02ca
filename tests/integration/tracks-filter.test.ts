// The tracks table's run-state filter matches what each row shows: the latest run per venue. An
// older run of the track in another state does not make the track match.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { cueRuns, takes, tracks } from '../../server/db/schema';
import { trackPageSchema } from '../../shared/schemas/pipeline';
import type { RunStateName as RunState } from '../../shared/schemas/pipeline';

let t: TestApp;
let c: Client;
let trackId = '';
beforeAll(async () => {
  t = await startTestApp();
  c = new Client(t.app);
  await c.signIn('pia.producer@lanternfish.example');
  const studioId = t.seed.studioId;
  const [track] = await t.tdb.db.insert(tracks).values({ studioId, title: 'Filter Check Track' }).returning();
  trackId = track!.id;
  const take = async (number: number) => {
    const [row] = await t.tdb.db
      .insert(takes)
      .values({
        studioId,
        trackId,
        number,
        kind: 'pose',
        layout: 'hexapod',
        fileName: `take${number}.csv`,
        storageKey: `studios/${studioId}/takes/filter-${number}.csv`,
        sizeBytes: 10,
        sha256: String(number).padEnd(64, '0'),
        samples: 2,
        duration_s: 1,
        uploadedVia: 'browser',
      })
      .returning();
    return row!.id;
  };
  const run = (takeId: string, venueId: string, state: RunState, createdAt: string) =>
    t.tdb.db.insert(cueRuns).values({
      studioId,
      trackId,
      takeId,
      venueId,
      budgetVersionId: t.seed.budgetVersionId,
      state,
      createdAt: new Date(createdAt),
    });
  const first = await take(1);
  const second = await take(2);
  // Dome: awaiting review first, then held by budget (the row shows "held by budget").
  await run(first, t.seed.venueIds.dome, 'awaiting_review', '2026-12-01T08:00:00Z');
  await run(second, t.seed.venueIds.dome, 'held_by_budget', '2026-12-01T09:00:00Z');
  // Arcade: only one run, failed.
  await run(first, t.seed.venueIds.arcade, 'failed', '2026-12-01T08:30:00Z');
});
afterAll(async () => t.close());

async function titles(query: Record<string, string>): Promise<string[]> {
  const res = await c.get(`/api/studios/${t.seed.studioId}/tracks?${new URLSearchParams(query)}`).expect(200);
  return trackPageSchema.parse(res.body).items.map((i) => i.title);
}

describe('tracks table run-state filter', () => {
  it('shows the latest run per venue in the row', async () => {
    const res = await c.get(`/api/studios/${t.seed.studioId}/tracks?q=Filter%20Check`).expect(200);
    const row = trackPageSchema.parse(res.body).items[0]!;
    expect(row.venues.map((v) => [v.venueId, v.state])).toEqual(
      expect.arrayContaining([
        [t.seed.venueIds.dome, 'held_by_budget'],
        [t.seed.venueIds.arcade, 'failed'],
      ]),
    );
  });

  it('matches the state the row shows, not an older run', async () => {
    expect(await titles({ state: 'held_by_budget' })).toContain('Filter Check Track');
    expect(await titles({ state: 'failed' })).toContain('Filter Check Track');
    expect(await titles({ state: 'awaiting_review' })).not.toContain('Filter Check Track');
  });

  it('narrows to one venue with the same rule', async () => {
    const dome = t.seed.venueIds.dome;
    const arcade = t.seed.venueIds.arcade;
    expect(await titles({ state: 'held_by_budget', venueId: dome })).toContain('Filter Check Track');
    expect(await titles({ state: 'awaiting_review', venueId: dome })).not.toContain('Filter Check Track');
    expect(await titles({ state: 'failed', venueId: dome })).not.toContain('Filter Check Track');
    expect(await titles({ state: 'failed', venueId: arcade })).toContain('Filter Check Track');
    expect(await titles({ venueId: arcade })).toContain('Filter Check Track');
  });
});
