import { EntityRepository } from '@mikro-orm/mariadb';
import type { ThrottleCounter } from './throttle-counter.entity';

/** A counter as read back after an attempt: hits in the window, microseconds until it ends and until the block ends. */
export interface CounterState {
  hits: number;
  expiresInUs: number;
  blockedInUs: number;
}

/** The SQL of the shared throttle counters: each attempt is counted by one statement, whichever instance serves it. */
export class ThrottleCounterRepository extends EntityRepository<ThrottleCounter> {
  /** Counts an attempt, starting a new window of `ttlMs` when the last one has ended; the counter after it. */
  async hit(id: string, ttlMs: number): Promise<CounterState> {
    // MariaDB applies the assignments left to right, so `expires_at` is tested before it is moved on.
    await this.em.execute(
      `insert into throttle_counter (tracker_key, hits, expires_at, blocked_until) values (?, 1, now(3) + interval ? microsecond, null)
       on duplicate key update
         hits = if(expires_at <= now(3), 1, hits + 1),
         blocked_until = if(blocked_until > now(3), blocked_until, null),
         expires_at = if(expires_at <= now(3), now(3) + interval ? microsecond, expires_at)`,
      [id, ttlMs * 1000, ttlMs * 1000],
      'run',
    );
    const [row] = await this.em.execute<{ hits: number; expires_in: number | string; blocked_in: number | string | null }[]>(
      `select hits, timestampdiff(microsecond, now(3), expires_at) as expires_in, timestampdiff(microsecond, now(3), blocked_until) as blocked_in
         from throttle_counter where tracker_key = ?`,
      [id],
    );
    return { hits: row.hits, expiresInUs: Number(row.expires_in), blockedInUs: row.blocked_in === null ? 0 : Number(row.blocked_in) };
  }

  /** Blocks a counter for `ms` from now. */
  async block(id: string, ms: number): Promise<void> {
    await this.em.execute('update throttle_counter set blocked_until = now(3) + interval ? microsecond where tracker_key = ?', [ms * 1000, id], 'run');
  }

  /** Clears counters an hour past their window and not blocked, a few hundred at a time. */
  async clearOld(): Promise<void> {
    await this.em.execute(
      'delete from throttle_counter where expires_at < now(3) - interval 1 hour and (blocked_until is null or blocked_until < now(3)) limit 500',
      [],
      'run',
    );
  }

  /** The longest time in microseconds that any of these counters is still blocked for (null: none is). */
  async longestBlock(ids: string[]): Promise<number | null> {
    const [row] = await this.em.execute<{ wait: number | string | null }[]>(
      `select max(timestampdiff(microsecond, now(3), blocked_until)) as wait from throttle_counter where tracker_key in (${ids.map(() => '?').join(', ')}) and blocked_until > now(3)`,
      ids,
    );
    return row?.wait === null || row?.wait === undefined ? null : Number(row.wait);
  }

  async forget(id: string): Promise<void> {
    await this.em.execute('delete from throttle_counter where tracker_key = ?', [id], 'run');
  }
}
