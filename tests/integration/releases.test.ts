// Releases from the outside: the demo ride's cuts cued by the real worker handler and reviewed by the
// seed's rules, then released, built by the real build-release handler, downloaded, acknowledged,
// reported on, superseded and withdrawn over HTTP. The package is checked with a general-purpose zip
// reader (yauzl) and node:crypto's SHA-256, independently of the code that wrote it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { DeleteObjectCommand } from '@aws-sdk/client-s3';
import { and, eq, sql } from 'drizzle-orm';
import { unzip } from '../factories/zip';
import { Client, startTestApp } from './support/app';
import type { TestApp } from './support/app';
import { testEnv } from './support/services';
import { createStorage } from '../../server/storage';
import { seedDemoReviews, seedDemoTrack } from '../../server/db/seed';
import {
  auditEvents,
  cueRuns,
  mailOutbox,
  memberships,
  releaseDownloads,
  releases,
} from '../../server/db/schema';
import type { CueRunRow } from '../../server/db/schema';
import { createBuildReleaseHandler } from '../../worker/jobs/build-release';
import { releaseCreatedSchema, releaseSchema } from '../../shared/schemas/release';
import type { Release } from '../../shared/schemas/release';
import { runDecisionSchema } from '../../shared/schemas/review';
import { operatorHomeSchema, producerHomeSchema } from '../../shared/schemas/homes';
import { runParamsSchema } from '../../shared/schemas/run-params';
import { packageManifestSchema } from '../../shared/schemas/package-manifest';

let t: TestApp;
let storage: ReturnType<typeof createStorage>;
let build: ReturnType<typeof createBuildReleaseHandler>;
const clients = new Map<string, Client>();
let runs: CueRunRow[] = [];

const base = () => `/api/studios/${t.seed.studioId}`;
const as = (email: string) => clients.get(email)!;
const REVIEWER = 'rosa.reviewer@lanternfish.example';
const PRODUCER = 'pia.producer@lanternfish.example';
const ENGINEER = 'eli.engineer@lanternfish.example';
const OPERATOR = 'otto.operator@lanternfish.example';
const ADMIN = 'ada.admin@lanternfish.example';

const hard = (r: CueRunRow) => (r.summary?.findings ?? []).some((f) => f.severity === 'hard');
const runById = async (id: string) => (await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.id, id)))[0]!;
const getRelease = async (email: string, id: string): Promise<Release> => {
  const r = await as(email).get(`${base()}/releases/${id}`);
  expect(r.status, JSON.stringify(r.body)).toBe(200);
  return releaseSchema.parse(r.body);
};
const release = async (runId: string) => {
  const r = await as(PRODUCER).send('post', `${base()}/runs/${runId}/release`, {});
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return releaseCreatedSchema.parse(r.body);
};
const buildJob = (releaseId: string) =>
  build({ id: releaseId, data: { releaseId, studioId: t.seed.studioId } });
const clear = async (run: CueRunRow) => {
  const r = await as(REVIEWER).send('post', `${base()}/runs/${run.id}/review`, {
    decision: 'clear',
    reason: 'Checked against the venue budget; accepted.',
  });
  expect(r.status, JSON.stringify(r.body)).toBe(200);
};
/** The operator works at these venues from now on. */
const scopeOperator = async (venueIds: string[]) => {
  const op = t.seed.userIds[OPERATOR]!;
  await t.tdb.db
    .update(memberships)
    .set({ venueIds })
    .where(and(eq(memberships.studioId, t.seed.studioId), eq(memberships.userId, op)));
};

/** Addresses the outbox holds for this kind of mail about this release. */
const mailedTo = async (kind: string, releaseId: string) =>
  (await t.tdb.db.select().from(mailOutbox).where(eq(mailOutbox.kind, kind)))
    .filter((m) => m.path?.endsWith(`/releases/${releaseId}`))
    .map((m) => m.toEmail)
    .sort();

const binary = (
  res: { on: (ev: string, cb: (x?: Buffer) => void) => void },
  cb: (e: null, b: Buffer) => void,
) => {
  const chunks: Buffer[] = [];
  res.on('data', (c) => chunks.push(c!));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
};
const download = (email: string, id: string) =>
  as(email).get(`${base()}/releases/${id}/package`).buffer(true).parse(binary);

// The runs of the demo ride: the seed clears the first clean one; the others here are cleared by the tests.
let first: CueRunRow;
let second: CueRunRow;
let other: CueRunRow;
let firstRelease = '';

