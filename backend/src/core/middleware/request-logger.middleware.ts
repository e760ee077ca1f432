import { Injectable, Logger, NestMiddleware } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { NextFunction, Request, Response } from 'express';
import type { Environment } from '../../config/environment';
import { httpDuration } from '../../metrics/metrics';
import { requestIdOf } from './request-id';

/** Every request's time into the metrics, and one log line per request: its id, method, path (no query string, which may carry tokens), status, time. */
@Injectable()
export class RequestLoggerMiddleware implements NestMiddleware {
  private readonly logger = new Logger('HTTP');

  private readonly enabled: boolean;

  constructor(config: ConfigService<Environment, true>) {
    this.enabled = config.get('LOG_REQUESTS', { infer: true }) !== 'false';
  }

  use(req: Request, res: Response, next: NextFunction): void {
    const started = process.hrtime.bigint();
    res.on('finish', () => {
      const ms = Number(process.hrtime.bigint() - started) / 1e6;
      // The route's pattern (/api/sheets/:id), never the address itself, so the metric's labels stay few.
      const route = (req.route as { path?: string } | undefined)?.path;
      httpDuration.observe(
        { method: req.method, route: route ?? (req.originalUrl.startsWith('/api') ? 'unmatched' : 'static'), status: res.statusCode },
        ms / 1000,
      );
      if (!this.enabled) return;
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
