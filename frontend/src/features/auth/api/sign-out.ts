import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, setCsrfToken } from '../../../lib/api-client';
import { authKeys } from './auth-keys';

/** POST /api/auth/logout. */
export const signOut = () => api.post<void>('/auth/logout');

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSettled: () => {
      setCsrfToken(undefined);
      queryClient.clear();
      queryClient.setQueryData(authKeys.me, null);
    },
  });
}
