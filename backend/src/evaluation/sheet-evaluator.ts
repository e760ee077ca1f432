import { Injectable } from '@nestjs/common';
import type { Cell, CellResult, SheetFile } from '@ampwright/common';
import type { PoolFailure, PoolOutcome, Reservation } from './evaluation-pool';
import type { SheetEvaluated } from './sandbox-protocol';
import { EvaluationService } from './evaluation.service';

/** Why a sheet could not be evaluated: a domain outcome, never an HTTP error (the caller decides what to answer). */
export interface SheetFailure {
  ok: false;
  reason: PoolFailure;
  /** A sentence for the person: why, and where when known. */
  message: string;
  /** The index of the cell being evaluated when the sheet was stopped at its deadline, when known. */
  cell?: number;
  totalMs: number;
}

interface Evaluated {
  ok: true;
  engineVersion: string;
  /** Indexes of the cells evaluated afresh; the others came from the process's cache. */
  evaluated: number[];
  /** The engine's own time on the sheet, in ms. */
  engineMs: number;
  /** From asking to answer, waiting for a process included, in ms. */
  totalMs: number;
  /** The fingerprint (sheetFingerprint) of the sheet evaluated, to store with its results; absent without a `key`. */
  fingerprint?: string;
}

/** What evaluating a sheet gave: every cell's results, in the sheet's order. */
export type SheetOutcome = (Evaluated & { results: CellResult[] }) | SheetFailure;

/**
 * What evaluating a changed sheet gave: when `complete`, every cell's results; otherwise the process held
 * the evaluation of the sheet before the change, and `results` holds only the cells evaluated afresh and
 * those asked for — the others' results are as they were.
 */
export type ChangeOutcome = (Evaluated & { results: ReadonlyMap<number, CellResult>; complete: boolean }) | SheetFailure;

export interface EvaluateOptions {
  /** The firm whose queue the work runs in. */
  firm: string;
  /** A place in the firm's queue already held (a save reserves before it evaluates). */
  reservation?: Reservation;
  /** A stored sheet's id: its process keeps the sheet's evaluation for the next change. */
  key?: string;
}

export interface ChangeOptions extends EvaluateOptions {
  key: string;
  /** The fingerprint (sheetFingerprint) of the sheet as it was, when its stored results are that sheet's. */
  base?: string;
  /** Indexes of cells whose results the caller needs even if they were not evaluated afresh. */
  want?: number[];
}

/** A one-cell edit: the cell at `index` of the sheet whose fingerprint is `base` becomes `cell`. */
export interface EditOptions extends EvaluateOptions {
  key: string;
  base: string;
  index: number;
  cell: Cell;
}

/**
 * Evaluates sheets in the evaluation processes (evaluation-pool.ts, evaluation.child.ts) through the
 * typed messages of sandbox-protocol.ts, and says what came of it.
 */
@Injectable()
export class SheetEvaluator {
  constructor(private readonly evaluation: EvaluationService) {}

  /** Evaluates a sheet from scratch: every cell's results. */
  async evaluate(sheet: SheetFile, options: EvaluateOptions): Promise<SheetOutcome> {
    const outcome = await this.send(sheet, options);
    if (!outcome.ok) return outcome;
    const results: CellResult[] = [];
    for (const [index, result] of outcome.results) results[index] = result;
    return { ...outcome, results };
  }

  /** Evaluates a sheet after a change, reusing what its process kept of the sheet before it (see ChangeOutcome). */
  evaluateChange(sheet: SheetFile, options: ChangeOptions): Promise<ChangeOutcome> {
    return this.send(sheet, options);
  }

  private async send(sheet: SheetFile, options: EvaluateOptions & Partial<ChangeOptions>): Promise<ChangeOutcome> {
    const started = performance.now();
    const outcome = await this.evaluation.run(
      { kind: 'evaluate', sheet, key: options.key, base: options.base, want: options.want },
      { tenant: options.firm, key: options.key, reservation: options.reservation },
    );
    return this.outcome(outcome, started);
  }

  /**
   * Evaluates a one-cell edit without sending the sheet: its process must keep the evaluation of the sheet
   * `base` names (the stored one); `held: false` when it does not, and nothing was evaluated — the caller
   * then sends the whole sheet (evaluateChange). The results are those that differ from `base`'s, with the
   * edited cell's.
   */
  async evaluateEdit(options: EditOptions): Promise<ChangeOutcome | { held: false; totalMs: number }> {
    const started = performance.now();
    const { key, base, index, cell } = options;
    const outcome = await this.evaluation.run({ kind: 'edit', key, base, index, cell }, { tenant: options.firm, key, reservation: options.reservation });
    if (outcome.ok && 'held' in outcome.value) return { held: false, totalMs: performance.now() - started };
    return this.outcome(outcome as PoolOutcome<SheetEvaluated>, started);
  }

  private outcome(outcome: PoolOutcome<SheetEvaluated>, started: number): ChangeOutcome {
    const totalMs = performance.now() - started;
    if (outcome.ok) {
      const { results, complete, engineVersion, evaluated, engineMs, fingerprint } = outcome.value;
      return { ok: true, results: new Map(results), complete, engineVersion, evaluated, engineMs, totalMs, fingerprint };
    }
    const where = outcome.cell !== undefined ? ` It was evaluating cell ${outcome.cell + 1} when it was stopped.` : '';
    return { ok: false, reason: outcome.reason, message: this.evaluation.sentence(outcome.reason, outcome.message) + where, cell: outcome.cell, totalMs };
  }
}
