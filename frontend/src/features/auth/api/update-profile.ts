import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { personName } from './fields';
import type { Me } from './get-me';
import { useSignedIn } from './use-signed-in';

export const profileSchema = z.object({ name: personName });

/** PATCH /api/auth/me: the person's own name. */
export const updateProfile = (body: z.infer<typeof profileSchema>) => api.patch<Me>('/auth/me', body);

export function useUpdateProfile() {
  return useMutation({ mutationFn: updateProfile, onSuccess: useSignedIn() });
}
