// The studio's venues: list (scoped for venue operators), create, and each venue's motion base and
// the cueing and budget profile versions its new runs use.
import { Router } from 'express';
import type { Request } from 'express';
import { asc, eq } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { profileVersions, profiles, venueSettings, venues } from '../db/schema';
import { inStudio, visibleVenues } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { allows, canSeeVenue } from '../auth/permissions';
import { isUuid, parseBody } from '../lib/validate';
import { badRequest, forbidden, notFound } from '../lib/http-error';
import { actorOf } from '../lib/actor';
import { recordAudit } from '../audit';
import {
  createVenueBody,
  venueBaseBody,
  venueControllerBody,
  venueSettingsBody,
} from '../../shared/schemas/pipeline';
import { controllerOutputSchema } from '../../shared/schemas/controller-output';
import type { VenueDetail } from '../../shared/schemas/pipeline';
import type { Venue } from '../../shared/schemas/api';
import { MotionBaseError, parseMotionBase } from '../../shared/schemas/motion-base';
import { versionRef } from '../pipeline/views';

interface BaseSummary {
  kind?: 'hexapod' | 'planar3';
  controllerRate_hz?: number;
  seats_m?: unknown[];
}

/** A profile version in words for the audit log: "Name v3", or null for none. */
function versionLabel(v: { name: string; version: number } | null): string | null {
  return v ? `${v.name} v${v.version}` : null;
}

/** The studio's venues: the list, a new venue, one venue's motion base and the profile versions its runs use. */
export function venuesRouter(deps: AppDeps): Router {
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
      controller: controllerOutputSchema.parse(v.venue.controller),
      cueingVersion: await versionRef(deps.db, studioId, v.cueing),
      budgetVersion: await versionRef(deps.db, studioId, v.budget),
    };
  };

  r.get('/', requirePermission('venues.read'), async (req, res) => {
    const m = req.member!;
    const rows = await deps.db
      .select()
      .from(venues)
      .where(inStudio(venues, m.studioId, visibleVenues(m)))
      .orderBy(asc(venues.name));
    const out: Venue[] = rows.map((v) => {
      const base = v.base as BaseSummary;
      return {
        id: v.id,
        name: v.name,
        site: v.site,
        timeZone: v.timeZone,
        baseKind: base.kind ?? 'hexapod',
        controllerRate_hz: base.controllerRate_hz ?? 0,
        seatCount: base.seats_m?.length ?? 0,
      };
    });
    res.json(out);
  });
  r.get('/:venueId', requirePermission('venues.read'), async (req, res) => {
    const m = req.member!;
    if (!canSeeVenue(m, String(req.params.venueId))) throw notFound('No such venue.');
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

  /** Writes one change to a venue and its audit record in one transaction; answers the venue as stored. */
  const changeVenue = async (
    req: Request,
    venueId: string,
    set: Partial<Pick<typeof venues.$inferInsert, 'base' | 'controller'>>,
    action: string,
    detail_: Record<string, unknown>,
  ): Promise<VenueDetail> => {
    const m = req.member!;
    await deps.db.transaction(async (tx) => {
      await tx
        .update(venues)
        .set(set)
        .where(inStudio(venues, m.studioId, eq(venues.id, venueId)));
      await recordAudit(tx, {
        studioId: m.studioId,
        actor: actorOf(req),
        action,
        subjectType: 'venue',
        subjectId: venueId,
        detail: detail_,
      });
    });
    return detail(m.studioId, venueId);
  };

  // Finished runs keep the base they used in their manifest; queued runs use the base as it is when they start.
  r.put('/:venueId/base', requirePermission('venues.configure'), async (req, res) => {
    const before = await detail(req.member!.studioId, String(req.params.venueId));
    const body = parseBody(venueBaseBody, req.body, 'The motion base form');
    const base = validBase(body.base);
    res.json(
      await changeVenue(req, before.id, { base }, 'venue.base_changed', {
        venueName: before.name,
        kind: base.kind,
        from: before.base,
        to: base,
      }),
    );
  });

  // The controller settings are copied into each run's parameters when it is queued: runs already
  // queued or finished keep the ramps and encoder they were made with.
  r.put('/:venueId/controller', requirePermission('venues.configure'), async (req, res) => {
    const before = await detail(req.member!.studioId, String(req.params.venueId));
    const controller = parseBody(venueControllerBody, req.body, 'The controller settings');
    res.json(
      await changeVenue(req, before.id, { controller }, 'venue.controller_changed', {
        venueName: before.name,
        from: before.controller,
        to: controller,
      }),
    );
  });

  r.put('/:venueId/settings', async (req, res) => {
    const m = req.member!;
    if (!allows(m.roles, 'profiles.cueing.write') && !allows(m.roles, 'profiles.budget.write'))
      throw forbidden();
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
        // What changed (a version id, or null for none), what it was before, and the person's reason;
        // the venue's and versions' names as they were, so the log reads in words after renames.
        detail: {
          venueName: before.name,
          ...(body.cueingVersionId !== undefined
            ? {
                cueingVersionId: body.cueingVersionId,
                cueingVersionBefore: before.cueingVersion?.id ?? null,
                cueingLabel: versionLabel(await versionRef(deps.db, m.studioId, body.cueingVersionId)),
                cueingLabelBefore: versionLabel(before.cueingVersion),
              }
            : {}),
          ...(body.budgetVersionId !== undefined
            ? {
                budgetVersionId: body.budgetVersionId,
                budgetVersionBefore: before.budgetVersion?.id ?? null,
                budgetLabel: versionLabel(await versionRef(deps.db, m.studioId, body.budgetVersionId)),
                budgetLabelBefore: versionLabel(before.budgetVersion),
              }
            : {}),
          reason: body.reason,
        },
      });
    });
    res.json(await detail(m.studioId, before.id));
  });
  return r;
}
