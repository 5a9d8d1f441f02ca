import { infiniteQueryOptions, useInfiniteQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { auditEventSchema } from '../../../../shared/schemas/api';
import { api } from '../../../lib/api-client';

export const AUDIT_PAGE_SIZE = 50;

export const auditPageSchema = z.object({
  events: z.array(auditEventSchema),
  nextBefore: z.number().int().nullable(),
});
export type AuditPage = z.infer<typeof auditPageSchema>;

/** One page of the studio's audit log, newest first, strictly older than event id `before` when given. */
export function getAuditEvents(studioId: string, before?: number): Promise<AuditPage> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/audit`, auditPageSchema, {
    before,
    limit: AUDIT_PAGE_SIZE,
  });
}

export function getAuditEventsQueryOptions(studioId: string) {
  return infiniteQueryOptions({
    queryKey: ['studios', studioId, 'audit'],
    queryFn: ({ pageParam }) => getAuditEvents(studioId, pageParam),
    initialPageParam: undefined as number | undefined,
    getNextPageParam: (last) => last.nextBefore ?? undefined,
  });
}

export function useAuditEvents(studioId: string) {
  return useInfiniteQuery(getAuditEventsQueryOptions(studioId));
}
