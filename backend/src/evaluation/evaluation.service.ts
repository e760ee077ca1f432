import { HttpStatus, Injectable, OnModuleDestroy } from '@nestjs/common';
import type { SheetFile } from '@ampwright/common';
import { AppException } from '../core/errors/app-exception';
import { EvaluationPool } from './evaluation-pool';
import type { EvaluationResponseDto } from './dto/evaluation-response.dto';

export enum EvaluationErrorCode {
  Timeout = 'EVALUATION_TIMEOUT',
  TooLarge = 'EVALUATION_TOO_LARGE',
  Failed = 'EVALUATION_FAILED',
}

/** Evaluates sheets in worker threads with a deadline and a memory bound per evaluation. */
@Injectable()
export class EvaluationService implements OnModuleDestroy {
  private readonly pool = new EvaluationPool({ workers: 2, timeoutMs: Number(process.env.EVALUATION_TIMEOUT_MS ?? 2000), memoryMb: 256 });

  /** `key` (a stored sheet's id) lets the worker reuse what it computed for that sheet before. */
  async evaluate(sheet: SheetFile, key?: string): Promise<EvaluationResponseDto> {
    const outcome = await this.pool.evaluate(sheet, key);
    if (outcome.ok) return { engineVersion: outcome.engineVersion, cells: outcome.cells };
    const [code, message] =
      outcome.reason === 'timeout'
        ? [EvaluationErrorCode.Timeout, `The sheet was stopped because ${outcome.message}. Look for a very large sweep, matrix or a runaway expression.`]
        : outcome.reason === 'memory'
          ? [EvaluationErrorCode.TooLarge, 'The sheet was stopped because it needed more memory than an evaluation may use. Look for a very large matrix or sweep.']
          : [EvaluationErrorCode.Failed, `The sheet could not be evaluated: ${outcome.message}.`];
    throw new AppException(code, message, HttpStatus.UNPROCESSABLE_ENTITY);
  }

  async onModuleDestroy(): Promise<void> {
    await this.pool.close();
  }
}
