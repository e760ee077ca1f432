import type { ThrottlerStorage } from '@nestjs/throttler';

type Record = Awaited<ReturnType<ThrottlerStorage['increment']>>;

interface Window {
  /** When the current window ends (ms since the epoch). */
  endsAt: number;
  hits: number;
  /** Until when the key is blocked (0: not blocked). */
  blockedUntil: number;
}

/** How many increments between sweeps of windows that have ended. */
const SWEEP_EVERY = 1000;

/**
 * In-memory counts for the per-instance flood limit, in fixed windows: each key counts its hits in a window
 * of `ttl` from its first hit; past `limit` it is blocked for `blockDuration`. Constant work per request,
 * where the throttler's own in-memory storage keeps (and filters) one timestamp per hit of the last `ttl`,
 * which under load is thousands per request. Windows that have ended are swept every SWEEP_EVERY calls.
 */
export class WindowCounter {
  private readonly windows = new Map<string, Window>();
  private calls = 0;

  increment(key: string, ttl: number, limit: number, blockDuration: number, throttlerName: string, now = Date.now()): Record {
    if (++this.calls % SWEEP_EVERY === 0) this.sweep(now);
    const id = `${throttlerName}\n${key}`;
    let w = this.windows.get(id);
    if (!w || (w.endsAt <= now && w.blockedUntil <= now)) {
      w = { endsAt: now + ttl, hits: 0, blockedUntil: 0 };
      this.windows.set(id, w);
    }
    const blocked = w.blockedUntil > now;
    if (!blocked) {
      w.hits += 1;
      if (w.hits > limit) w.blockedUntil = now + blockDuration;
    }
    const seconds = (until: number) => Math.max(0, Math.ceil((until - now) / 1000));
    return {
      totalHits: w.hits,
      timeToExpire: seconds(w.endsAt),
      isBlocked: w.blockedUntil > now,
      timeToBlockExpire: seconds(w.blockedUntil),
    };
  }

  /** How many keys are held (for tests). */
  get size(): number {
    return this.windows.size;
  }

  private sweep(now: number): void {
    for (const [id, w] of this.windows) if (w.endsAt <= now && w.blockedUntil <= now) this.windows.delete(id);
  }
}
