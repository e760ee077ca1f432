import { fork, type ChildProcess } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { SandboxReply, TaskKind, TaskOf, TaskResults } from './sandbox-protocol';

export interface PoolLimits {
  /** Warm evaluation processes. */
  processes: number;
  /** The longest a task may run once a process has it. */
  timeoutMs: number;
  /** The longest a task may wait for a process; a caller waits at most waitMs + timeoutMs in all. */
  waitMs: number;
  /** Each process's V8 heap cap; its resident memory may reach twice this before it is stopped. */
  memoryMb: number;
  /** Tasks of one tenant (a firm) running at once: fewer than the processes, so one firm never holds them all. */
  perTenantRunning: number;
  /** Tasks of one tenant running, queued or reserved; beyond it the tenant is told the evaluator is busy. */
  perTenantQueued: number;
  /** The NODE_ENV the processes run with (the only setting they are given). */
  nodeEnv?: string;
}

/** Why a task was not done: its deadline, its memory, its process died, the tenant's queue was full, or the pool was closed. */
export type PoolFailure = 'timeout' | 'memory' | 'crash' | 'busy' | 'shutdown';
const SHUTTING_DOWN = 'the server is stopping';
/** `cell`: for a task stopped at its deadline, the index of the cell it was evaluating, when known. */
export type PoolOutcome<T> = { ok: true; value: T } | { ok: false; reason: PoolFailure; message: string; cell?: number };

/** A place in a tenant's queue held before the work that needs it (a save reserves before it writes). */
export interface Reservation {
  readonly tenant: string;
  /** Gives the place back unused; harmless after it was used. */
  release(): void;
}

interface Job {
  id: number;
  tenant: string;
  task: TaskOf<TaskKind>;
  /** A stored sheet's id: the task prefers the process that holds that sheet's cache. */
  key?: string;
  queuedAt: number;
  expiry: NodeJS.Timeout;
  resolve: (outcome: PoolOutcome<unknown>) => void;
}

interface Child {
  proc: ChildProcess;
  ready: boolean;
  job?: Job;
  /**
   * A one-cell edit of the same firm sent to this process while the edit `job` runs, to start the moment `job` is done
   * (the process takes its messages in turn): it need not wait for the server to read `job`'s answer and send
   * it on, which under load takes several times the evaluation itself (EvaluationPool.handOver).
   */
  next?: Job;
  timer?: NodeJS.Timeout;
  /** Why the pool stopped it, when it did. */
  stoppedFor?: { reason: PoolFailure; message: string };
  /** The tail of its standard error, to tell running out of memory from other deaths. */
  stderr: string;
}

/** How long a sheet's evaluation may wait for the process holding its cache (a fresh one costs more). */
const AFFINITY_WAIT_MS = 50;
/**
 * How long a one-cell edit may wait for the process holding its sheet while that process runs a task of the
 * same firm: anywhere else it is answered "not held" and the save sends the whole sheet to be evaluated
 * afresh — many times the work of the edit, which under load makes the queue longer still. Behind another
 * firm's task (which may run to its deadline) it waits only AFFINITY_WAIT_MS: one firm never holds up another's saves.
 */
const EDIT_AFFINITY_WAIT_MS = 500;
/** The longest a task waits for the first evaluator to finish starting. */
const STARTING_GRACE_MS = 30_000;
/**
 * An evaluation stops itself at its deadline and the process lives on (common/src/language/deadline.ts);
 * one that does not (a single long operation) has its process killed this much later.
 */
const HARD_GRACE_MS = 1000;
/** A tenant whose task ran to its deadline or out of memory runs one task at a time for this long. */
const PENALTY_MS = 30_000;
const MEMORY_WORDS = /heap out of memory|Reached heap limit|Allocation failed|Invalid (array|string|typed array) length|Array buffer allocation failed/i;
const PAGE_BYTES = 4096;

/** The compiled child: beside this file in dist/, or in dist/ when running from source (tests). */
function childFile(): string {
  const beside = join(__dirname, 'evaluation.child.js');
  if (existsSync(beside)) return beside;
  return join(__dirname, '..', '..', 'dist', 'evaluation', 'evaluation.child.js');
}

/** Resident memory of a process in bytes (Linux's /proc), or undefined where it cannot be read. */
function residentBytes(pid: number | undefined): number | undefined {
  if (!pid) return undefined;
  try {
    return Number(readFileSync(`/proc/${pid}/statm`, 'utf8').split(' ')[1]) * PAGE_BYTES;
  } catch {
    return undefined;
  }
}

