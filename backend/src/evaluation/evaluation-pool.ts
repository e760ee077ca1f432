import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import type { CellResult, SheetFile } from '@ampwright/common';

export interface PoolLimits {
  workers: number;
  timeoutMs: number;
  memoryMb: number;
}

export type PoolOutcome =
  | { ok: true; cells: CellResult[]; engineVersion: string }
  | { ok: false; reason: 'timeout' | 'memory' | 'crash'; message: string };

/** How long a sheet's evaluation may wait for the worker holding its cache (a fresh one costs more). */
const AFFINITY_WAIT_MS = 50;

interface Job {
  id: number;
  sheet: SheetFile;
  /** The sheet's id, when the evaluation may use and keep a worker's incremental cache. */
  key?: string;
  queuedAt: number;
  resolve: (outcome: PoolOutcome) => void;
}

/** The compiled worker: beside this file in dist/, or in dist/ when running from source (tests). */
function workerFile(): string {
  const beside = join(__dirname, 'evaluation.worker.js');
  if (existsSync(beside)) return beside;
  return join(__dirname, '..', '..', 'dist', 'evaluation', 'evaluation.worker.js');
}

/**
 * A few worker threads that evaluate sheets. A job past its deadline, or one that runs out of its
 * memory bound, has its worker terminated and replaced; the server itself is never blocked.
 */
export class EvaluationPool {
  private readonly idle: Worker[] = [];
  private readonly queue: Job[] = [];
  private readonly busy = new Map<Worker, { job: Job; timer: NodeJS.Timeout }>();
  /** Workers still loading the engine: a deadline does not count their start-up. */
  private readonly starting = new Set<Worker>();
  /** The worker that last evaluated each sheet (it holds that sheet's cache); bounded, oldest dropped. */
  private readonly lastWorker = new Map<string, Worker>();
  private retry: NodeJS.Timeout | undefined;
  private nextId = 1;
  private closed = false;

  constructor(private readonly limits: PoolLimits) {
    for (let k = 0; k < limits.workers; k++) this.spawn();
  }

  /** Evaluates a sheet; with `key` (the sheet's id) a worker that evaluated it before is preferred. */
  evaluate(sheet: SheetFile, key?: string): Promise<PoolOutcome> {
    if (this.closed) return Promise.resolve({ ok: false, reason: 'crash', message: 'the evaluation service is shutting down' });
    return new Promise((resolve) => {
      this.queue.push({ id: this.nextId++, sheet, key, queuedAt: Date.now(), resolve });
      this.dispatch();
    });
  }

  async close(): Promise<void> {
    this.closed = true;
    clearTimeout(this.retry);
    const all = [...this.idle, ...this.busy.keys(), ...this.starting];
    this.starting.clear();
    this.idle.length = 0;
    for (const [, { job, timer }] of this.busy) {
      clearTimeout(timer);
      job.resolve({ ok: false, reason: 'crash', message: 'the evaluation service is shutting down' });
    }
    this.busy.clear();
    await Promise.all(all.map((w) => w.terminate()));
  }

  private spawn(): Worker {
    const worker = new Worker(workerFile(), {
      resourceLimits: { maxOldGenerationSizeMb: this.limits.memoryMb, maxYoungGenerationSizeMb: Math.max(16, this.limits.memoryMb / 8) },
    });
    this.starting.add(worker);
    worker.on('message', (msg: { ready?: boolean; id: number; ok: boolean; cells?: CellResult[]; engineVersion?: string; message?: string }) => {
      if (msg.ready) {
        this.starting.delete(worker);
        if (this.closed) return;
        this.idle.push(worker);
        this.dispatch();
        return;
      }
      const running = this.busy.get(worker);
      if (!running || running.job.id !== msg.id) return;
      clearTimeout(running.timer);
      this.busy.delete(worker);
      running.job.resolve(msg.ok ? { ok: true, cells: msg.cells!, engineVersion: msg.engineVersion! } : { ok: false, reason: 'crash', message: msg.message ?? 'the evaluation failed' });
      this.idle.push(worker);
      this.dispatch();
    });
    worker.on('error', (err: Error & { code?: string }) => this.fail(worker, err.code === 'ERR_WORKER_OUT_OF_MEMORY' ? 'memory' : 'crash', err.message));
    worker.on('exit', () => this.fail(worker, 'crash', 'the evaluation stopped unexpectedly'));
    worker.unref();
    return worker;
  }

  private fail(worker: Worker, reason: 'timeout' | 'memory' | 'crash', message: string): void {
    const running = this.busy.get(worker);
    const idleAt = this.idle.indexOf(worker);
    const wasStarting = this.starting.delete(worker);
    if (idleAt >= 0) this.idle.splice(idleAt, 1);
    if (running) {
      clearTimeout(running.timer);
      this.busy.delete(worker);
      running.job.resolve({ ok: false, reason, message });
    } else if (idleAt < 0 && !wasStarting) {
      return; // already replaced
    }
    // Its caches go with it: the sheets it held are evaluated afresh wherever there is room.
    for (const [key, w] of this.lastWorker) if (w === worker) this.lastWorker.delete(key);
    worker.removeAllListeners('exit');
    void worker.terminate();
    if (!this.closed) this.spawn();
  }

  private dispatch(): void {
    let k = 0;
    let waiting = false;
    while (this.idle.length && k < this.queue.length) {
      const job = this.queue[k];
      const home = job.key ? this.lastWorker.get(job.key) : undefined;
      // A sheet waits a moment for the worker that holds its cache rather than be evaluated afresh elsewhere.
      if (home && this.busy.has(home) && Date.now() - job.queuedAt < AFFINITY_WAIT_MS) {
        waiting = true;
        k++;
        continue;
      }
      this.queue.splice(k, 1);
      const at = home ? this.idle.indexOf(home) : -1;
      const [worker] = this.idle.splice(at >= 0 ? at : this.idle.length - 1, 1);
      if (job.key) {
        this.lastWorker.delete(job.key);
        this.lastWorker.set(job.key, worker);
        if (this.lastWorker.size > 1000) this.lastWorker.delete(this.lastWorker.keys().next().value as string);
      }
      const timer = setTimeout(() => this.fail(worker, 'timeout', `the evaluation took longer than ${this.limits.timeoutMs / 1000} s`), this.limits.timeoutMs);
      this.busy.set(worker, { job, timer });
      worker.postMessage({ id: job.id, sheet: job.sheet, key: job.key });
    }
    if (waiting && !this.retry) {
      this.retry = setTimeout(() => {
        this.retry = undefined;
        this.dispatch();
      }, AFFINITY_WAIT_MS);
      this.retry.unref();
    }
  }
}
