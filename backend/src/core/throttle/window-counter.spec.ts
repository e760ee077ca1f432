import { describe, expect, it } from 'vitest';
import { WindowCounter } from './window-counter';

describe('WindowCounter', () => {
  it('counts hits in a window and blocks past the limit for the block duration', () => {
    const c = new WindowCounter();
    const t = 1_000_000;
    for (let k = 1; k <= 3; k++) expect(c.increment('a', 60_000, 3, 30_000, 'default', t + k)).toMatchObject({ totalHits: k, isBlocked: false });
    const fourth = c.increment('a', 60_000, 3, 30_000, 'default', t + 10);
    expect(fourth).toMatchObject({ totalHits: 4, isBlocked: true, timeToBlockExpire: 30 });
    // Blocked hits are not counted, and the block holds for its duration.
    expect(c.increment('a', 60_000, 3, 30_000, 'default', t + 20_000)).toMatchObject({ totalHits: 4, isBlocked: true, timeToBlockExpire: 11 });
    // Another key, or the same key under another throttler, has its own count.
    expect(c.increment('b', 60_000, 3, 30_000, 'default', t + 20)).toMatchObject({ totalHits: 1, isBlocked: false });
    expect(c.increment('a', 60_000, 3, 30_000, 'other', t + 20)).toMatchObject({ totalHits: 1, isBlocked: false });
  });

  it('starts a new window once the window and any block have ended', () => {
    const c = new WindowCounter();
    const t = 5_000_000;
    c.increment('a', 1_000, 1, 5_000, 'default', t);
    expect(c.increment('a', 1_000, 1, 5_000, 'default', t + 10).isBlocked).toBe(true);
    // The window ended at t + 1000 but the block lasts until t + 5010.
    expect(c.increment('a', 1_000, 1, 5_000, 'default', t + 2_000).isBlocked).toBe(true);
    expect(c.increment('a', 1_000, 1, 5_000, 'default', t + 5_011)).toMatchObject({ totalHits: 1, isBlocked: false, timeToExpire: 1 });
  });

  it('forgets windows that have ended, so memory stays bounded by the keys of the last window', () => {
    const c = new WindowCounter();
    const t = 9_000_000;
    for (let k = 0; k < 999; k++) c.increment(`k${k}`, 1_000, 10, 1_000, 'default', t);
    expect(c.size).toBe(999);
    c.increment('late', 1_000, 10, 1_000, 'default', t + 5_000); // the 1000th call sweeps
    expect(c.size).toBe(1);
  });

  it('does constant work per hit: 200 000 hits on one key take well under a second', () => {
    // The throttler's own in-memory storage filters one timestamp per hit of the window on every hit.
    const c = new WindowCounter();
    const started = process.hrtime.bigint();
    for (let k = 0; k < 200_000; k++) c.increment('one', 60_000, 1e9, 60_000, 'default', 1_000 + k);
    expect(Number(process.hrtime.bigint() - started) / 1e9).toBeLessThan(1);
  });
});