/**
 * Warm child processes that do the work a user's input drives: evaluating sheets, parsing uploads.
 * Each has its own heap cap; a task past its deadline, or a process that runs out of memory or dies,
 * has that process killed and replaced, and the task answered with the reason — the server itself never
 * runs the work, so no sheet can abort it. Scheduling is fair between tenants (firms): each may run only
 * `perTenantRunning` tasks at once and hold `perTenantQueued`, and a free process goes to the tenant with
 * the fewest running, so one firm saturating evaluation leaves a process for the others. A task that
 * waits longer than `waitMs` is answered as busy rather than queued without limit.
 */
export class EvaluationPool {
  private readonly children = new Set<Child>();
  private readonly queue: Job[] = [];
  private readonly running = new Map<string, number>();
  /** Running + queued + reserved, by tenant. */
  private readonly held = new Map<string, number>();
  /** The process that last evaluated each sheet (it holds that sheet's cache); bounded, oldest dropped. */
  private readonly lastChild = new Map<string, Child>();
  /** Tenants whose tasks recently had to be stopped, with until when they run one task at a time. */
  private readonly penalised = new Map<string, number>();
  private retry: NodeJS.Timeout | undefined;
  private watch: NodeJS.Timeout | undefined;
  private nextId = 1;
  private closed = false;

  constructor(private readonly limits: PoolLimits) {
    for (let k = 0; k < limits.processes; k++) this.spawn();
    this.watch = setInterval(() => this.watchMemory(), 100);
    this.watch.unref();
  }

  /** Tasks waiting for a free process, or handed over to one and waiting for the edit before them there. */
  get waiting(): number {
    let handedOver = 0;
    for (const child of this.children) if (child.next) handedOver += 1;
    return this.queue.length + handedOver;
  }

  /** Resolves once every process has loaded the engine (a task's deadline starts only then anyway). */
  async ready(): Promise<void> {
    while (!this.closed && [...this.children].some((c) => !c.ready)) await new Promise((r) => setTimeout(r, 20));
  }

  /** Holds a place for a tenant's task, or undefined when the tenant already holds all it may. */
  reserve(tenant: string): Reservation | undefined {
    if ((this.held.get(tenant) ?? 0) >= this.limits.perTenantQueued) return undefined;
    this.hold(tenant, +1);
    let released = false;
    const reservation = {
      tenant,
      release: () => {
        if (released) return;
        released = true;
        this.hold(tenant, -1);
      },
    };
    return reservation;
  }

  /**
   * Runs a task for a tenant. With a reservation the task takes the place it holds (and releases it
   * when done); without one it is refused as busy when the tenant holds all it may.
   */
  run<K extends TaskKind>(task: TaskOf<K>, options: { tenant: string; key?: string; reservation?: Reservation }): Promise<PoolOutcome<TaskResults[K]>> {
    const { tenant, key } = options;
    if (this.closed) return Promise.resolve({ ok: false, reason: 'shutdown', message: SHUTTING_DOWN });
    const reservation = options.reservation ?? this.reserve(tenant);
    if (!reservation)
      return Promise.resolve({ ok: false, reason: 'busy', message: `this firm already has ${this.limits.perTenantQueued} evaluations running or waiting` });
    return new Promise((resolve) => {
      const id = this.nextId++;
      const job: Job = {
        id,
        tenant,
        task,
        key,
        queuedAt: Date.now(),
        expiry: setTimeout(() => this.expire(id), this.limits.waitMs),
        resolve: (outcome) => {
          clearTimeout(job.expiry);
          reservation.release();
          resolve(outcome as PoolOutcome<TaskResults[K]>);
        },
      };
      this.queue.push(job);
      this.dispatch();
    });
  }

  /** Kills the processes; work not done by then, running or waiting, is answered `shutdown`. */
  async close(): Promise<void> {
    this.closed = true;
    clearTimeout(this.retry);
    clearInterval(this.watch);
    for (const job of this.queue.splice(0)) job.resolve({ ok: false, reason: 'shutdown', message: SHUTTING_DOWN });
    const exits: Promise<void>[] = [];
    for (const child of this.children) {
      clearTimeout(child.timer);
      for (const job of [child.job, child.next]) job?.resolve({ ok: false, reason: 'shutdown', message: SHUTTING_DOWN });
      child.job = child.next = undefined;
      if (child.proc.exitCode === null && child.proc.signalCode === null) {
        exits.push(new Promise((r) => child.proc.once('exit', () => r())));
        child.proc.kill('SIGKILL');
      }
    }
    this.children.clear();
    await Promise.all(exits);
  }

  private hold(tenant: string, delta: number): void {
    const n = (this.held.get(tenant) ?? 0) + delta;
    if (n > 0) this.held.set(tenant, n);
    else this.held.delete(tenant);
  }

