import { Controller, Get, Res } from '@nestjs/common';
import type { Response } from 'express';
import { Public } from '../core/decorators/access.decorator';
import { HealthService } from './health.service';
import type { HealthResponseDto } from './dto/health-response.dto';

@Controller('health')
export class HealthController {
  constructor(private readonly health: HealthService) {}

  @Public()
  @Get()
  async get(@Res({ passthrough: true }) res: Response): Promise<HealthResponseDto> {
    const report = await this.health.check();
    res.status(report.status === 'down' ? 503 : 200);
    res.setHeader('cache-control', 'no-store');
    return report;
  }
}
