// The audit log of a studio, for studio admins and safety reviewers: filtered by kind, person and
// date, newest first, as JSON pages or as one CSV file.
import { Router } from 'express';
import type { Response } from 'express';
import { and, desc, eq, gte, ilike, inArray, isNull, like, lt, or } from 'drizzle-orm';
import type { SQL } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { auditEvents, memberships } from '../db/schema';
import { requirePermission } from '../auth/require-permission';
import { badRequest } from '../lib/http-error';
import { isUuid, parseBody } from '../lib/validate';
import {
  AUDIT_CSV_COLUMNS,
  auditActionsOf,
  auditKindOf,
  auditLinkOf,
  auditQuery,
  auditWords,
} from '../../shared/schemas/audit';
import type { AuditEvent, AuditQuery } from '../../shared/schemas/audit';

const DAY_MS = 24 * 60 * 60 * 1000;
const isDay = (s: string) => /^\d{4}-\d{2}-\d{2}$/.test(s);

/** The filters as SQL; a `to` day includes that whole day (UTC). */
function conditions(deps: AppDeps, studioId: string, q: AuditQuery): SQL {
  const memberIds = subquery(deps, studioId);
  const conds: (SQL | undefined)[] = [
    or(
      eq(auditEvents.studioId, studioId),
      // Sign-ins and sign-outs belong to no studio; show those of this studio's members.
      and(isNull(auditEvents.studioId), inArray(auditEvents.actorUserId, memberIds)),
    ),
  ];
  if (q.kind) {
    const { exact, prefixes } = auditActionsOf(q.kind);
    conds.push(
      or(
        exact.length ? inArray(auditEvents.action, exact) : undefined,
        ...prefixes.map((p) => like(auditEvents.action, `${p}%`)),
      ) ?? eq(auditEvents.action, '(none)'),
    );
  }
  if (q.person) {
    conds.push(
      isUuid(q.person) ? eq(auditEvents.actorUserId, q.person) : ilike(auditEvents.actorEmail, q.person),
    );
  }
  const from = q.from ? new Date(q.from) : null;
  const to = q.to ? new Date(isDay(q.to) ? Date.parse(q.to) + DAY_MS : Date.parse(q.to)) : null;
  if (from && to && from >= to) {
    throw badRequest('The audit query has a problem: from: must be before to', [
      { path: 'from', message: 'must be before to' },
    ]);
  }
  if (from) conds.push(gte(auditEvents.at, from));
  if (to) conds.push(lt(auditEvents.at, to));
  if (q.before) conds.push(lt(auditEvents.id, q.before));
  return and(...conds) as SQL;
}

function subquery(deps: AppDeps, studioId: string) {
  return deps.db
    .select({ id: memberships.userId })
    .from(memberships)
    .where(eq(memberships.studioId, studioId));
}

function toEvent(e: typeof auditEvents.$inferSelect): AuditEvent {
  const raw = {
    action: e.action,
    actorEmail: e.actorEmail,
    subjectType: e.subjectType,
    subjectId: e.subjectId,
    detail: (e.detail ?? {}) as Record<string, unknown>,
  };
  return {
    id: e.id,
    at: e.at.toISOString(),
    actorEmail: e.actorEmail,
    action: e.action,
    kind: auditKindOf(e.action),
    words: auditWords(raw),
    link: auditLinkOf(raw),
    subjectType: e.subjectType,
    subjectId: e.subjectId,
    detail: raw.detail,
  };
}

/** One CSV field (RFC 4180): quoted when it holds a comma, quote, CR or LF; quotes doubled. */
export function csvField(v: string | number | null): string {
  const s = v === null ? '' : String(v);
  // A leading =, +, - or @ would run as a formula in a spreadsheet; a leading apostrophe keeps it text.
  const safe = /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

const CSV_PAGE = 1000;

async function writeCsv(deps: AppDeps, studioId: string, q: AuditQuery, res: Response) {
  res.type('text/csv; charset=utf-8');
  res.attachment(`audit-${new Date().toISOString().slice(0, 10)}.csv`);
  res.write(`${AUDIT_CSV_COLUMNS.join(',')}\r\n`);
  let before = q.before;
  for (;;) {
    const rows = await deps.db
      .select()
      .from(auditEvents)
      .where(conditions(deps, studioId, { ...q, before }))
      .orderBy(desc(auditEvents.id))
      .limit(CSV_PAGE);
    for (const row of rows) {
      const e = toEvent(row);
      const fields = [
        e.id,
        e.at,
        e.kind,
        e.action,
        e.actorEmail,
        e.words,
        e.link?.kind ?? null,
        e.link?.id ?? null,
      ];
      res.write(`${fields.map(csvField).join(',')}\r\n`);
    }
    if (rows.length < CSV_PAGE) break;
    before = rows.at(-1)!.id;
  }
  res.end();
}

/**
 * GET /api/studios/:studioId/audit: the studio's events, plus the sign-ins and sign-outs of its
 * members (those belong to no studio), newest first. GET .../audit.csv: the same filters as CSV.
 */
export function auditRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  r.get('/', requirePermission('audit.read'), async (req, res) => {
    const q = parseBody(auditQuery, req.query, 'The audit query');
    const studioId = req.member!.studioId;
    const rows = await deps.db
      .select()
      .from(auditEvents)
      .where(conditions(deps, studioId, q))
      .orderBy(desc(auditEvents.id))
      .limit(q.limit + 1);
    const page = rows.slice(0, q.limit);
    res.json({
      events: page.map(toEvent),
      nextBefore: rows.length > q.limit ? (page.at(-1)?.id ?? null) : null,
    });
  });
  return r;
}

/** GET /api/studios/:studioId/audit.csv (mounted beside the audit router). */
export function auditCsvRouter(deps: AppDeps): Router {
  const r = Router({ mergeParams: true });
  r.get('/', requirePermission('audit.read'), async (req, res) => {
    const q = parseBody(auditQuery, req.query, 'The audit query');
    await writeCsv(deps, req.member!.studioId, q, res);
  });
  return r;
}
