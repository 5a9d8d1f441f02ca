// The demo studio shows every stage of the chain: seeded through the same steps as the routes and the
// worker (upload, cue, review, release, build, withdraw, acknowledge), then read back over HTTP.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { testEnv } from './support/services';
import { createStorage } from '../../server/storage';
import { seedDemoReleases, seedDemoReviews, seedDemoTrack } from '../../server/db/seed';
import { cueRuns } from '../../server/db/schema';
import type { CueRunRow } from '../../server/db/schema';
import { findingCounts } from '../../server/pipeline/review';
import { operatorHomeSchema } from '../../shared/schemas/homes';
import { DEMO_VENUES } from '../../shared/demo';

let t: TestApp;
let storage: ReturnType<typeof createStorage>;
let runs: CueRunRow[] = [];
const OPERATOR = 'otto.operator@lanternfish.example';

beforeAll(async () => {
  t = await startTestApp({ queue: true });
  storage = createStorage(testEnv(t.tdb.url));
  const seeded = await seedDemoTrack(t.tdb.db, t.tdb.pool, storage, t.boss!, t.seed);
  await seedDemoReviews(t.tdb.db, t.seed, seeded);
  await seedDemoReleases(t.tdb.db, t.tdb.pool, storage, t.boss!, t.seed, seeded);
  runs = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.studioId, t.seed.studioId));
}, 180_000);
afterAll(async () => {
  storage.close();
  await t.close();
});

describe('the demo studio', () => {
  it('has a run awaiting review, one held by comfort findings only and one held for a hard finding', () => {
    expect(runs.filter((r) => r.state === 'awaiting_review').length).toBeGreaterThanOrEqual(1);
    expect(
      runs.some(
        (r) => r.state === 'held_by_budget' && findingCounts(r).hard === 0 && findingCounts(r).comfort > 0,
      ),
    ).toBe(true);
    expect(runs.some((r) => r.state === 'held' && findingCounts(r).hard > 0)).toBe(true);
  });

  it('has a release installed at Harbour Lights Dome and a withdrawn one, as its operator sees them', async () => {
    expect(runs.filter((r) => r.state === 'released')).toHaveLength(1);
    expect(runs.filter((r) => r.state === 'withdrawn')).toHaveLength(1);
    const c = new Client(t.app);
    expect((await c.signIn(OPERATOR)).status).toBe(200);
    const home = operatorHomeSchema.parse(
      (await c.get(`/api/studios/${t.seed.studioId}/home/operator`)).body,
    );
    expect(home.installed).toHaveLength(1);
    expect(home.installed[0]!.venueName).toBe(DEMO_VENUES.dome.name);
    expect(home.installed[0]!.state).toBe('ready');
    expect(home.installed[0]!.acknowledgements[0]!.by.email).toBe(OPERATOR);
    expect(home.withdrawn).toHaveLength(1);
    expect(home.withdrawn[0]!.withdrawReason).toMatch(/recut/);
    expect(home.new).toHaveLength(0);
  });
});
