/**
 * Changes the database aborted because another was written to the same rows at the same moment: a deadlock
 * on one server, and on a Galera cluster a transaction that failed certification against a write committed
 * on another node (MariaDB answers both with error 1213, which MikroORM raises as DeadlockException), or a
 * lock not granted in time. The transaction was rolled back whole, so nothing of it was stored.
 */
import { DeadlockException, LockWaitTimeoutException } from '@mikro-orm/core';

export const isWriteConflict = (err: unknown): boolean => err instanceof DeadlockException || err instanceof LockWaitTimeoutException;

/** How often a change the database aborted is tried again where that is safe, before the caller is told 409. */
export const WRITE_CONFLICT_ATTEMPTS = 3;

/**
 * Runs `write` again when the database aborted it for a conflicting write, up to WRITE_CONFLICT_ATTEMPTS in
 * all, with a short random pause (so two writers do not meet again in step). Only for writes that are safe
 * to repeat: each attempt must read and check what it relies on again (a version, a state) inside itself.
 */
export async function retryOnWriteConflict<T>(write: () => Promise<T>, attempts = WRITE_CONFLICT_ATTEMPTS): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await write();
    } catch (err) {
      if (!isWriteConflict(err) || attempt >= attempts) throw err;
      await new Promise((resolve) => setTimeout(resolve, 5 + Math.random() * 20 * attempt));
    }
  }
}
