import { Body, Controller, HttpCode, Post } from '@nestjs/common';
import type { SheetFile } from '@ampwright/common';
import { Roles } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { MEMBER_ROLES } from '../core/roles';
import { EvaluationService } from './evaluation.service';
import { SheetFilePipe } from './sheet-file.pipe';
import { EvaluationResponseDto } from './dto/evaluation-response.dto';

@Controller('evaluate')
export class EvaluationController {
  constructor(private readonly evaluation: EvaluationService) {}

  /** A sheet in the ampwright.sheet/1 format in, the results of every cell out. */
  @Roles(...MEMBER_ROLES)
  @Post()
  @HttpCode(200)
  evaluate(@CurrentAuth() auth: AuthContext, @Body(SheetFilePipe) sheet: SheetFile): Promise<EvaluationResponseDto> {
    return this.evaluation.evaluateOrThrow(sheet, { firm: auth.session.firm.id });
  }
}
