import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { Me } from './get-me';
import { useSignedIn } from './use-signed-in';

/** POST /api/auth/register/confirm: the e-mailed registration link makes the firm and signs its owner in. */
export const confirmRegistration = (token: string) => api.post<Me>('/auth/register/confirm', { token });

export function useConfirmRegistration() {
  return useMutation({ mutationFn: confirmRegistration, onSuccess: useSignedIn() });
}
