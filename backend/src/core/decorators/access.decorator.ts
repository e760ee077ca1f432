import { SetMetadata } from '@nestjs/common';
import type { Role } from '../roles';

export const ACCESS_KEY = 'ampwright:access';

/** How a route may be reached. Every route must say: the global guard refuses a route without a rule. */
export type AccessRule = { kind: 'public' } | { kind: 'signed-in' } | { kind: 'roles'; roles: Role[] };

/** Anyone, signed in or not. */
export const Public = () => SetMetadata(ACCESS_KEY, { kind: 'public' } satisfies AccessRule);
/** Any signed-in user, clients included. */
export const SignedIn = () => SetMetadata(ACCESS_KEY, { kind: 'signed-in' } satisfies AccessRule);
/** Signed-in users holding at least one of these roles in their firm. */
export const Roles = (...roles: Role[]) => SetMetadata(ACCESS_KEY, { kind: 'roles', roles } satisfies AccessRule);
