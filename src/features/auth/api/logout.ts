import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, refreshCsrfToken } from '../../../lib/api-client';
import { replaceSession } from './session-cache';

/** Ends the session; the CSRF token of the new anonymous session is fetched straight away. */
export async function logout(): Promise<void> {
  await api.post('/api/auth/logout', undefined, null);
  await refreshCsrfToken();
}

export function useLogout() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationKey: ['auth', 'logout'],
    mutationFn: logout,
    onSuccess: () => {
      replaceSession(queryClient, null);
    },
  });
}
