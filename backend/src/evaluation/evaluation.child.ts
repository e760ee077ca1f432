/**
 * An evaluation process (forked by EvaluationPool with a heap cap of its own). It evaluates sheets,
 * keeping the incremental-evaluation cache of the sheets it evaluated last (by sheet id), so a save
 * re-evaluates only the cells it can affect; it also parses CSV uploads and opens PKCS#12 files. The
 * cache only saves work — a result is reused only when the cell and everything it reads are unchanged —
 * so a cold or lost cache gives the same results, just later (common/src/cells/incremental.spec.ts).
 * The process holds no secret of the server (its environment is emptied) and exits with its parent.
 */
import { csvToTableCell, ENGINE_VERSION, evaluateSheet, runWithDeadline, type EvaluationCache } from '@ampwright/common';
import { isPlainText } from '../files/plain-text';
import { sheetFingerprint } from './sheet-fingerprint';
import type { SandboxReply, SandboxRequest, SandboxTask, TaskResults } from './sandbox-protocol';

const KEPT = 64;
/** By sheet id: the cache of the last evaluation of that sheet, and the fingerprint of the sheet it evaluated. */
const caches = new Map<string, { fingerprint: string; cache: EvaluationCache }>();

/** The evaluation stopped at its deadline while evaluating cell `cell` (an index). */
class Stopped extends Error {
  constructor(readonly cell: number | undefined) {
    super('stopped at its deadline');
  }
}

function evaluate(task: Extract<SandboxTask, { kind: 'evaluate' }>, timeoutMs: number): TaskResults['evaluate'] {
  const kept = task.key ? caches.get(task.key) : undefined;
  if (task.key) caches.delete(task.key); // kept again only if this evaluation finishes
  let at: number | undefined;
  const started = performance.now();
  const outcome = runWithDeadline(Date.now() + timeoutMs, () => evaluateSheet(task.sheet, kept?.cache, (index) => (at = index)));
  if (outcome.passed) throw new Stopped(at);
  const engineMs = performance.now() - started;
  const evaluation = outcome.value;
  if (task.key) {
    caches.set(task.key, { fingerprint: sheetFingerprint(task.sheet), cache: evaluation.cache });
    if (caches.size > KEPT) caches.delete(caches.keys().next().value as string);
  }
  // Only what differs from `base` when the kept evaluation was of it (the same cells and settings).
  const complete = !(kept && task.base !== undefined && kept.fingerprint === task.base);
  const sent = complete ? evaluation.cells.map((_, index) => index) : [...new Set([...evaluation.evaluated, ...(task.want ?? [])])].sort((a, b) => a - b);
  return {
    results: sent.filter((index) => index < evaluation.cells.length).map((index) => [index, evaluation.cells[index]]),
    complete,
    engineVersion: ENGINE_VERSION,
    evaluated: evaluation.evaluated,
    engineMs,
  };
}

async function certificate(task: Extract<SandboxTask, { kind: 'certificate' }>): Promise<TaskResults['certificate']> {
  const { readP12, CertificateProblem } = await import('../packages/signing');
  try {
    return { ok: true, facts: readP12(Buffer.from(task.p12), task.password) };
  } catch (err) {
    if (err instanceof CertificateProblem) return { ok: false, problem: err.message };
    throw err;
  }
}

async function run(task: SandboxTask, timeoutMs: number): Promise<TaskResults[SandboxTask['kind']]> {
  switch (task.kind) {
    case 'evaluate':
      return evaluate(task, timeoutMs);
    case 'csv':
      return isPlainText(task.bytes) ? csvToTableCell(Buffer.from(task.bytes).toString('utf8')) : { ok: false, binary: true };
    case 'certificate':
      return certificate(task);
  }
}

const reply = (message: SandboxReply) => process.send?.(message);

process.on('message', (message: SandboxRequest) => {
  run(message.task, message.timeoutMs).then(
    (value) => reply({ id: message.id, ok: true, value }),
    (err: Error) =>
      reply(
        err instanceof Stopped
          ? { id: message.id, ok: false, message: err.message, timeout: true, cell: err.cell }
          : { id: message.id, ok: false, message: err.message },
      ),
  );
});
// The server went away (or was killed): nothing is left running.
process.on('disconnect', () => process.exit(0));

// Loaded (the engine is imported above): the pool starts a task's deadline only from here on.
reply({ ready: true });
