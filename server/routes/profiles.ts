// Cueing and budget profiles with immutable versions.
import { Router } from 'express';
import type { Request, RequestHandler } from 'express';
import { asc, desc, eq, max } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { profileVersions, profiles } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { allows } from '../auth/permissions';
import { isUuid, parseBody } from '../lib/validate';
import { badRequest, forbidden, notFound } from '../lib/http-error';
import { actorOf } from '../lib/actor';
import { recordAudit } from '../audit';
import { createProfileBody, newVersionBody, profileKindSchema } from '../../shared/schemas/pipeline';
import type { Profile } from '../../shared/schemas/pipeline';
import { parseCueingProfile } from '../../shared/schemas/cueing-profile';
import { budgetSchema } from '../../shared/schemas/budget';
import { formatJsonPath } from '../../shared/schemas/budget';
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

  // Which profile kind decides the exact permission; a member who may write neither kind is refused
  // before the body or the profile is read.
  const mayWriteSome: RequestHandler = (req, _res, next) => {
    const roles = req.member!.roles;
    if (!allows(roles, 'profiles.cueing.write') && !allows(roles, 'profiles.budget.write')) throw forbidden();
    next();
  };

  r.post('/', mayWriteSome, async (req, res) => {
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
  r.post('/:profileId/versions', mayWriteSome, async (req, res) => {
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
