import { MIN_PASSWORD_LENGTH } from '@ampwright/common/api/accounts';
import { z } from 'zod';

export { MIN_PASSWORD_LENGTH };

/** Form fields shared by the account endpoints' schemas. */
export const email = z.string().trim().min(1, 'Enter your e-mail address').email('Enter a valid e-mail address');
export const newPassword = z.string().min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters`).max(200, 'Use at most 200 characters');
export const linkToken = z.string().min(20, 'This link is not complete');
export const personName = z.string().trim().min(1, 'Enter your name');
