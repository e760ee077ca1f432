import type { MikroORM } from '@mikro-orm/core';
import type { ThrottlerStorage } from '@nestjs/throttler';
import { ThrottleCounter } from './throttle-counter.entity';
import type { ThrottleCounterRepository } from './throttle-counter.repository';
import { OFF } from './throttlers';
import { WindowCounter } from './window-counter';

/**
 * Where the throttlers count. The security limits (sign-in, password reset, invitations, verification:
 * the `address` and `account` throttlers where a route turns them on) are counted in MariaDB, so that
 * several app instances behind a load balancer share one count. The general `default` limit, which only
 * protects each instance from floods, is counted in memory in fixed windows (constant work per request, no
 * database write); throttlers left off are not counted at all.
 */
export class SharedThrottlerStorage implements ThrottlerStorage {
  private readonly local = new WindowCounter();

  constructor(private readonly orm: MikroORM) {}

  async increment(key: string, ttl: number, limit: number, blockDuration: number, throttlerName: string): ReturnType<ThrottlerStorage['increment']> {
    if (limit >= OFF) return { totalHits: 0, timeToExpire: 0, isBlocked: false, timeToBlockExpire: 0 };
    if (throttlerName === 'default') return this.local.increment(key, ttl, limit, blockDuration, throttlerName);
    const counters = this.counters();
    const id = `${throttlerName}:${key}`;
    const row = await counters.hit(id, ttl);
    let blockedIn = row.blockedInUs;
    if (blockedIn <= 0 && row.hits > limit) {
      await counters.block(id, blockDuration);
      blockedIn = blockDuration * 1000;
    }
    if (Math.random() < 0.01) await counters.clearOld();
    return {
      totalHits: row.hits,
      timeToExpire: Math.max(0, Math.ceil(row.expiresInUs / 1e6)),
      isBlocked: blockedIn > 0,
      timeToBlockExpire: Math.max(0, Math.ceil(blockedIn / 1e6)),
    };
  }

  /** The longest wait, in whole seconds, that any of these counters is blocked for (0: none is). */
  async blockedFor(ids: string[]): Promise<number> {
    const wait = await this.counters().longestBlock(ids);
    return wait === null ? 0 : Math.max(1, Math.ceil(wait / 1e6));
  }

  /** Forgets a counter (a good sign-in clears its account's failures). */
  async forget(id: string): Promise<void> {
    await this.counters().forget(id);
  }

  /** The counters' repository, on a fresh entity manager (a throttler runs outside any request's unit of work). */
  private counters(): ThrottleCounterRepository {
    return this.orm.em.fork().getRepository(ThrottleCounter);
  }
}
