import { Injectable, Logger, NestMiddleware } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { NextFunction, Request, Response } from 'express';
import type { Environment } from '../../config/environment';

/** One line per request: method, path (no query string, which may carry tokens), status, time. */
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
      this.logger.log(`${req.method} ${req.originalUrl.split('?')[0]} ${res.statusCode} ${ms.toFixed(1)} ms`);
    });
    next();
  }
}
