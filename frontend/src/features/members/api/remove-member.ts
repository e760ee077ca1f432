import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { memberKeys } from './member-keys';

/** DELETE /api/members/:id: takes a person out of the firm. */
export const removeMember = (id: string) => api.delete<void>(`/members/${id}`);

export function useRemoveMember() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: removeMember, onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.all }) });
}
