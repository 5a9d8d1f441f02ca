import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/** Asks for a reset link by e-mail; the server answers the same whether or not the address is known. */
export function requestPasswordReset(input: { email: string }): Promise<void> {
  return api.post('/api/auth/password-reset', input, null);
}

export function useRequestPasswordReset() {
  return useMutation({
    mutationKey: ['auth', 'password-reset'],
    mutationFn: requestPasswordReset,
  });
}
