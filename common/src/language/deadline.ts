/**
 * A soft deadline for one evaluation. Once it has passed, every check throws, so the rest of the sheet
 * fails fast and the evaluation returns with `passed` set; the caller then treats the whole evaluation
 * as stopped. The server's evaluation processes use it so that a sheet past its time ends without the
 * process being killed (keeping its warm caches); a single operation that runs on past it is still
 * stopped by the process being killed a little later.
 */
let deadline = Infinity;
let passed = false;
let ticks = 0;

export class DeadlineExceeded extends Error {
  constructor() {
    super('this sheet took longer than an evaluation may take, so it was stopped');
  }
}

/** Checks the clock: every call when `now` is set (between lines and cells), else every 256th call (inside operations). */
export function checkDeadline(now = false): void {
  if (passed) throw new DeadlineExceeded();
  if (deadline === Infinity || (!now && (++ticks & 255) !== 0)) return;
  if (Date.now() > deadline) {
    passed = true;
    throw new DeadlineExceeded();
  }
}

/** Runs fn with a deadline (epoch ms): its value, or `passed` when the deadline passed while it ran. */
export function runWithDeadline<T>(at: number, fn: () => T): { passed: false; value: T } | { passed: true } {
  const before = { deadline, passed };
  deadline = at;
  passed = false;
  try {
    const value = fn();
    return passed ? { passed: true } : { passed: false, value };
  } catch (err) {
    if (err instanceof DeadlineExceeded) return { passed: true };
    throw err;
  } finally {
    deadline = before.deadline;
    passed = before.passed;
  }
}
