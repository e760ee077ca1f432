/**
 * An evaluation process (forked by EvaluationPool with a heap cap of its own). It evaluates sheets,
 * keeping the incremental-evaluation cache of the sheets it evaluated last (by sheet id), so a save
 * re-evaluates only the cells it can affect and a one-cell edit need send only that cell; it also parses CSV uploads and opens PKCS#12 files. The
 * cache only saves work — a result is reused only when the cell and everything it reads are unchanged —
 * so a cold or lost cache gives the same results, just later (common/src/cells/incremental.spec.ts).
 * The process holds no secret of the server (its environment is emptied) and exits with its parent.
 */
import { csvToTableCell, ENGINE_VERSION, evaluateSheet, runWithDeadline, sealCell, type EvaluationCache, type SheetFile } from '@ampwright/common';
import { isPlainText } from '../files/plain-text';
import { sheetFingerprint } from './sheet-fingerprint';
import type { SandboxReply, SandboxRequest, SandboxTask, SheetEvaluated, TaskOf, TaskResults } from './sandbox-protocol';

const KEPT = 64;
/** The last evaluation of a sheet: its cache, the sheet evaluated and that sheet's fingerprint. */
interface Kept {
  fingerprint: string;
  sheet: SheetFile;
  cache: EvaluationCache;
}
/** By sheet id; kept only when the evaluation finished. */
const caches = new Map<string, Kept>();

/** The evaluation stopped at its deadline while evaluating cell `cell` (an index). */
class Stopped extends Error {
  constructor(readonly cell: number | undefined) {
    super('stopped at its deadline');
  }
}

/**
 * Evaluates `sheet` reusing `kept` (the evaluation of the sheet before it, if any) and keeps the new one
 * under `key`. Every cell's results come back, or — when `base` names the kept sheet — only those of the
 * cells evaluated afresh and of those `want` lists: the caller holds the others already.
 */
function evaluateKept(sheet: SheetFile, timeoutMs: number, kept: Kept | undefined, key?: string, base?: string, want: number[] = []): SheetEvaluated {
  if (key) {
    caches.delete(key); // kept again only if this evaluation finishes
    // Kept cells never change (an edit replaces one), so each cell's JSON is written once, not at every edit.
    sheet.cells.forEach(sealCell);
  }
  let at: number | undefined;
  const started = performance.now();
  const outcome = runWithDeadline(Date.now() + timeoutMs, () => evaluateSheet(sheet, kept?.cache, (index) => (at = index)));
  if (outcome.passed) throw new Stopped(at);
  const engineMs = performance.now() - started;
  const evaluation = outcome.value;
  let fingerprint: string | undefined;
  if (key) {
    fingerprint = sheetFingerprint(sheet);
    caches.set(key, { fingerprint, sheet, cache: evaluation.cache });
    if (caches.size > KEPT) caches.delete(caches.keys().next().value as string);
  }
  // Only what differs from `base` when the kept evaluation was of it (the same cells and settings).
  const complete = !(kept && base !== undefined && kept.fingerprint === base);
  const sent = complete ? evaluation.cells.map((_, index) => index) : [...new Set([...evaluation.evaluated, ...want])].sort((a, b) => a - b);
  return {
    results: sent.filter((index) => index < evaluation.cells.length).map((index) => [index, evaluation.cells[index]]),
    complete,
    engineVersion: ENGINE_VERSION,
    evaluated: evaluation.evaluated,
    engineMs,
    fingerprint,
  };
}

function evaluate(task: TaskOf<'evaluate'>, timeoutMs: number): TaskResults['evaluate'] {
  return evaluateKept(task.sheet, timeoutMs, task.key ? caches.get(task.key) : undefined, task.key, task.base, task.want);
}

/** One cell of a kept sheet replaced: evaluated only when what is kept is the sheet `base` names. */
function edit(task: TaskOf<'edit'>, timeoutMs: number): TaskResults['edit'] {
  const kept = caches.get(task.key);
  if (!kept || kept.fingerprint !== task.base || !Number.isInteger(task.index) || task.index < 0 || task.index >= kept.sheet.cells.length)
    return { held: false };
  const cells = kept.sheet.cells.slice();
  cells[task.index] = task.cell;
  return evaluateKept({ ...kept.sheet, cells }, timeoutMs, kept, task.key, task.base, [task.index]);
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
    case 'edit':
      return edit(task, timeoutMs);
    case 'csv':
      return isPlainText(task.bytes) ? csvToTableCell(Buffer.from(task.bytes).toString('utf8')) : { ok: false, binary: true };
    case 'certificate':
      return certificate(task);
  }
}

const reply = (message: SandboxReply): void => {
  process.send?.(message);
};

/** Tasks run one after another, in the order sent: the pool may send the next while one runs. */
let turn: Promise<void> = Promise.resolve();
process.on('message', (message: SandboxRequest) => {
  turn = turn.then(() =>
    run(message.task, message.timeoutMs).then(
      (value) => reply({ id: message.id, ok: true, value }),
      (err: Error) =>
        reply(
          err instanceof Stopped
            ? { id: message.id, ok: false, message: err.message, timeout: true, cell: err.cell }
            : { id: message.id, ok: false, message: err.message },
        ),
    ),
  );
});
// The server went away (or was killed): nothing is left running.
process.on('disconnect', () => process.exit(0));

// Loaded (the engine is imported above): the pool starts a task's deadline only from here on.
reply({ ready: true });
