import { ROLES } from '@ampwright/common/review/workflow';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { memberKeys } from './member-keys';
import type { Invitation } from './types';

/** The invitation form's schema, the body of POST /api/invitations. */
export const inviteSchema = z
  .object({
    email: z.string().trim().min(1, 'Enter an e-mail address').email('Enter a valid e-mail address'),
    roles: z.array(z.enum(ROLES)).min(1, 'Choose at least one role'),
  })
  .refine((v) => !v.roles.includes('client') || v.roles.length === 1, { message: 'A client cannot also hold a role in the firm', path: ['roles'] });

export const inviteMember = (body: z.infer<typeof inviteSchema>) => api.post<Invitation>('/invitations', body);

export function useInvite() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: inviteMember, onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.invitations }) });
}
