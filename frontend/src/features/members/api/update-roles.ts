import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { Role } from '../../auth';
import { memberKeys } from './member-keys';
import type { Member } from './types';

/** PATCH /api/members/:id: a member's roles. */
export const updateRoles = ({ id, roles }: { id: string; roles: Role[] }) => api.patch<Member>(`/members/${id}`, { roles });

export function useUpdateRoles() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateRoles, onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.all }) });
}
