/** Every query key of this feature. */
export const authKeys = { me: ['auth', 'me'] as const, invitation: (token: string) => ['invitation', token] as const };
