import { useQueryClient } from '@tanstack/react-query';
import { setCsrfToken } from '../../../lib/api-client';
import { authKeys } from './auth-keys';
import type { Me } from './get-me';

/** What every endpoint that signs someone in does with the answer: keep the anti-forgery token and the person. */
export function useSignedIn() {
  const queryClient = useQueryClient();
  return (me: Me) => {
    setCsrfToken(me.csrfToken);
    queryClient.setQueryData(authKeys.me, me);
  };
}
