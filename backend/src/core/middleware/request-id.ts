import { AsyncLocalStorage } from 'node:async_hooks';
import { randomUUID } from 'node:crypto';
import type { NextFunction, Request, Response } from 'express';

export const REQUEST_ID_HEADER = 'x-request-id';

/** An id a proxy sent us is kept when it looks like one (letters, digits, - and _, at most 64); otherwise we make one. */
const WELL_FORMED = /^[A-Za-z0-9_-]{1,64}$/;

/** The id of the request (or of the job it started) whose work is running, for every log line written on its behalf. */
const context = new AsyncLocalStorage<string>();

/** The id of the request whose work this is: its handler, its evaluation, a package job it queued (undefined outside any). */
export const currentRequestId = (): string | undefined => context.getStore();

/** Runs work on behalf of a request (a job it queued, run later): its log lines carry the request's id. */
export function withRequestId<T>(id: string | null | undefined, work: () => T): T {
  return id ? context.run(id, work) : work();
}

/** The request's id, set by `assignRequestId` (undefined before it ran). */
export const requestIdOf = (req: Request): string | undefined => (req as Request & { requestId?: string }).requestId;

/**
 * Gives every request an id, answered in the X-Request-Id header and written in every log line written on its
 * behalf (core/logger.ts), so an operator can follow one request through the logs — into its evaluation and
 * the package job it queued — (and a proxy's id, when it sent a well-formed one, is kept).
 */
export function assignRequestId(req: Request, res: Response, next: NextFunction): void {
  const incoming = req.get(REQUEST_ID_HEADER);
  const id = incoming && WELL_FORMED.test(incoming) ? incoming : randomUUID();
  (req as Request & { requestId?: string }).requestId = id;
  res.setHeader(REQUEST_ID_HEADER, id);
  // Everything the request does from here (guards, handler, evaluation, database) runs in its context.
  context.run(id, next);
}
