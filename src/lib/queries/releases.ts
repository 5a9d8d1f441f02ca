// Releases, needed by several features (the run page's decision panel releases a run, the role homes
// acknowledge and report problems, the release pages list and withdraw): the calls, their query
// options and their query keys are written here once.
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { QueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { releaseCreatedSchema, releaseSchema } from '../../../shared/schemas/release';
import type { Release, ReleaseCreated, ReleaseState } from '../../../shared/schemas/release';
import { api } from '../api-client';

export const releaseKeys = {
  /** The prefix of every release query of the studio. */
  all: (studioId: string) => ['studios', studioId, 'releases'] as const,
  list: (studioId: string, filters: ReleaseFilters) =>
    ['studios', studioId, 'releases', 'list', filters] as const,
  detail: (studioId: string, releaseId: string) => ['studios', studioId, 'releases', releaseId] as const,
};

/** The prefix of the role homes' queries (written here so a release action can refresh them). */
export const homeKeysPrefix = (studioId: string) => ['studios', studioId, 'home'] as const;
/** The prefix of a run's queries (its detail, decision and series). */
export const runKeysPrefix = (studioId: string, runId: string) =>
  ['studios', studioId, 'runs', runId] as const;

export interface ReleaseFilters {
  venueId?: string | undefined;
  state?: ReleaseState | undefined;
  runId?: string | undefined;
}

const base = (studioId: string) => `/api/studios/${encodeURIComponent(studioId)}/releases`;

export function getReleases(studioId: string, filters: ReleaseFilters = {}): Promise<Release[]> {
  return api.get(base(studioId), z.array(releaseSchema), {
    venueId: filters.venueId,
    state: filters.state,
    runId: filters.runId,
  });
}

export function getReleasesQueryOptions(studioId: string, filters: ReleaseFilters = {}) {
  return queryOptions({
    queryKey: releaseKeys.list(studioId, filters),
    queryFn: () => getReleases(studioId, filters),
  });
}

export function useReleases(studioId: string, filters: ReleaseFilters = {}) {
  return useQuery(getReleasesQueryOptions(studioId, filters));
}

export function getRelease(studioId: string, releaseId: string): Promise<Release> {
  return api.get(`${base(studioId)}/${encodeURIComponent(releaseId)}`, releaseSchema);
}

export function getReleaseQueryOptions(studioId: string, releaseId: string) {
  return queryOptions({
    queryKey: releaseKeys.detail(studioId, releaseId),
    queryFn: () => getRelease(studioId, releaseId),
    // A package being built is asked about again until it is ready or failed.
    refetchInterval: (query) => (query.state.data?.state === 'building' ? 2000 : false),
  });
}

export function useRelease(studioId: string, releaseId: string) {
  return useQuery(getReleaseQueryOptions(studioId, releaseId));
}

/** Where the browser downloads a release's package (session cookie, same origin; the server logs it). */
export function releasePackageUrl(studioId: string, releaseId: string): string {
  return `${base(studioId)}/${encodeURIComponent(releaseId)}/package`;
}

/** After any release action: the releases, the homes and the run it came from are asked for again. */
function refreshAfterRelease(queryClient: QueryClient, studioId: string, runId: string | undefined) {
  const keys: (readonly string[])[] = [releaseKeys.all(studioId), homeKeysPrefix(studioId)];
  if (runId) keys.push(runKeysPrefix(studioId, runId));
  return Promise.all(keys.map((queryKey) => queryClient.invalidateQueries({ queryKey })));
}

/** POST .../runs/:run/release: a producer releases a cleared run to its venue. */
export function useCreateRelease(studioId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (runId: string): Promise<ReleaseCreated> =>
      api.post(
        `/api/studios/${encodeURIComponent(studioId)}/runs/${encodeURIComponent(runId)}/release`,
        {},
        releaseCreatedSchema,
      ),
    onSuccess: (_created, runId) => refreshAfterRelease(queryClient, studioId, runId),
  });
}

/** POST .../releases/:release/withdraw with the producer's reason. */
export function useWithdrawRelease(studioId: string, release: Pick<Release, 'id' | 'runId'>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (reason: string): Promise<unknown> =>
      api.post(`${base(studioId)}/${encodeURIComponent(release.id)}/withdraw`, { reason }, null),
    onSuccess: () => refreshAfterRelease(queryClient, studioId, release.runId),
  });
}

/** POST .../releases/:release/acknowledge: the venue has installed the package. */
export function useAcknowledgeRelease(studioId: string, release: Pick<Release, 'id' | 'runId'>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (note: string): Promise<unknown> =>
      api.post(`${base(studioId)}/${encodeURIComponent(release.id)}/acknowledge`, { note }, null),
    onSuccess: () => refreshAfterRelease(queryClient, studioId, release.runId),
  });
}

/** POST .../releases/:release/problems: the venue reports a problem with the package. */
export function useReportProblem(studioId: string, release: Pick<Release, 'id' | 'runId'>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (text: string): Promise<unknown> =>
      api.post(`${base(studioId)}/${encodeURIComponent(release.id)}/problems`, { text }, null),
    onSuccess: () => refreshAfterRelease(queryClient, studioId, release.runId),
  });
}
