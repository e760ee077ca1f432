import { Controller, Get } from '@nestjs/common';
import { Roles } from '../core/decorators/access.decorator';
import { MEMBER_ROLES } from '../core/roles';
import { TemplatesService, type TemplateSummary } from './templates.service';

@Controller('templates')
export class TemplatesController {
  constructor(private readonly templates: TemplatesService) {}

  @Roles(...MEMBER_ROLES)
  @Get()
  list(): TemplateSummary[] {
    return this.templates.list();
  }
}
