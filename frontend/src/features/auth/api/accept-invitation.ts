import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { authKeys } from './auth-keys';
import { linkToken, newPassword, personName } from './fields';

export const acceptSchema = z.object({ token: linkToken, name: personName, password: newPassword });

/** POST /api/invitations/accept: sets the password (a new account) or checks it (an existing one), and signs in. */
export const acceptInvitation = (body: z.infer<typeof acceptSchema>) => api.post<{ firm: string }>('/invitations/accept', body);

export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: acceptInvitation, onSuccess: () => queryClient.invalidateQueries({ queryKey: authKeys.me }) });
}
