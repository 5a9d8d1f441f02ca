import type { Db, Tx } from './db/client';
import { auditEvents } from './db/schema';

export interface AuditInput {
  studioId: string | null;
  actor: { id: string; email: string } | null;
  action: string;
  subjectType: string;
  subjectId?: string | null;
  detail?: Record<string, unknown>;
}

/** Appends one event to the audit log (the table refuses updates and deletes). */
export async function recordAudit(db: Db | Tx, e: AuditInput): Promise<void> {
  await db.insert(auditEvents).values({
    studioId: e.studioId,
    actorUserId: e.actor?.id ?? null,
    actorEmail: e.actor?.email ?? null,
    action: e.action,
    subjectType: e.subjectType,
    subjectId: e.subjectId ?? null,
    detail: e.detail ?? {},
  });
}
