// The role homes' lists: the work waiting for each role, most urgent first (shared/schemas/homes.ts).
import { queryOptions, useQuery } from '@tanstack/react-query';
import type { z } from 'zod';
import {
  engineerHomeSchema,
  operatorHomeSchema,
  producerHomeSchema,
  reviewQueueSchema,
} from '../../../../shared/schemas/homes';
import type { EngineerHome, OperatorHome, ProducerHome, ReviewQueue } from '../../../../shared/schemas/homes';
import { api } from '../../../lib/api-client';
import { homeKeysPrefix } from '../../../lib/queries/releases';

interface Homes {
  review: ReviewQueue;
  producer: ProducerHome;
  engineer: EngineerHome;
  operator: OperatorHome;
}
type HomeName = keyof Homes;

const HOME_SCHEMAS: { [K in HomeName]: z.ZodType<Homes[K]> } = {
  review: reviewQueueSchema,
  producer: producerHomeSchema,
  engineer: engineerHomeSchema,
  operator: operatorHomeSchema,
};

/** GET /api/studios/:id/home/:name. */
export function getHome<K extends HomeName>(studioId: string, name: K): Promise<Homes[K]> {
  return api.get(`/api/studios/${encodeURIComponent(studioId)}/home/${name}`, HOME_SCHEMAS[name]);
}

export function getHomeQueryOptions<K extends HomeName>(studioId: string, name: K) {
  return queryOptions({
    queryKey: [...homeKeysPrefix(studioId), name] as const,
    queryFn: () => getHome(studioId, name),
  });
}

export function useHome<K extends HomeName>(studioId: string, name: K) {
  return useQuery(getHomeQueryOptions(studioId, name));
}
