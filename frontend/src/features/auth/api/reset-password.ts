import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { linkToken, newPassword } from './fields';

export const resetSchema = z.object({ token: linkToken, password: newPassword });

/** POST /api/auth/reset-password. */
export const resetPassword = (body: z.infer<typeof resetSchema>) => api.post<void>('/auth/reset-password', body);

export const useResetPassword = () => useMutation({ mutationFn: resetPassword });
