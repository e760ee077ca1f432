import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { memberKeys } from './member-keys';
import type { Invitation } from './types';

/** GET /api/invitations: the firm's invitations, open and past (owners only). */
export const getInvitations = (signal?: AbortSignal) => api.get<Invitation[]>('/invitations', { signal });

export const invitationsQueryOptions = () => queryOptions({ queryKey: memberKeys.invitations, queryFn: ({ signal }) => getInvitations(signal) });

export const useInvitations = (enabled: boolean) => useQuery({ ...invitationsQueryOptions(), enabled });