  private spawn(): void {
    const proc = fork(childFile(), [], {
      execArgv: [`--max-old-space-size=${this.limits.memoryMb}`, '--max-semi-space-size=16'],
      serialization: 'advanced',
      stdio: ['ignore', 'ignore', 'pipe', 'ipc'],
      // No secret of the server reaches the process that runs users' input.
      env: { NODE_ENV: this.limits.nodeEnv ?? 'production' },
    });
    const child: Child = { proc, ready: false, stderr: '' };
    this.children.add(child);
    proc.stderr?.on('data', (chunk: Buffer) => {
      child.stderr = (child.stderr + chunk.toString('utf8')).slice(-4096);
    });
    proc.on('message', (msg: SandboxReply) => {
      if ('ready' in msg) {
        child.ready = true;
        this.dispatch();
        return;
      }
      const job = child.job;
      if (!job || job.id !== msg.id) return;
      clearTimeout(child.timer);
      child.job = undefined;
      this.ran(job.tenant, -1);
      // The edit handed over is running already: it is this process's task from now on.
      if (child.next) this.start(child, child.next);
      if (msg.ok) job.resolve({ ok: true, value: msg.value });
      else if (msg.timeout) {
        this.penalised.set(job.tenant, Date.now() + PENALTY_MS);
        job.resolve({ ok: false, reason: 'timeout', message: this.tookTooLong(), cell: msg.cell });
      } else job.resolve({ ok: false, reason: 'crash', message: msg.message });
      this.dispatch();
    });
    proc.on('error', () => this.stop(child, { reason: 'crash', message: 'the evaluation process could not be reached' }));
    proc.on('exit', (code, signal) => this.exited(child, code, signal));
    proc.unref();
    proc.channel?.unref();
  }

  /** Kills a process for a reason; its task is answered with that reason when it has exited. */
  private stop(child: Child, why: { reason: PoolFailure; message: string }): void {
    child.stoppedFor ??= why;
    child.proc.kill('SIGKILL');
  }

  private exited(child: Child, code: number | null, signal: NodeJS.Signals | null): void {
    if (!this.children.delete(child)) return;
    clearTimeout(child.timer);
    for (const [key, c] of this.lastChild) if (c === child) this.lastChild.delete(key);
    const job = child.job;
    child.job = undefined;
    // An edit handed over but not begun did nothing wrong: it waits again, first in line.
    if (child.next) this.requeue(child.next);
    child.next = undefined;
    if (job) {
      this.ran(job.tenant, -1);
      if (child.stoppedFor?.reason === 'timeout' || child.stoppedFor?.reason === 'memory' || MEMORY_WORDS.test(child.stderr))
        this.penalised.set(job.tenant, Date.now() + PENALTY_MS);
      const why =
        child.stoppedFor ??
        (MEMORY_WORDS.test(child.stderr)
          ? { reason: 'memory' as const, message: 'it needed more memory than a sheet may use' }
          : { reason: 'crash' as const, message: `the evaluation process stopped unexpectedly (${signal ?? `exit code ${code}`})` });
      job.resolve({ ok: false, ...why });
    }
    if (!this.closed) this.spawn();
    this.dispatch();
  }

  private tookTooLong(): string {
    return `it took longer than ${this.limits.timeoutMs / 1000} s`;
  }

  private ran(tenant: string, delta: number): void {
    const n = (this.running.get(tenant) ?? 0) + delta;
    if (n > 0) this.running.set(tenant, n);
    else this.running.delete(tenant);
  }

  private expire(id: number): void {
    const at = this.queue.findIndex((j) => j.id === id);
    if (at < 0) return;
    // While no evaluator has started yet (the server or a seed just booted, on a loaded machine), the
    // wait has not really begun: it is counted again, up to STARTING_GRACE_MS from when the task came.
    const waiting = this.queue[at];
    if (![...this.children].some((c) => c.ready) && Date.now() - waiting.queuedAt < STARTING_GRACE_MS) {
      waiting.expiry = setTimeout(() => this.expire(id), this.limits.waitMs);
      return;
    }
    const [job] = this.queue.splice(at, 1);
    job.resolve({ ok: false, reason: 'busy', message: `it waited ${this.limits.waitMs / 1000} s for a free evaluator` });
  }

  private watchMemory(): void {
    const limit = 2 * this.limits.memoryMb * 1024 * 1024;
    for (const child of this.children) {
      if (!child.job) continue;
      const rss = residentBytes(child.proc.pid);
      if (rss !== undefined && rss > limit) this.stop(child, { reason: 'memory', message: 'it needed more memory than a sheet may use' });
    }
  }

  /** Puts a job that had left the queue back at its head, with the rest of its wait before it. */
  private requeue(job: Job): void {
    this.queue.unshift(job);
    job.expiry = setTimeout(() => this.expire(job.id), Math.max(0, job.queuedAt + this.limits.waitMs - Date.now()));
  }

