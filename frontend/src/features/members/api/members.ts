import { ROLES } from '@ampwright/common/review/workflow';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { Role } from '../../auth';

export interface Member {
  id: string;
  user: { id: string; email: string; name: string };
  roles: Role[];
  since: string;
}
export interface Invitation {
  id: string;
  email: string;
  roles: Role[];
  expiresAt: string;
  acceptedAt: string | null;
  revokedAt: string | null;
}

export const memberKeys = { all: ['members'] as const, invitations: ['invitations'] as const };

export const membersQueryOptions = () => queryOptions({ queryKey: memberKeys.all, queryFn: ({ signal }) => api.get<Member[]>('/members', { signal }) });
export const useMembers = () => useQuery(membersQueryOptions());

export const invitationsQueryOptions = () =>
  queryOptions({ queryKey: memberKeys.invitations, queryFn: ({ signal }) => api.get<Invitation[]>('/invitations', { signal }) });
export const useInvitations = (enabled: boolean) => useQuery({ ...invitationsQueryOptions(), enabled });

export const ROLE_LABELS: Record<Role, string> = { owner: 'Owner', engineer: 'Engineer', checker: 'Checker', approver: 'Approver', client: 'Client' };

export const inviteSchema = z
  .object({
    email: z.string().trim().min(1, 'Enter an e-mail address').email('Enter a valid e-mail address'),
    roles: z.array(z.enum(ROLES)).min(1, 'Choose at least one role'),
  })
  .refine((v) => !v.roles.includes('client') || v.roles.length === 1, { message: 'A client cannot also hold a role in the firm', path: ['roles'] });

/** The owner withdraws an invitation not yet accepted: its link stops working. */
export function useRevokeInvitation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.delete<Invitation>(`/invitations/${id}`),
    onSuccess: () => qc.invalidateQueries({ queryKey: memberKeys.invitations }),
  });
}

export function useInvite() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: z.infer<typeof inviteSchema>) => api.post<Invitation>('/invitations', body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.invitations }),
  });
}

export function useUpdateRoles() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, roles }: { id: string; roles: Role[] }) => api.patch<Member>(`/members/${id}`, { roles }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.all }),
  });
}

export function useRemoveMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.delete<void>(`/members/${id}`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.all }),
  });
}
