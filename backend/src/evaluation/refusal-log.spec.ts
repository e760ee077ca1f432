import { describe, expect, it } from 'vitest';
import { RefusalLog } from './refusal-log';

describe('RefusalLog', () => {
  it("logs a firm's first refusal in each window, with how many were not logged since, and each firm apart", () => {
    let now = 1_000;
    const log = new RefusalLog(60_000, 100, () => now);
    expect(log.take('a')).toEqual({ unlogged: 0 });
    for (let k = 0; k < 500; k++) expect(log.take('a')).toBeUndefined();
    expect(log.take('b')).toEqual({ unlogged: 0 });
    now += 59_999;
    expect(log.take('a')).toBeUndefined();
    now += 1;
    expect(log.take('a')).toEqual({ unlogged: 501 });
    expect(log.take('a')).toBeUndefined();
  });

  it('remembers at most so many firms, forgetting the oldest', () => {
    const log = new RefusalLog(60_000, 2, () => 0);
    log.take('a');
    log.take('b');
    log.take('c'); // 'a' is forgotten
    expect(log.take('b')).toBeUndefined();
    expect(log.take('a')).toEqual({ unlogged: 0 });
  });
});
