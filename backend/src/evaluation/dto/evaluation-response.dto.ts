import type { CellResult } from '@ampwright/common';

export class EvaluationResponseDto {
  engineVersion: string;
  /** One result per cell, in order: values, LaTeX of formula, working and result, checks, series. */
  cells: CellResult[];
}
