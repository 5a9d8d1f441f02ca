// API tokens for pipelines that push tracks and takes (studio admins).
import { Router } from 'express';
import { desc, eq, isNull } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { apiTokens } from '../db/schema';
import { inStudio } from '../db/scope';
import { requirePermission } from '../auth/require-permission';
import { isUuid, parseBody } from '../lib/validate';
import { notFound } from '../lib/http-error';
import { actorOf } from '../lib/actor';
import { hashToken, newToken } from '../lib/tokens';
import { recordAudit } from '../audit';
import { createTokenBody } from '../../shared/schemas/pipeline';
import type { ApiToken } from '../../shared/schemas/pipeline';

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
