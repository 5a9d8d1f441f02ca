import type { Request } from 'express';

/** Who acts, for the audit log: the signed-in user, or the API token by its id. */
export function actorOf(req: Request): { id: string; email: string } | null {
  if (req.user) return { id: req.user.id, email: req.user.email };
  if (req.member?.tokenId)
    return { id: req.member.tokenId, email: `api-token:${req.member.tokenId.slice(0, 8)}` };
  return null;
}
