import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { memberKeys } from './member-keys';
import type { Member } from './types';

/** GET /api/members: the firm's people and their roles. */
export const getMembers = (signal?: AbortSignal) => api.get<Member[]>('/members', { signal });

export const membersQueryOptions = () => queryOptions({ queryKey: memberKeys.all, queryFn: ({ signal }) => getMembers(signal) });

export const useMembers = () => useQuery(membersQueryOptions());
