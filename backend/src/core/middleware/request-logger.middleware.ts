import { Injectable, Logger, NestMiddleware } from '@nestjs/common';
import type { NextFunction, Request, Response } from 'express';

/** One line per request: method, path (no query string, which may carry tokens), status, time. */
@Injectable()
export class RequestLoggerMiddleware implements NestMiddleware {
  private readonly logger = new Logger('HTTP');

  /** LOG_REQUESTS=false turns it off (the load script does, so logging does not skew its figures). */
  private readonly enabled = process.env.LOG_REQUESTS !== 'false';

  use(req: Request, res: Response, next: NextFunction): void {
    if (!this.enabled) return next();
    const started = process.hrtime.bigint();
    res.on('finish', () => {
      const ms = Number(process.hrtime.bigint() - started) / 1e6;
      this.logger.log(`${req.method} ${req.originalUrl.split('?')[0]} ${res.statusCode} ${ms.toFixed(1)} ms`);
    });
    next();
  }
}
