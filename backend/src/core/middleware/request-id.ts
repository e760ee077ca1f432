import { randomUUID } from 'node:crypto';
import type { NextFunction, Request, Response } from 'express';

export const REQUEST_ID_HEADER = 'x-request-id';

/** An id a proxy sent us is kept when it looks like one (letters, digits, - and _, at most 64); otherwise we make one. */
const WELL_FORMED = /^[A-Za-z0-9_-]{1,64}$/;

/** The request's id, set by `assignRequestId` (undefined before it ran). */
export const requestIdOf = (req: Request): string | undefined => (req as Request & { requestId?: string }).requestId;

/**
 * Gives every request an id, answered in the X-Request-Id header and written in its log lines, so an operator
 * can follow one request through the logs (and a proxy's id, when it sent a well-formed one, is kept).
 */
export function assignRequestId(req: Request, res: Response, next: NextFunction): void {
  const incoming = req.get(REQUEST_ID_HEADER);
  const id = incoming && WELL_FORMED.test(incoming) ? incoming : randomUUID();
  (req as Request & { requestId?: string }).requestId = id;
  res.setHeader(REQUEST_ID_HEADER, id);
  next();
}
