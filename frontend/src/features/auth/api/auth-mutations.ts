import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api, setCsrfToken } from '../../../lib/api-client';
import { authKeys } from './auth-keys';
import type { Me } from './get-me';

import { MIN_PASSWORD_LENGTH } from '@ampwright/common/api/accounts';

export { MIN_PASSWORD_LENGTH };

const email = z.string().trim().min(1, 'Enter your e-mail address').email('Enter a valid e-mail address');
const newPassword = z.string().min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters`).max(200, 'Use at most 200 characters');

export const signInSchema = z.object({ email, password: z.string().min(1, 'Enter your password') });
export const registerSchema = z.object({
  firmName: z.string().trim().min(2, "Enter the firm's name"),
  name: z.string().trim().min(1, 'Enter your name'),
  email,
  password: newPassword,
});
export const forgotSchema = z.object({ email });
export const resetSchema = z.object({ token: z.string().min(20, 'This link is not complete'), password: newPassword });
export const acceptSchema = z.object({
  token: z.string().min(20, 'This link is not complete'),
  name: z.string().trim().min(1, 'Enter your name'),
  password: newPassword,
});
export const profileSchema = z.object({ name: z.string().trim().min(1, 'Enter your name') });

function useSignedIn() {
  const queryClient = useQueryClient();
  return (me: Me) => {
    setCsrfToken(me.csrfToken);
    queryClient.setQueryData(authKeys.me, me);
  };
}

export function useSignIn() {
  const signedIn = useSignedIn();
  return useMutation({ mutationFn: (body: z.infer<typeof signInSchema>) => api.post<Me>('/auth/login', body), onSuccess: signedIn });
}

/** Registering answers the same for every address: the firm is made when the e-mailed link is followed. */
export function useRegister() {
  return useMutation({ mutationFn: (body: z.infer<typeof registerSchema>) => api.post<{ message: string }>('/auth/register', body) });
}

/** The e-mailed registration link: makes the firm and signs its owner in. */
export function useConfirmRegistration() {
  const signedIn = useSignedIn();
  return useMutation({ mutationFn: (token: string) => api.post<Me>('/auth/register/confirm', { token }), onSuccess: signedIn });
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<void>('/auth/logout'),
    onSettled: () => {
      setCsrfToken(undefined);
      queryClient.clear();
      queryClient.setQueryData(authKeys.me, null);
    },
  });
}

export const useForgotPassword = () =>
  useMutation({ mutationFn: (body: z.infer<typeof forgotSchema>) => api.post<{ message: string }>('/auth/forgot-password', body) });
export const useResetPassword = () => useMutation({ mutationFn: (body: z.infer<typeof resetSchema>) => api.post<void>('/auth/reset-password', body) });

/** What an invitation link offers (firm, address, roles, whether the address has an account); asked only for a whole token. */
export interface InvitationPreview {
  firm: string;
  email: string;
  roles: string[];
  hasAccount: boolean;
}

export const useInvitationPreview = (token: string) =>
  useQuery({
    queryKey: authKeys.invitation(token),
    queryFn: () => api.get<InvitationPreview>(`/invitations/preview?token=${encodeURIComponent(token)}`),
    enabled: token.length >= 20,
  });

export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: z.infer<typeof acceptSchema>) => api.post<{ firm: string }>('/invitations/accept', body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: authKeys.me }),
  });
}

export function useUpdateProfile() {
  const signedIn = useSignedIn();
  return useMutation({ mutationFn: (body: z.infer<typeof profileSchema>) => api.patch<Me>('/auth/me', body), onSuccess: signedIn });
}
