import { DeadlockException, UniqueConstraintViolationException } from '@mikro-orm/core';
import { describe, expect, it, vi } from 'vitest';
import { retryOnWriteConflict, WRITE_CONFLICT_ATTEMPTS } from './write-conflict';

// MariaDB's error 1213 (ER_LOCK_DEADLOCK), as MikroORM raises it: what a Galera node answers when a transaction fails certification.
const conflict = () => new DeadlockException(Object.assign(new Error('Deadlock found when trying to get lock; try restarting transaction'), { errno: 1213 }));

describe('retryOnWriteConflict', () => {
  it('tries a write the database aborted for a conflict again, and returns what the next attempt stores', async () => {
    const write = vi.fn().mockRejectedValueOnce(conflict()).mockResolvedValueOnce('saved');
    await expect(retryOnWriteConflict(write)).resolves.toBe('saved');
    expect(write).toHaveBeenCalledTimes(2);
  });

  it('gives up after its attempts, with the conflict (which the API answers with 409)', async () => {
    const write = vi.fn().mockRejectedValue(conflict());
    await expect(retryOnWriteConflict(write)).rejects.toBeInstanceOf(DeadlockException);
    expect(write).toHaveBeenCalledTimes(WRITE_CONFLICT_ATTEMPTS);
  });

  it('never repeats a write that failed for any other reason', async () => {
    const write = vi.fn().mockRejectedValue(new UniqueConstraintViolationException(new Error('duplicate')));
    await expect(retryOnWriteConflict(write)).rejects.toBeInstanceOf(UniqueConstraintViolationException);
    expect(write).toHaveBeenCalledTimes(1);
  });
});
