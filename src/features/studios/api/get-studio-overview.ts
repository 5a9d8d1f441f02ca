import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { roleSchema } from '../../../../shared/schemas/roles';
import { api } from '../../../lib/api-client';

const count = z.number().int().nonnegative();

export const studioOverviewSchema = z.object({
  studio: z.object({ id: z.string(), name: z.string(), slug: z.string() }),
  roles: z.array(roleSchema),
  counts: z.object({
    venues: count,
    members: count,
    tracks: count,
    awaitingReview: count,
    held: count,
    released: count,
  }),
});
export type StudioOverview = z.infer<typeof studioOverviewSchema>;

/** The studio's name, the caller's roles in it and the counts the home screens show. */
export function getStudioOverview(studioId: string): Promise<StudioOverview> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/overview`, studioOverviewSchema);
}

export function getStudioOverviewQueryOptions(studioId: string) {
  return queryOptions({
    queryKey: ['studios', studioId, 'overview'],
    queryFn: () => getStudioOverview(studioId),
  });
}

export function useStudioOverview(studioId: string) {
  return useQuery(getStudioOverviewQueryOptions(studioId));
}
