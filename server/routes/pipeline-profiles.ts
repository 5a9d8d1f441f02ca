// Cueing and budget profiles with immutable versions, venue settings, and API tokens.
import { Router } from 'express';
import type { Request } from 'express';
import { asc, desc, eq, isNull, max } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { apiTokens, profileVersions, profiles, venueSettings, venues } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { allows } from '../auth/permissions';
import { isUuid, parseBody } from '../lib/validate';
import { badRequest, forbidden, notFound } from '../lib/http-error';
import { actorOf } from '../lib/actor';
import { hashToken, newToken } from '../lib/tokens';
import { recordAudit } from '../audit';
import {
  createProfileBody,
  createTokenBody,
  createVenueBody,
  newVersionBody,
  profileKindSchema,
  venueBaseBody,
  venueSettingsBody,
} from '../../shared/schemas/pipeline';
import { MotionBaseError, parseMotionBase } from '../../shared/schemas/motion-base';
import type { ApiToken, Profile, VenueDetail } from '../../shared/schemas/pipeline';
import { parseCueingProfile } from '../../shared/schemas/cueing-profile';
import { budgetSchema } from '../../shared/schemas/budget';
import { formatJsonPath } from '../../shared/schemas/budget';
import { versionRef } from '../pipeline/views';
import { z } from 'zod';

/** Validates a profile's parameters with the same schema the CLI and the worker use. */
export function validateParams(kind: 'cueing' | 'budget', params: unknown): unknown {
  if (kind === 'cueing') {
    const r = parseCueingProfile(params);
    if (!r.ok)
      throw badRequest(
        `The cueing profile has ${r.issues.length} problem(s): ${r.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`,
        r.issues.map((i) => ({ path: i.path, message: i.message })),
      );
    return r.profile;
  }
  const r = budgetSchema.safeParse(params);
  if (!r.success) {
    const issues = r.error.issues.map((i) => ({
      path: i.path.length ? formatJsonPath(i.path) : '(budget)',
      message: i.message,
    }));
    throw badRequest(
      `The budget has ${issues.length} problem(s): ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`,
      issues,
    );
  }
  return r.data;
}

const writePermission = (kind: 'cueing' | 'budget'): 'profiles.cueing.write' | 'profiles.budget.write' =>
  kind === 'cueing' ? 'profiles.cueing.write' : 'profiles.budget.write';

async function loadProfile(db: Db | Tx, studioId: string, id: string): Promise<Profile> {
  if (!isUuid(id)) throw notFound('No such profile.');
  const [p] = await db
    .select()
    .from(profiles)
    .where(inStudio(profiles, studioId, eq(profiles.id, id)));
  if (!p) throw notFound('No such profile.');
  const vs = await db
    .select()
    .from(profileVersions)
    .where(inStudio(profileVersions, studioId, eq(profileVersions.profileId, p.id)))
    .orderBy(desc(profileVersions.version));
  return {
    id: p.id,
    kind: p.kind,
    name: p.name,
    versions: vs.map((v) => ({
      id: v.id,
      version: v.version,
      note: v.note,
      used: v.usedAt !== null,
      createdAt: v.createdAt.toISOString(),
      params: v.params,
    })),
  };
}

/** Appends the next version of a profile (1 for a new one) and records it in the audit log. */
async function addVersion(
  tx: Tx,
  req: Request,
  p: { id: string; studioId: string; kind: 'cueing' | 'budget'; name: string; params: unknown; note: string },
): Promise<void> {
  const [last] = await tx
    .select({ n: max(profileVersions.version) })
    .from(profileVersions)
    .where(inStudio(profileVersions, p.studioId, eq(profileVersions.profileId, p.id)));
  const version = (last?.n ?? 0) + 1;
  const [v] = await tx
    .insert(profileVersions)
    .values({
      studioId: p.studioId,
      profileId: p.id,
      version,
      params: p.params,
      note: p.note,
      createdBy: req.user?.id ?? null,
    })
    .returning();
  await recordAudit(tx, {
    studioId: p.studioId,
    actor: actorOf(req),
    action: 'profile.version_created',
    subjectType: 'profile_version',
    subjectId: v!.id,
    detail: { kind: p.kind, name: p.name, version },
  });
}

