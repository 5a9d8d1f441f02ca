import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/** Sets a new password with the token from a reset e-mail. */
export function confirmPasswordReset(input: { token: string; password: string }): Promise<void> {
  return api.post('/api/auth/password-reset/confirm', input, null);
}

export function useConfirmPasswordReset() {
  return useMutation({
    mutationKey: ['auth', 'password-reset-confirm'],
    mutationFn: confirmPasswordReset,
  });
}