beforeAll(async () => {
  t = await startTestApp({ queue: true, env: { LOGIN_RATE_LIMIT: '1000' } });
  storage = createStorage(testEnv(t.tdb.url));
  build = createBuildReleaseHandler({ db: t.tdb.db, storage, log: () => undefined, now: () => new Date() });
  const seeded = await seedDemoTrack(t.tdb.db, t.tdb.pool, storage, t.boss!, t.seed);
  await seedDemoReviews(t.tdb.db, t.seed, seeded);
  runs = await t.tdb.db.select().from(cueRuns).where(eq(cueRuns.studioId, t.seed.studioId));
  first = runs.find((r) => r.state === 'cleared')!;
  second = runs.find((r) => r.id !== first.id && r.venueId === first.venueId && !hard(r) && r.summary)!;
  other = runs.find((r) => r.venueId !== first.venueId && !hard(r) && r.summary)!;
  for (const email of [REVIEWER, PRODUCER, ENGINEER, OPERATOR, ADMIN]) {
    const c = new Client(t.app);
    await c.signIn(email);
    clients.set(email, c);
  }
  await scopeOperator([first.venueId]);
}, 120_000);
afterAll(async () => {
  storage.close();
  await t.close();
});

describe('releasing a run', () => {
  it('has the runs the cases need: a cleared one, another at its venue and one at the other venue', () => {
    expect(first).toBeDefined();
    expect(second).toBeDefined();
    expect(other).toBeDefined();
  });

  it('is the work of a producer (403 for the others) and only of a cleared run (409)', async () => {
    for (const email of [REVIEWER, ENGINEER, OPERATOR, ADMIN]) {
      const r = await as(email).send('post', `${base()}/runs/${first.id}/release`, {});
      expect(r.status, email).toBe(403);
    }
    const waiting = runs.find((r) => r.state === 'awaiting_review')!;
    const r = await as(PRODUCER).send('post', `${base()}/runs/${waiting.id}/release`, {});
    expect(r.status).toBe(409);
    expect((r.body as { error: string }).error).toMatch(/cleared/);
    const h = runs.find((x) => hard(x))!;
    const rh = await as(PRODUCER).send('post', `${base()}/runs/${h.id}/release`, {});
    expect(rh.status).toBe(409);
    const d = runDecisionSchema.parse((await as(PRODUCER).get(`${base()}/runs/${first.id}/decision`)).body);
    expect(d.actions.release.allowed).toBe(true);
  });

  it('answers 201 building, moves the run to released, and refuses a second release of it', async () => {
    const created = await release(first.id);
    expect(created.state).toBe('building');
    firstRelease = created.id;
    expect((await runById(first.id)).state).toBe('released');
    const again = await as(PRODUCER).send('post', `${base()}/runs/${first.id}/release`, {});
    expect(again.status).toBe(409);
    const d = runDecisionSchema.parse((await as(PRODUCER).get(`${base()}/runs/${first.id}/decision`)).body);
    expect(d.actions.release.allowed).toBe(false);
    expect(d.releaseIds).toEqual([created.id]);
    // A reviewer cannot hold a run once it has a release: the producer withdraws instead.
    const hold = await as(REVIEWER).send('post', `${base()}/runs/${first.id}/review`, {
      decision: 'hold',
      reason: 'second thoughts',
    });
    expect(hold.status).toBe(409);
    const home = producerHomeSchema.parse((await as(PRODUCER).get(`${base()}/home/producer`)).body);
    expect(home.releasesInProgress.map((x) => x.id)).toContain(created.id);
  });

  it('builds a package whose manifest matches every file (yauzl + node:crypto), and records its SHA-256', async () => {
    await buildJob(firstRelease);
    const rel = await getRelease(PRODUCER, firstRelease);
    expect(rel.state).toBe('ready');
    expect(rel.packageSha256).toMatch(/^[0-9a-f]{64}$/);
    const got = await download(OPERATOR, firstRelease);
    expect(got.status).toBe(200);
    expect(got.headers['content-type']).toMatch(/application\/zip/);
    expect(got.headers['content-disposition']).toContain(rel.packageName);
    const zip = got.body as Buffer;
    expect(createHash('sha256').update(zip).digest('hex')).toBe(rel.packageSha256);
    expect(zip.length).toBe(rel.packageSizeBytes);
    const entries = await unzip(zip);
    const manifest = packageManifestSchema.parse(JSON.parse(entries.get('manifest.json')!.toString('utf8')));
    expect(manifest.files.length).toBe(entries.size - 1);
    for (const f of manifest.files) {
      const bytes = entries.get(f.name);
      expect(bytes, f.name).toBeDefined();
      expect(createHash('sha256').update(bytes!).digest('hex'), f.name).toBe(f.sha256);
      expect(bytes!.length, f.name).toBe(f.size_bytes);
    }
    expect(manifest.release.id).toBe(firstRelease);
    expect(manifest.release.releasedBy.email).toBe(PRODUCER);
    expect(manifest.run.id).toBe(first.id);
    expect(manifest.reviews.some((r) => r.decision === 'clear')).toBe(true);
    expect(manifest.budget.id).toBe(first.budgetVersionId);
    expect(rel.files.map((f) => f.name).sort()).toEqual(manifest.files.map((f) => f.name).sort());
    // The venue's operator is told, and no one else.
    expect(await mailedTo('release_ready', firstRelease)).toEqual([OPERATOR]);
    // The report carries the caution (common practice: the ride maker and the codes decide).
    expect(entries.get('report.html')!.toString('utf8')).toMatch(/never replaces/i);
    // The run's controller settings (its parameters) decide the encoder files: counts exactly when the
    // run was made with an encoder, decoded with readInt32LE and equal to the CSV's counts column.
    const controller = runParamsSchema.parse(first.params).controller;
    expect(controller, 'runs record the venue controller settings').toBeDefined();
    const counts = manifest.controller.counts;
    expect(!!counts).toBe(!!controller!.encoder);
    if (counts) {
      const bin = entries.get(counts.binary.file)!;
      const rows = entries.get(counts.csv)!.toString('utf8').trim().split('\n').slice(1);
      expect(bin.length).toBe(counts.binary.frames * counts.binary.bytesPerFrame);
      for (let k = 0; k < counts.binary.frames; k += 97) {
        const cells = rows[k]!.split(',').map(Number);
        for (let j = 0; j < counts.binary.valuesPerFrame; j++) {
          expect(bin.readInt32LE(k * counts.binary.bytesPerFrame + 4 * j)).toBe(cells[7 + j]);
        }
      }
    }
    // The ramps: the files start and end at neutral, the show inside them at the frames the manifest gives.
    const ramp = manifest.controller.ramp;
    expect(ramp?.in_s).toBe(controller!.ramp.duration_s);
    expect(ramp!.showStartFrame).toBe(Math.round(ramp!.in_s * manifest.controller.binary.rate_hz));
  });

  it('logs every download, and a repeated build job changes nothing', async () => {
    const before = await getRelease(PRODUCER, firstRelease);
    await buildJob(firstRelease);
    const after = await getRelease(PRODUCER, firstRelease);
    expect(after.packageSha256).toBe(before.packageSha256);
    expect(after.builtAt).toBe(before.builtAt);
    const logged = await t.tdb.db
      .select()
      .from(releaseDownloads)
      .where(eq(releaseDownloads.releaseId, firstRelease));
    expect(logged).toHaveLength(1);
    expect(logged[0]!.userId).toBe(t.seed.userIds[OPERATOR]);
    expect(after.downloads).toBe(1);
    const audit = await t.tdb.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.action, 'release.downloaded'), eq(auditEvents.subjectId, firstRelease)));
    expect(audit).toHaveLength(1);
  });

  it('keeps a built package immutable: the database refuses a change of its hash', async () => {
    await expect(
      t.tdb.db.execute(
        sql`update releases set package_sha256 = ${'0'.repeat(64)} where id = ${firstRelease}`,
      ),
    ).rejects.toThrow();
  });
});