  /**
   * Sends a waiting one-cell edit to the process that keeps its sheet while that process runs another edit of
   * the same firm (short, as a rule), when nothing is handed over there yet and the firm is not running one
   * task at a time: it would wait for that process anyway (EDIT_AFFINITY_WAIT_MS), and now it starts there the
   * moment the running edit ends, without a round trip through the server's busy event loop. It takes no
   * process from anyone, so fairness between firms is as before; behind a whole sheet's evaluation, which may
   * run to its deadline, an edit still waits in the queue.
   */
  private handOver(): void {
    for (const job of [...this.queue]) {
      if (job.task.kind !== 'edit' || !job.key || this.runningCap(job.tenant) < this.limits.perTenantRunning) continue;
      const home = this.lastChild.get(job.key);
      const running = home?.job;
      if (!home || !running || running.task.kind !== 'edit' || running.tenant !== job.tenant || home.next || home.stoppedFor || !this.children.has(home))
        continue;
      this.queue.splice(this.queue.indexOf(job), 1);
      clearTimeout(job.expiry);
      home.next = job;
      this.send(home, job);
    }
  }

  /** How long a job may wait for the process that keeps its sheet's evaluation, which is running `running`. */
  private affinityWait(job: Job, running: Job): number {
    return job.task.kind === 'edit' && running.tenant === job.tenant ? EDIT_AFFINITY_WAIT_MS : AFFINITY_WAIT_MS;
  }

  /** How many tasks a tenant may run at once: one while it is penalised for tasks that had to be stopped. */
  private runningCap(tenant: string): number {
    const until = this.penalised.get(tenant);
    if (until === undefined) return this.limits.perTenantRunning;
    if (until > Date.now()) return 1;
    this.penalised.delete(tenant);
    return this.limits.perTenantRunning;
  }

  /** The next job to start: from the tenant with the fewest running, oldest first, waiting briefly for a cache's process. */
  private pick(idle: Child[]): { job: Job; child: Child } | { wait: true } | undefined {
    let best: Job | undefined;
    let waiting = false;
    for (const job of this.queue) {
      const running = this.running.get(job.tenant) ?? 0;
      if (running >= this.runningCap(job.tenant)) continue;
      if (best && running >= (this.running.get(best.tenant) ?? 0)) continue;
      const home = job.key ? this.lastChild.get(job.key) : undefined;
      if (home && home.job && this.children.has(home) && Date.now() - job.queuedAt < this.affinityWait(job, home.job)) {
        waiting = true;
        continue;
      }
      best = job;
    }
    if (!best) return waiting ? { wait: true } : undefined;
    const home = best.key ? this.lastChild.get(best.key) : undefined;
    if (home && idle.includes(home)) return { job: best, child: home };
    // Elsewhere: the idle process holding the fewest sheets' caches, so other sheets keep theirs.
    const holding = new Map<Child, number>();
    for (const c of this.lastChild.values()) holding.set(c, (holding.get(c) ?? 0) + 1);
    const child = idle.reduce((a, b) => ((holding.get(b) ?? 0) < (holding.get(a) ?? 0) ? b : a));
    return { job: best, child };
  }

  private dispatch(): void {
    this.handOver();
    for (;;) {
      const idle = [...this.children].filter((c) => c.ready && !c.job && !c.stoppedFor);
      if (!idle.length || !this.queue.length) return;
      const next = this.pick(idle);
      if (!next) return;
      if ('wait' in next) {
        this.retry ??= setTimeout(() => {
          this.retry = undefined;
          this.dispatch();
        }, AFFINITY_WAIT_MS);
        this.retry.unref?.();
        return;
      }
      const { job, child } = next;
      this.queue.splice(this.queue.indexOf(job), 1);
      clearTimeout(job.expiry);
      if (job.key) {
        this.lastChild.delete(job.key);
        this.lastChild.set(job.key, child);
        if (this.lastChild.size > 1000) this.lastChild.delete(this.lastChild.keys().next().value as string);
      }
      this.start(child, job);
      this.send(child, job);
    }
  }

  /** Makes `job` the task `child` runs, with its hard deadline (a job handed over was sent already). */
  private start(child: Child, job: Job): void {
    if (child.next === job) child.next = undefined;
    child.job = job;
    this.ran(job.tenant, +1);
    child.timer = setTimeout(() => this.stop(child, { reason: 'timeout', message: this.tookTooLong() }), this.limits.timeoutMs + HARD_GRACE_MS);
  }

  private send(child: Child, job: Job): void {
    child.proc.send({ id: job.id, task: job.task, timeoutMs: this.limits.timeoutMs }, (err) => {
      if (err) this.stop(child, { reason: 'crash', message: 'the evaluation process could not be reached' });
    });
  }
}
