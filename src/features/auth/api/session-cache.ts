import type { QueryClient } from '@tanstack/react-query';
import type { Me } from '../../../../shared/schemas/api';
import { meQueryKey } from './get-me';

/**
 * Drops what the previous session cached and records who is signed in now (null: nobody). Queries
 * whose first key is in `keep` survive: the local mailbox belongs to no session.
 */
export function replaceSession(
  queryClient: QueryClient,
  me: Me | null,
  keep: readonly string[] = ['dev'],
): void {
  queryClient.removeQueries({ predicate: (query) => !keep.includes(String(query.queryKey[0])) });
  queryClient.setQueryData(meQueryKey, me);
}