describe('venue operators', () => {
  it("see only their venues' releases: another venue's is 404 to read and to download", async () => {
    const list = await as(OPERATOR).get(`${base()}/releases`);
    expect(list.status).toBe(200);
    expect((list.body as Release[]).map((r) => r.id)).toContain(firstRelease);
    await scopeOperator([other.venueId]);
    try {
      const hidden = await as(OPERATOR).get(`${base()}/releases`);
      expect((hidden.body as Release[]).map((r) => r.id)).not.toContain(firstRelease);
      expect((await as(OPERATOR).get(`${base()}/releases/${firstRelease}`)).status).toBe(404);
      expect((await download(OPERATOR, firstRelease)).status).toBe(404);
      const ack = await as(OPERATOR).send('post', `${base()}/releases/${firstRelease}/acknowledge`, {});
      expect(ack.status).toBe(404);
    } finally {
      await scopeOperator([first.venueId]);
    }
  });

  it('acknowledge a package as installed once (201, then 409); others may not (403)', async () => {
    const home0 = operatorHomeSchema.parse((await as(OPERATOR).get(`${base()}/home/operator`)).body);
    expect(home0.new.map((x) => x.id)).toContain(firstRelease);
    expect(
      (await as(PRODUCER).send('post', `${base()}/releases/${firstRelease}/acknowledge`, {})).status,
    ).toBe(403);
    const ok = await as(OPERATOR).send('post', `${base()}/releases/${firstRelease}/acknowledge`, {
      note: 'Loaded on controller A',
    });
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);
    const rel = releaseSchema.parse(ok.body);
    expect(rel.acknowledgements).toHaveLength(1);
    expect(rel.acknowledgements[0]!.note).toBe('Loaded on controller A');
    const again = await as(OPERATOR).send('post', `${base()}/releases/${firstRelease}/acknowledge`, {});
    expect(again.status).toBe(409);
    const home = operatorHomeSchema.parse((await as(OPERATOR).get(`${base()}/home/operator`)).body);
    expect(home.new.map((x) => x.id)).not.toContain(firstRelease);
    expect(home.installed.map((x) => x.id)).toContain(firstRelease);
  });

  it('report a problem (400 without text), which the producer sees on their home', async () => {
    const none = await as(OPERATOR).send('post', `${base()}/releases/${firstRelease}/problems`, {
      text: ' ',
    });
    expect(none.status).toBe(400);
    expect((none.body as { issues: { path: string }[] }).issues[0]!.path).toBe('text');
    const ok = await as(OPERATOR).send('post', `${base()}/releases/${firstRelease}/problems`, {
      text: 'Leg 4 encoder reads 2 mm short at park.',
    });
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);
    const home = producerHomeSchema.parse((await as(PRODUCER).get(`${base()}/home/producer`)).body);
    const p = home.problems.find((x) => x.release.id === firstRelease);
    expect(p?.problem.text).toBe('Leg 4 encoder reads 2 mm short at park.');
    expect(p?.problem.by.email).toBe(OPERATOR);
    expect(await mailedTo('problem_reported', firstRelease)).toEqual([PRODUCER, REVIEWER].sort());
  });
});

