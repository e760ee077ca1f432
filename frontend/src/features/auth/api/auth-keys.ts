export const authKeys = { me: ['auth', 'me'] as const };
