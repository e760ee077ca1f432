import { Injectable, Logger, NestMiddleware } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { NextFunction, Request, Response } from 'express';
import type { Environment } from '../../config/environment';
import { requestIdOf } from './request-id';

/** One line per request: its id, method, path (no query string, which may carry tokens), status, time. */
@Injectable()
export class RequestLoggerMiddleware implements NestMiddleware {
  private readonly logger = new Logger('HTTP');

  private readonly enabled: boolean;

  constructor(config: ConfigService<Environment, true>) {
    this.enabled = config.get('LOG_REQUESTS', { infer: true }) !== 'false';
  }

  use(req: Request, res: Response, next: NextFunction): void {
    if (!this.enabled) return next();
    const started = process.hrtime.bigint();
    res.on('finish', () => {
      const ms = Number(process.hrtime.bigint() - started) / 1e6;
      this.logger.log({
        requestId: requestIdOf(req),
        method: req.method,
        path: req.originalUrl.split('?')[0],
        status: res.statusCode,
        ms: Number(ms.toFixed(1)),
      });
    });
    next();
  }
}
