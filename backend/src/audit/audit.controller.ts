import { Controller, Get } from '@nestjs/common';
import type { AuditEventDto } from '@ampwright/common';
import { Roles } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { AuditService } from './audit.service';

@Controller('audit')
export class AuditController {
  constructor(private readonly audit: AuditService) {}

  /** The firm's latest audit events (owner only). */
  @Roles('owner')
  @Get()
  async list(@CurrentAuth() auth: AuthContext): Promise<AuditEventDto[]> {
    const events = await this.audit.forFirm(auth.firm.id);
    return events.map((e) => ({
      id: e.id,
      type: e.type,
      userId: e.userId ?? null,
      email: e.email ?? null,
      detail: e.detail ?? null,
      at: e.createdAt.toISOString(),
    }));
  }
}
