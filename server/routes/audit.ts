import { Router } from 'express';
import { and, desc, eq, inArray, isNull, lt, or } from 'drizzle-orm';
import { z } from 'zod';
import type { AppDeps } from '../deps';
import { auditEvents, memberships } from '../db/schema';
import { requirePermission } from '../auth/require-permission';
import { parseBody } from '../lib/validate';
import type { AuditEvent } from '../../shared/schemas/api';

const query = z.object({
  before: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});

/**
 * GET /api/studios/:studioId/audit: the studio's events, plus the sign-ins and sign-outs of its
 * members (those belong to no studio), newest first.
 */
export function auditRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  r.get('/', requirePermission('audit.read'), async (req, res) => {
    const q = parseBody(query, req.query, 'The audit query');
    const studioId = req.member!.studioId;
    const memberIds = deps.db
      .select({ id: memberships.userId })
      .from(memberships)
      .where(eq(memberships.studioId, studioId));
    const rows = await deps.db
      .select()
      .from(auditEvents)
      .where(
        and(
          or(
            eq(auditEvents.studioId, studioId),
            and(isNull(auditEvents.studioId), inArray(auditEvents.actorUserId, memberIds)),
          ),
          q.before ? lt(auditEvents.id, q.before) : undefined,
        ),
      )
      .orderBy(desc(auditEvents.id))
      .limit(q.limit + 1);
    const page = rows.slice(0, q.limit);
    const events: AuditEvent[] = page.map((e) => ({
      id: e.id,
      at: e.at.toISOString(),
      actorEmail: e.actorEmail,
      action: e.action,
      subjectType: e.subjectType,
      subjectId: e.subjectId,
      detail: e.detail as Record<string, unknown>,
    }));
    res.json({ events, nextBefore: rows.length > q.limit ? (page.at(-1)?.id ?? null) : null });
  });
  return r;
}
