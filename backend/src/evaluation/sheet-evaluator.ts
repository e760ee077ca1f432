import { Injectable } from '@nestjs/common';
import type { CellResult, SheetFile } from '@ampwright/common';
import type { PoolFailure, Reservation } from './evaluation-pool';
import { EvaluationService } from './evaluation.service';

/** What evaluating a sheet gave: a domain outcome, never an HTTP error (the caller decides what to answer). */
export type SheetOutcome =
  | {
      ok: true;
      /** Every cell's results, in the sheet's order. */
      results: CellResult[];
      engineVersion: string;
      /** Indexes of the cells evaluated afresh; the others came from the process's cache. */
      evaluated: number[];
      /** The version whose cache the process reused (null: none was; every cell was evaluated). */
      reusedFrom: number | null;
      /** The engine's own time on the sheet, in ms. */
      engineMs: number;
      /** From asking to answer, waiting for a process included, in ms. */
      totalMs: number;
    }
  | {
      ok: false;
      reason: PoolFailure;
      /** A sentence for the person: why, and where when known. */
      message: string;
      /** The index of the cell being evaluated when the sheet was stopped at its deadline, when known. */
      cell?: number;
      totalMs: number;
    };

export interface EvaluateOptions {
  /** The firm whose queue the work runs in. */
  firm: string;
  /** A stored sheet's id: its process keeps the sheet's incremental cache. */
  key?: string;
  /** The stored sheet's version being evaluated, kept with the cache (see SheetsService's save). */
  version?: number;
  /** A place in the firm's queue already held (a save reserves before it writes). */
  reservation?: Reservation;
}

/**
 * Evaluates sheets in the evaluation processes (evaluation-pool.ts, evaluation.child.ts) through the
 * typed messages of sandbox-protocol.ts, and says what came of it.
 */
@Injectable()
export class SheetEvaluator {
  constructor(private readonly evaluation: EvaluationService) {}

  async evaluate(sheet: SheetFile, options: EvaluateOptions): Promise<SheetOutcome> {
    const started = performance.now();
    const outcome = await this.evaluation.run(
      { kind: 'evaluate', sheet, key: options.key, version: options.version },
      { tenant: options.firm, key: options.key, reservation: options.reservation },
    );
    const totalMs = performance.now() - started;
    if (outcome.ok) {
      const { cells, engineVersion, evaluated, reusedFrom, engineMs } = outcome.value;
      return { ok: true, results: cells, engineVersion, evaluated, reusedFrom, engineMs, totalMs };
    }
    const where = outcome.cell !== undefined ? ` It was evaluating cell ${outcome.cell + 1} when it was stopped.` : '';
    return { ok: false, reason: outcome.reason, message: this.evaluation.sentence(outcome.reason, outcome.message) + where, cell: outcome.cell, totalMs };
  }
}
