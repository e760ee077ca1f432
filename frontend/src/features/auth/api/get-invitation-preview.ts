import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { authKeys } from './auth-keys';

/** What an invitation link offers (firm, address, roles, whether the address has an account). */
export interface InvitationPreview {
  firm: string;
  email: string;
  roles: string[];
  hasAccount: boolean;
}

/** GET /api/invitations/preview?token=…. */
export const getInvitationPreview = (token: string, signal?: AbortSignal) =>
  api.get<InvitationPreview>(`/invitations/preview?token=${encodeURIComponent(token)}`, { signal });

/** Asked only for a whole token. */
export const invitationPreviewQueryOptions = (token: string) =>
  queryOptions({ queryKey: authKeys.invitation(token), queryFn: ({ signal }) => getInvitationPreview(token, signal), enabled: token.length >= 20 });

export const useInvitationPreview = (token: string) => useQuery(invitationPreviewQueryOptions(token));
