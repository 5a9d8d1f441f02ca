import { useMutation, useQueryClient } from '@tanstack/react-query';
import { meResponse } from '../../../../shared/schemas/api';
import type { Me } from '../../../../shared/schemas/api';
import { api, refreshCsrfToken } from '../../../lib/api-client';
import { replaceSession } from './session-cache';

export interface LoginInput {
  email: string;
  password: string;
}

/** Signs in with e-mail and password; the session cookie changes, so the CSRF token is fetched again. */
export async function login(input: LoginInput): Promise<Me> {
  const me = await api.post('/api/auth/login', input, meResponse);
  await refreshCsrfToken();
  return me;
}

export function useLogin() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationKey: ['auth', 'login'],
    mutationFn: login,
    onSuccess: (me) => {
      replaceSession(queryClient, me);
    },
  });
}
