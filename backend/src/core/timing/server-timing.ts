/**
 * Where a request's time goes, in the standard Server-Timing response header (W3C Server Timing):
 * `db` (MariaDB), `eval` (the evaluation process, from asking to answer), `engine` (the engine's own time
 * inside it) and `total` (from the request's arrival to its answer's headers, serialisation included).
 * Services add to the figures of the request they run in; a request that recorded none sends no header.
 * `npm run load` reads the header to print where a save's time goes.
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import { Injectable, type NestMiddleware } from '@nestjs/common';
import type { NextFunction, Request, Response } from 'express';

export type TimingName = 'db' | 'eval' | 'engine';

const figuresOfRequest = new AsyncLocalStorage<Map<TimingName, number>>();

/** Adds `ms` to the current request's figure `name` (nothing outside a request). */
export function addTiming(name: TimingName, ms: number): void {
  const figures = figuresOfRequest.getStore();
  if (figures) figures.set(name, (figures.get(name) ?? 0) + ms);
}

/** Runs `work`, adding the time it takes to the current request's figure `name`. */
export async function timed<T>(name: TimingName, work: () => Promise<T>): Promise<T> {
  const started = performance.now();
  try {
    return await work();
  } finally {
    addTiming(name, performance.now() - started);
  }
}

export function serverTimingHeader(figures: ReadonlyMap<string, number>, totalMs: number): string {
  return [...figures, ['total', totalMs] as const].map(([name, ms]) => `${name};dur=${ms.toFixed(1)}`).join(', ');
}

@Injectable()
export class ServerTimingMiddleware implements NestMiddleware {
  use(_req: Request, res: Response, next: NextFunction): void {
    const figures = new Map<TimingName, number>();
    const started = performance.now();
    const writeHead = res.writeHead;
    res.writeHead = function (this: Response, ...args: unknown[]) {
      if (figures.size && !this.headersSent) this.setHeader('Server-Timing', serverTimingHeader(figures, performance.now() - started));
      return (writeHead as (...a: unknown[]) => Response).apply(this, args);
    } as Response['writeHead'];
    figuresOfRequest.run(figures, next);
  }
}
