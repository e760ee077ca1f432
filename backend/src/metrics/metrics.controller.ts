import { Controller, Get, Header, Req } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { Request } from 'express';
import { timingSafeEqual } from 'node:crypto';
import type { Environment } from '../config/environment';
import { Public } from '../core/decorators/access.decorator';
import { ErrorCode, RequestException } from '../core/errors/app-exception';
import { registry } from './metrics';

const LOOPBACK = /^(127\.|::1$|::ffff:127\.)/;

/**
 * GET /api/metrics for a Prometheus scraper: with METRICS_TOKEN set, only with `Authorization: Bearer <token>`;
 * without it, only from this machine (loopback) and not through a proxy (a proxy on this machine would make every
 * client look local: it names them in X-Forwarded-For or Forwarded). Anyone else is told it is not there.
 */
@Controller('metrics')
export class MetricsController {
  private readonly token?: Buffer;

  constructor(config: ConfigService<Environment, true>) {
    const token = config.get('METRICS_TOKEN', { infer: true });
    this.token = token ? Buffer.from(token) : undefined;
  }

  @Public()
  @Get()
  @Header('Content-Type', registry.contentType)
  @Header('Cache-Control', 'no-store')
  async get(@Req() req: Request): Promise<string> {
    if (!this.allowed(req)) throw new RequestException(ErrorCode.NotFound, 'Cannot GET /api/metrics');
    return registry.metrics();
  }

  private allowed(req: Request): boolean {
    if (!this.token) return LOOPBACK.test(req.socket.remoteAddress ?? '') && !req.get('x-forwarded-for') && !req.get('forwarded');
    const given = Buffer.from((req.get('authorization') ?? '').replace(/^Bearer /, ''));
    return given.length === this.token.length && timingSafeEqual(given, this.token);
  }
}
