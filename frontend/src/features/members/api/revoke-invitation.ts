import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { memberKeys } from './member-keys';
import type { Invitation } from './types';

/** DELETE /api/invitations/:id: the owner withdraws an invitation not yet accepted; its link stops working. */
export const revokeInvitation = (id: string) => api.delete<Invitation>(`/invitations/${id}`);

export function useRevokeInvitation() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: revokeInvitation, onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.invitations }) });
}
