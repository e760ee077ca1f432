import type { MikroORM } from '@mikro-orm/core';
import type { EntityManager } from '@mikro-orm/mariadb';
import { ThrottlerStorageService, type ThrottlerStorage } from '@nestjs/throttler';
import { OFF } from './throttlers';

/**
 * Where the throttlers count. The security limits (sign-in, password reset, invitations, verification:
 * the `address` and `account` throttlers where a route turns them on) are counted in MariaDB, so that
 * several app instances behind a load balancer share one count. The general `default` limit, which only
 * protects each instance from floods, and throttlers left off are counted in memory, with no database
 * write per request.
 */
export class SharedThrottlerStorage implements ThrottlerStorage {
  private readonly local = new ThrottlerStorageService();

  constructor(private readonly orm: MikroORM) {}

  async increment(key: string, ttl: number, limit: number, blockDuration: number, throttlerName: string): ReturnType<ThrottlerStorage['increment']> {
    if (throttlerName === 'default' || limit >= OFF) return this.local.increment(key, ttl, limit, blockDuration, throttlerName);
    const em = this.orm.em.fork() as EntityManager;
    const id = `${throttlerName}:${key}`;
    // One statement counts the attempt, starting a new window when the last one has ended; MariaDB
    // applies the assignments left to right, so `expires_at` is tested before it is moved on.
    await em.execute(
      `insert into throttle_counter (tracker_key, hits, expires_at, blocked_until) values (?, 1, now(3) + interval ? microsecond, null)
       on duplicate key update
         hits = if(expires_at <= now(3), 1, hits + 1),
         blocked_until = if(blocked_until > now(3), blocked_until, null),
         expires_at = if(expires_at <= now(3), now(3) + interval ? microsecond, expires_at)`,
      [id, ttl * 1000, ttl * 1000],
      'run',
    );
    const [row] = await em.execute<{ hits: number; expires_in: number | string; blocked_in: number | string | null }[]>(
      `select hits, timestampdiff(microsecond, now(3), expires_at) as expires_in, timestampdiff(microsecond, now(3), blocked_until) as blocked_in
         from throttle_counter where tracker_key = ?`,
      [id],
    );
    let blockedIn = row.blocked_in === null ? 0 : Number(row.blocked_in);
    if (blockedIn <= 0 && row.hits > limit) {
      await em.execute('update throttle_counter set blocked_until = now(3) + interval ? microsecond where tracker_key = ?', [blockDuration * 1000, id], 'run');
      blockedIn = blockDuration * 1000;
    }
    if (Math.random() < 0.01) {
      await em.execute(
        'delete from throttle_counter where expires_at < now(3) - interval 1 hour and (blocked_until is null or blocked_until < now(3)) limit 500',
        [],
        'run',
      );
    }
    return {
      totalHits: row.hits,
      timeToExpire: Math.max(0, Math.ceil(Number(row.expires_in) / 1e6)),
      isBlocked: blockedIn > 0,
      timeToBlockExpire: Math.max(0, Math.ceil(blockedIn / 1e6)),
    };
  }

  /** The longest wait, in whole seconds, that any of these counters is blocked for (0: none is). */
  async blockedFor(ids: string[]): Promise<number> {
    const em = this.orm.em.fork() as EntityManager;
    const [row] = await em.execute<{ wait: number | string | null }[]>(
      `select max(timestampdiff(microsecond, now(3), blocked_until)) as wait from throttle_counter where tracker_key in (${ids.map(() => '?').join(', ')}) and blocked_until > now(3)`,
      ids,
    );
    return row?.wait === null || row?.wait === undefined ? 0 : Math.max(1, Math.ceil(Number(row.wait) / 1e6));
  }

  /** Forgets a counter (a good sign-in clears its account's failures). */
  async forget(id: string): Promise<void> {
    await (this.orm.em.fork() as EntityManager).execute('delete from throttle_counter where tracker_key = ?', [id], 'run');
  }
}
