import { Body, Controller, HttpCode, Post } from '@nestjs/common';
import type { SheetFile } from '@ampwright/common';
import { Roles } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { MEMBER_ROLES } from '../core/roles';
import { EvaluationService } from './evaluation.service';
import { SheetEvaluator } from './sheet-evaluator';
import { SheetFilePipe } from './sheet-file.pipe';
import { EvaluationResponseDto } from './dto/evaluation-response.dto';

@Controller('evaluate')
export class EvaluationController {
  constructor(
    private readonly evaluator: SheetEvaluator,
    private readonly evaluation: EvaluationService,
  ) {}

  /** A sheet in the ampwright.sheet/1 format in, the results of every cell out. */
  @Roles(...MEMBER_ROLES)
  @Post()
  @HttpCode(200)
  async evaluate(@CurrentAuth() auth: AuthContext, @Body(SheetFilePipe) sheet: SheetFile): Promise<EvaluationResponseDto> {
    const outcome = await this.evaluator.evaluate(sheet, { firm: auth.firm.id });
    if (!outcome.ok) throw this.evaluation.failure(outcome.reason, outcome.message, true);
    return { engineVersion: outcome.engineVersion, cells: outcome.results };
  }
}
