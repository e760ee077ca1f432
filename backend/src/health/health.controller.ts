import { Controller, Get, Res } from '@nestjs/common';
import type { Response } from 'express';
import { Public } from '../core/decorators/access.decorator';
import { HealthService } from './health.service';
import type { HealthResponseDto } from './dto/health-response.dto';

/**
 * GET /api/health: the full report (database, mail, object store). GET /api/health/live: the process
 * answers (for a supervisor's restart decision). GET /api/health/ready: it can serve requests — the
 * database answers now; mail and the object store are taken from the last check (at most 30 s old), so a
 * load balancer asking every second costs no connection to them.
 */
@Controller('health')
export class HealthController {
  constructor(private readonly health: HealthService) {}

  @Public()
  @Get('live')
  live(@Res({ passthrough: true }) res: Response): { status: 'live' } {
    res.setHeader('cache-control', 'no-store');
    return { status: 'live' };
  }

  @Public()
  @Get('ready')
  async ready(@Res({ passthrough: true }) res: Response): Promise<HealthResponseDto> {
    return this.get(res);
  }

  @Public()
  @Get()
  async get(@Res({ passthrough: true }) res: Response): Promise<HealthResponseDto> {
    const report = await this.health.check();
    res.status(report.status === 'down' ? 503 : 200);
    res.setHeader('cache-control', 'no-store');
    return report;
  }
}
