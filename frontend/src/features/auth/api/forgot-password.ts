import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { email } from './fields';

export const forgotSchema = z.object({ email });

/** POST /api/auth/forgot-password: answers the same for any address. */
export const forgotPassword = (body: z.infer<typeof forgotSchema>) => api.post<{ message: string }>('/auth/forgot-password', body);

export const useForgotPassword = () => useMutation({ mutationFn: forgotPassword });
