import type { ThrottlerOptions } from '@nestjs/throttler';
import { environment } from '../../config/environment';

/**
 * Throttlers: `default` for every route; `address` (per client address) and `account` (per e-mail
 * address or token in the body) are off unless a route turns them on with `authThrottle`.
 */
const perAccount = (req: Record<string, unknown>) => {
  const body = (req.body ?? {}) as Record<string, unknown>;
  return String(body.email ?? body.token ?? req.ip ?? '').toLowerCase();
};

/** The limit of a throttler left off (it is not counted at all). */
export const OFF = 1_000_000_000;

export const THROTTLERS: ThrottlerOptions[] = [
  { name: 'default', ttl: 60_000, limit: () => environment().THROTTLE_DEFAULT_PER_ADDRESS },
  { name: 'address', ttl: 60_000, limit: OFF },
  { name: 'account', ttl: 60_000, limit: OFF, getTracker: perAccount as never },
];

/** 5 a minute per account, and (by default) 5 a minute per client address. */
export const AUTH_THROTTLE = {
  address: { ttl: 60_000, limit: () => environment().THROTTLE_AUTH_PER_ADDRESS },
  account: { ttl: 60_000, limit: 5 },
};

/** The public verification page: 10 uploads a minute per client address (by default). */
export const VERIFY_THROTTLE = {
  address: { ttl: 60_000, limit: () => environment().THROTTLE_VERIFY_PER_ADDRESS },
};
