import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { email } from './fields';
import type { Me } from './get-me';
import { useSignedIn } from './use-signed-in';

export const signInSchema = z.object({ email, password: z.string().min(1, 'Enter your password') });

/** POST /api/auth/login. */
export const signIn = (body: z.infer<typeof signInSchema>) => api.post<Me>('/auth/login', body);

export function useSignIn() {
  return useMutation({ mutationFn: signIn, onSuccess: useSignedIn() });
}