export function profilesRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  r.get('/', requirePermission('profiles.read'), async (req, res) => {
    const { kind } = parseBody(
      z.object({ kind: profileKindSchema.optional() }),
      req.query,
      'The profile query',
    );
    const studioId = req.member!.studioId;
    const rows = await deps.db
      .select({ id: profiles.id })
      .from(profiles)
      .where(inStudio(profiles, studioId, kind ? eq(profiles.kind, kind) : undefined))
      .orderBy(asc(profiles.name));
    res.json(await Promise.all(rows.map((p) => loadProfile(deps.db, studioId, p.id))));
  });

  r.post('/', async (req, res) => {
    const body = parseBody(createProfileBody, req.body, 'The profile form');
    if (!allows(req.member!.roles, writePermission(body.kind))) throw forbidden();
    const params = validateParams(body.kind, body.params);
    const studioId = req.member!.studioId;
    const id = await deps.db.transaction(async (tx) => {
      const [p] = await tx
        .insert(profiles)
        .values({ studioId, kind: body.kind, name: body.name })
        .returning();
      await addVersion(tx, req, { ...p!, params, note: body.note });
      return p!.id;
    });
    res.status(201).json(await loadProfile(deps.db, studioId, id));
  });

  r.get('/:profileId', requirePermission('profiles.read'), async (req, res) => {
    res.json(await loadProfile(deps.db, req.member!.studioId, String(req.params.profileId)));
  });

  // Versions are never edited: a change is a new version, so a run's inputs stay as they were.
  r.post('/:profileId/versions', async (req, res) => {
    const studioId = req.member!.studioId;
    const profile = await loadProfile(deps.db, studioId, String(req.params.profileId));
    if (!allows(req.member!.roles, writePermission(profile.kind))) throw forbidden();
    const body = parseBody(newVersionBody, req.body, 'The profile version');
    const params = validateParams(profile.kind, body.params);
    await deps.db.transaction((tx) => addVersion(tx, req, { ...profile, studioId, params, note: body.note }));
    res.status(201).json(await loadProfile(deps.db, studioId, profile.id));
  });
  return r;
}

/** GET and PUT of one venue's motion base and profile versions (the list is in venues.ts). */
export function venueSettingsRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  const detail = async (studioId: string, venueId: string): Promise<VenueDetail> => {
    if (!isUuid(venueId)) throw notFound('No such venue.');
    const [v] = await deps.db
      .select({ venue: venues, cueing: venueSettings.cueingVersionId, budget: venueSettings.budgetVersionId })
      .from(venues)
      .leftJoin(venueSettings, eq(venueSettings.venueId, venues.id))
      .where(inStudio(venues, studioId, eq(venues.id, venueId)));
    if (!v) throw notFound('No such venue.');
    return {
      id: v.venue.id,
      name: v.venue.name,
      site: v.venue.site,
      timeZone: v.venue.timeZone,
      base: v.venue.base,
      cueingVersion: await versionRef(deps.db, studioId, v.cueing),
      budgetVersion: await versionRef(deps.db, studioId, v.budget),
    };
  };

  r.get('/:venueId', requirePermission('venues.read'), async (req, res) => {
    const m = req.member!;
    const onlyOperator = m.roles.every((x) => x === 'venue_operator');
    if (onlyOperator && !m.venueIds.includes(String(req.params.venueId))) throw notFound('No such venue.');
    res.json(await detail(m.studioId, String(req.params.venueId)));
  });

  /** The motion base from a form: every geometry problem comes back with its JSON path. */
  const validBase = (input: unknown) => {
    try {
      return parseMotionBase(input);
    } catch (e) {
      if (e instanceof MotionBaseError) {
        throw badRequest(
          `The motion base has ${e.issues.length} problem(s): ${e.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`,
          e.issues.map((i) => ({ path: i.path, message: i.message })),
        );
      }
      throw e;
    }
  };

  r.post('/', requirePermission('venues.create'), async (req, res) => {
    const m = req.member!;
    const body = parseBody(createVenueBody, req.body, 'The venue form');
    const base = validBase(body.base);
    const id = await deps.db.transaction(async (tx) => {
      const [v] = await tx
        .insert(venues)
        .values({ studioId: m.studioId, name: body.name, site: body.site, timeZone: body.timeZone, base })
        .returning();
      await recordAudit(tx, {
        studioId: m.studioId,
        actor: actorOf(req),
        action: 'venue.created',
        subjectType: 'venue',
        subjectId: v!.id,
        detail: { name: body.name, kind: base.kind },
      });
      return v!.id;
    });
    res.status(201).json(await detail(m.studioId, id));
  });

  // Finished runs keep the base they used in their manifest; queued runs use the base as it is when they start.
  r.put('/:venueId/base', requirePermission('venues.configure'), async (req, res) => {
    const m = req.member!;
    const before = await detail(m.studioId, String(req.params.venueId));
    const body = parseBody(venueBaseBody, req.body, 'The motion base form');
    const base = validBase(body.base);
    await deps.db.transaction(async (tx) => {
      await tx
        .update(venues)
        .set({ base })
        .where(inStudio(venues, m.studioId, eq(venues.id, before.id)));
      await recordAudit(tx, {
        studioId: m.studioId,
        actor: actorOf(req),
        action: 'venue.base_changed',
        subjectType: 'venue',
        subjectId: before.id,
        detail: { kind: base.kind, from: before.base, to: base },
      });
    });
    res.json(await detail(m.studioId, before.id));
  });

  r.put('/:venueId/settings', async (req, res) => {
    const m = req.member!;
    const body = parseBody(venueSettingsBody, req.body, 'The venue settings');
    const before = await detail(m.studioId, String(req.params.venueId));
    // The motion engineer chooses the cueing profile; the safety reviewer owns the budget.
    if (body.cueingVersionId !== undefined && !allows(m.roles, 'profiles.cueing.write'))
      throw forbidden('Only a motion engineer chooses the cueing profile.');
    if (body.budgetVersionId !== undefined && !allows(m.roles, 'profiles.budget.write'))
      throw forbidden('Only a safety reviewer chooses the budget profile.');
    for (const [field, id, kind] of [
      ['cueingVersionId', body.cueingVersionId, 'cueing'],
      ['budgetVersionId', body.budgetVersionId, 'budget'],
    ] as const) {
      if (!id) continue;
      const [v] = await deps.db
        .select({ kind: profiles.kind })
        .from(profileVersions)
        .innerJoin(profiles, eq(profiles.id, profileVersions.profileId))
        .where(inStudio(profileVersions, m.studioId, eq(profileVersions.id, id)));
      if (!v || v.kind !== kind)
        throw badRequest('Unknown profile version.', [
          { path: field, message: `not a ${kind} profile version of this studio` },
        ]);
    }
    await deps.db.transaction(async (tx) => {
      await tx
        .insert(venueSettings)
        .values({
          venueId: before.id,
          studioId: m.studioId,
          cueingVersionId: body.cueingVersionId ?? null,
          budgetVersionId: body.budgetVersionId ?? null,
        })
        .onConflictDoUpdate({
          target: venueSettings.venueId,
          set: {
            ...(body.cueingVersionId !== undefined ? { cueingVersionId: body.cueingVersionId } : {}),
            ...(body.budgetVersionId !== undefined ? { budgetVersionId: body.budgetVersionId } : {}),
          },
        });
      await recordAudit(tx, {
        studioId: m.studioId,
        actor: actorOf(req),
        action: 'venue.profiles_changed',
        subjectType: 'venue',
        subjectId: before.id,
        detail: body,
      });
    });
    res.json(await detail(m.studioId, before.id));
  });
  return r;
}

