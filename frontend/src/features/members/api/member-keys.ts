/** The members feature's query keys: every query and invalidation takes its key from here. */
export const memberKeys = { all: ['members'] as const, invitations: ['invitations'] as const };
