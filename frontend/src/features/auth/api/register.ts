import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { email, newPassword, personName } from './fields';

export const registerSchema = z.object({ firmName: z.string().trim().min(2, "Enter the firm's name"), name: personName, email, password: newPassword });

/** POST /api/auth/register: answers the same for every address; the firm is made when the e-mailed link is followed. */
export const register = (body: z.infer<typeof registerSchema>) => api.post<{ message: string }>('/auth/register', body);

export const useRegister = () => useMutation({ mutationFn: register });