const toToken = (t: typeof apiTokens.$inferSelect): ApiToken => ({
  id: t.id,
  name: t.name,
  prefix: t.prefix,
  createdAt: t.createdAt.toISOString(),
  lastUsedAt: t.lastUsedAt?.toISOString() ?? null,
  revokedAt: t.revokedAt?.toISOString() ?? null,
});

export function tokensRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  const admin = requirePermission('tokens.manage');
  r.get('/', admin, async (req, res) => {
    const rows = await deps.db
      .select()
      .from(apiTokens)
      .where(inStudio(apiTokens, req.member!.studioId))
      .orderBy(desc(apiTokens.createdAt));
    res.json(rows.map(toToken));
  });
  r.post('/', admin, async (req, res) => {
    const body = parseBody(createTokenBody, req.body, 'The token form');
    const token = `lwk_${newToken(30)}`;
    const studioId = req.member!.studioId;
    const row = await deps.db.transaction(async (tx) => {
      const [t] = await tx
        .insert(apiTokens)
        .values({
          studioId,
          name: body.name,
          tokenHash: hashToken(token),
          prefix: token.slice(0, 10),
          createdBy: req.user?.id ?? null,
        })
        .returning();
      await recordAudit(tx, {
        studioId,
        actor: actorOf(req),
        action: 'token.created',
        subjectType: 'api_token',
        subjectId: t!.id,
        detail: { name: body.name },
      });
      return t!;
    });
    // The token itself is shown once; only its hash is kept.
    res.status(201).json({ ...toToken(row), token });
  });
  r.delete('/:id', admin, async (req, res) => {
    const studioId = req.member!.studioId;
    const id = String(req.params.id);
    if (!isUuid(id)) throw notFound('No such token.');
    const [t] = await deps.db
      .update(apiTokens)
      .set({ revokedAt: new Date() })
      .where(inStudio(apiTokens, studioId, eq(apiTokens.id, id), isNull(apiTokens.revokedAt)))
      .returning();
    if (!t) throw notFound('No such token.');
    await recordAudit(deps.db, {
      studioId,
      actor: actorOf(req),
      action: 'token.revoked',
      subjectType: 'api_token',
      subjectId: id,
      detail: { name: t.name },
    });
    res.status(204).end();
  });
  return r;
}
