import { Injectable, Logger, OnApplicationShutdown } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { CsvTableResult } from '@ampwright/common';
import type { Environment } from '../config/environment';
import { EvaluationException } from '../core/errors/app-exception';
import type { CertificateFacts } from '../packages/signing';
import { evaluationDuration, evaluations, measureEvaluationQueue } from '../metrics/metrics';
import { EvaluationPool, type PoolFailure, type PoolOutcome, type Reservation } from './evaluation-pool';
import { RefusalLog } from './refusal-log';
import type { TaskKind, TaskOf, TaskResults } from './sandbox-protocol';
import { EvaluationErrorCode } from '@ampwright/common';

export type { Reservation } from './evaluation-pool';

export { EvaluationErrorCode };

const CODES: Record<PoolFailure, EvaluationErrorCode> = {
  timeout: EvaluationErrorCode.Timeout,
  memory: EvaluationErrorCode.TooLarge,
  crash: EvaluationErrorCode.Failed,
  busy: EvaluationErrorCode.Busy,
  shutdown: EvaluationErrorCode.Unavailable,
};

/**
 * Runs what users' input drives — sheets, CSV uploads, certificate files — in warm child processes with
 * a deadline and a memory cap each, scheduled fairly between firms (evaluation-pool.ts). A sheet that
 * cannot be evaluated gets a sentence that says why; the server keeps serving.
 */
@Injectable()
export class EvaluationService implements OnApplicationShutdown {
  private readonly pool: EvaluationPool;
  private readonly logger = new Logger('Evaluation');
  private readonly busyRefusals = new RefusalLog();
  private readonly limits: { timeoutMs: number; waitMs: number; memoryMb: number };

  constructor(config: ConfigService<Environment, true>) {
    const processes = config.get('EVALUATION_PROCESSES', { infer: true });
    this.limits = {
      timeoutMs: config.get('EVALUATION_TIMEOUT_MS', { infer: true }),
      waitMs: config.get('EVALUATION_WAIT_MS', { infer: true }),
      memoryMb: config.get('EVALUATION_MEMORY_MB', { infer: true }),
    };
    this.pool = new EvaluationPool({
      processes,
      ...this.limits,
      perTenantRunning: Math.max(1, processes - 1),
      perTenantQueued: config.get('EVALUATION_QUEUE_PER_FIRM', { infer: true }),
      nodeEnv: config.get('NODE_ENV', { infer: true }),
    });
    measureEvaluationQueue(() => this.pool.waiting);
  }

  /** The sentence a person reads when a sheet could not be evaluated. */
  sentence(reason: PoolFailure, detail: string, what: 'sheet' | 'upload' = 'sheet'): string {
    const hint = what === 'sheet' ? ' Look for a very large matrix, sweep or table, or a runaway expression.' : '';
    switch (reason) {
      case 'memory':
        return `This ${what} needs more memory than a ${what} may use (${this.limits.memoryMb} MB), so it was stopped.${hint}`;
      case 'timeout':
        return `This ${what} takes longer than a ${what} may take (${this.limits.timeoutMs / 1000} s), so it was stopped.${hint}`;
      case 'busy':
        return `The evaluator is busy with this firm's other work (${detail}). Try again in a moment.`;
      case 'crash':
        return `This ${what} could not be worked through: ${detail}.`;
      case 'shutdown':
        return `The server is restarting, so this ${what} was not worked through. Try again in a moment.`;
    }
  }

  /** Holds a place in the firm's evaluation queue before a save is written; 429 when the firm's queue is full. */
  reserve(firmId: string): Reservation {
    const reservation = this.pool.reserve(firmId);
    if (!reservation) throw this.failure('busy', 'its queue is full', false);
    return reservation;
  }

  /** Runs `work` holding a place in the firm's queue (429 before any of it when the queue is full). */
  async holding<T>(firmId: string, work: (reservation: Reservation) => Promise<T>): Promise<T> {
    const reservation = this.reserve(firmId);
    try {
      return await work(reservation);
    } finally {
      reservation.release();
    }
  }

  /** Runs a task in an evaluation process (sheets go through SheetEvaluator, which says what came of them). */
  async run<K extends TaskKind>(task: TaskOf<K>, options: { tenant: string; key?: string; reservation?: Reservation }): Promise<PoolOutcome<TaskResults[K]>> {
    const started = process.hrtime.bigint();
    const outcome = await this.pool.run(task, options);
    const result = outcome.ok ? 'ok' : outcome.reason;
    evaluations.inc({ kind: task.kind, outcome: result });
    evaluationDuration.observe({ kind: task.kind, outcome: result }, Number(process.hrtime.bigint() - started) / 1e9);
    // A stopped evaluation is an operator's business (a runaway sheet, a full queue): one line, with the
    // request's id (core/logger.ts), never the sheet's content.
    // A stop for the server's own shutdown is no one's fault and is not logged.
    if (!outcome.ok && outcome.reason !== 'shutdown') {
      // A busy evaluator's refusals are logged once a minute per firm, with how many were not (a flood must
      // not flood the log); every other stop is logged.
      const logged = outcome.reason === 'busy' ? this.busyRefusals.take(options.tenant) : { unlogged: 0 };
      if (logged)
        this.logger.warn({
          event: 'evaluation stopped',
          kind: task.kind,
          reason: outcome.reason,
          firm: options.tenant,
          ...(logged.unlogged ? { notLoggedSince: logged.unlogged } : {}),
        });
    }
    return outcome;
  }

  /** Parses an uploaded CSV off the main thread (common/src/sheet/csv-table.ts). */
  async parseCsv(firm: string, bytes: Buffer): Promise<CsvTableResult | { ok: false; binary: true }> {
    return this.unwrap(await this.run({ kind: 'csv', bytes: new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength) }, { tenant: firm }));
  }

  /** Opens a PKCS#12 file off the main thread; a problem with the file is a sentence, not an exception. */
  async readCertificate(firm: string, p12: Buffer, password: string): Promise<{ ok: true; facts: CertificateFacts } | { ok: false; problem: string }> {
    return this.unwrap(await this.run({ kind: 'certificate', p12: new Uint8Array(p12), password }, { tenant: firm }));
  }

  private unwrap<T>(outcome: PoolOutcome<T>): T {
    if (!outcome.ok) throw this.failure(outcome.reason, outcome.message);
    return outcome.value;
  }

  /** The API's error for work that could not be done (its status by code: 429 when busy, 422 otherwise). */
  failure(reason: PoolFailure, detail: string, worded = false): EvaluationException {
    const message = worded ? detail : this.sentence(reason, detail, 'upload');
    return new EvaluationException(CODES[reason], message);
  }

  /**
   * The processes stop last: Nest calls this after the HTTP server has answered the requests it had (and the
   * package and mail workers have finished the job in hand), so a save in flight at a clean stop is evaluated,
   * not stored with "the server is stopping" in every cell.
   */
  async onApplicationShutdown(): Promise<void> {
    await this.pool.close();
  }
}