describe('supersede and withdraw', () => {
  let secondRelease = '';

  it('a newer ready release of the same track at the same venue supersedes the older (still downloadable)', async () => {
    await clear(second);
    secondRelease = (await release(second.id)).id;
    await buildJob(secondRelease);
    expect((await getRelease(PRODUCER, secondRelease)).state).toBe('ready');
    const old = await getRelease(PRODUCER, firstRelease);
    expect(old.state).toBe('superseded');
    expect(old.supersededById).toBe(secondRelease);
    expect((await runById(first.id)).state).toBe('superseded');
    expect((await download(OPERATOR, firstRelease)).status).toBe(200);
  });

  it('a withdrawal needs a reason (400), then the package is gone (410) and the run withdrawn', async () => {
    expect(
      (await as(OPERATOR).send('post', `${base()}/releases/${secondRelease}/withdraw`, { reason: 'x' }))
        .status,
    ).toBe(403);
    const none = await as(PRODUCER).send('post', `${base()}/releases/${secondRelease}/withdraw`, {});
    expect(none.status).toBe(400);
    const ok = await as(PRODUCER).send('post', `${base()}/releases/${secondRelease}/withdraw`, {
      reason: 'The film was re-edited; this cut no longer matches the picture.',
    });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    const rel = releaseSchema.parse(ok.body);
    expect(rel.state).toBe('withdrawn');
    expect(rel.withdrawnBy?.email).toBe(PRODUCER);
    expect(await mailedTo('release_withdrawn', secondRelease)).toEqual([OPERATOR]);
    const gone = await download(OPERATOR, secondRelease);
    expect(gone.status).toBe(410);
    expect((await runById(second.id)).state).toBe('withdrawn');
    const ack = await as(OPERATOR).send('post', `${base()}/releases/${secondRelease}/acknowledge`, {});
    expect(ack.status).toBe(409);
    expect(
      (await as(PRODUCER).send('post', `${base()}/releases/${secondRelease}/withdraw`, { reason: 'again' }))
        .status,
    ).toBe(409);
    const home = operatorHomeSchema.parse((await as(OPERATOR).get(`${base()}/home/operator`)).body);
    expect(home.withdrawn.map((x) => x.id)).toContain(secondRelease);
    expect(home.new.map((x) => x.id)).not.toContain(secondRelease);
    const d = runDecisionSchema.parse((await as(PRODUCER).get(`${base()}/runs/${second.id}/decision`)).body);
    expect(d.actions.release.allowed).toBe(false);
  });
});

describe('a build that cannot succeed', () => {
  it('fails with its reason, and the run is cleared again for a new release', async () => {
    await clear(other);
    const id = (await release(other.id)).id;
    const prefix = (await runById(other.id)).artifactPrefix!;
    await storage.client.send(
      new DeleteObjectCommand({ Bucket: storage.bucket, Key: `${prefix}manifest.json` }),
    );
    await buildJob(id);
    const rel = await getRelease(PRODUCER, id);
    expect(rel.state).toBe('failed');
    expect(rel.failureReason).toMatch(/manifest\.json is missing/);
    expect((await runById(other.id)).state).toBe('cleared');
    const home = producerHomeSchema.parse((await as(PRODUCER).get(`${base()}/home/producer`)).body);
    expect(home.releasesInProgress.find((x) => x.id === id)?.state).toBe('failed');
    expect(home.clearedNotReleased.map((x) => x.id)).toContain(other.id);
    const [row] = await t.tdb.db.select().from(releases).where(eq(releases.id, id));
    expect(row!.packageKey).toBeNull();
  });
});
