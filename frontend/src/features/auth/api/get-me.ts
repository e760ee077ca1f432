import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, ApiError, setCsrfToken } from '../../../lib/api-client';
import { authKeys } from './auth-keys';

import type { Actor, Role } from '@ampwright/common/review/workflow';

export type { Role };
export interface Me {
  user: { id: string; email: string; name: string };
  firm: { id: string; name: string };
  roles: Role[];
  csrfToken: string;
}

/** The signed-in person as the workflow rulebook sees them. */
export const actorOf = (me: Me): Actor => ({ id: me.user.id, name: me.user.name, roles: me.roles });

/** The signed-in user, or null when signed out (a 401 is an answer here, not an error). */
export async function getMe(signal?: AbortSignal): Promise<Me | null> {
  try {
    const me = await api.get<Me>('/auth/me', { signal });
    setCsrfToken(me.csrfToken);
    return me;
  } catch (err) {
    if (err instanceof ApiError && err.status === 401) {
      setCsrfToken(undefined);
      return null;
    }
    throw err;
  }
}

export const meQueryOptions = () => queryOptions({ queryKey: authKeys.me, queryFn: ({ signal }) => getMe(signal), staleTime: 60_000 });

export const useMe = () => useQuery(meQueryOptions());

export const isMember = (me: Me | null | undefined) => !!me && me.roles.some((r) => r !== 'client');
