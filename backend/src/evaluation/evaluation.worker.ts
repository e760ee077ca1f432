/**
 * Runs sheet evaluations off the main thread, so the server can stop one at its deadline. Each worker
 * keeps the incremental-evaluation cache of the sheets it evaluated last (by sheet id): a save then
 * re-evaluates only the cells it can affect. The cache only saves work — a result is reused only
 * when the cell and everything it reads are unchanged — so a cold or evicted cache gives the same
 * results, just later (common/src/cells/incremental.spec.ts).
 */
import { parentPort } from 'node:worker_threads';
import { ENGINE_VERSION, evaluateSheet, type EvaluationCache, type SheetFile } from '@ampwright/common';

const KEPT = 64;
const caches = new Map<string, EvaluationCache>();

parentPort?.on('message', (message: { id: number; sheet: SheetFile; key?: string }) => {
  try {
    const previous = message.key ? caches.get(message.key) : undefined;
    const evaluation = evaluateSheet(message.sheet, previous);
    if (message.key) {
      caches.delete(message.key);
      caches.set(message.key, evaluation.cache);
      if (caches.size > KEPT) caches.delete(caches.keys().next().value as string);
    }
    parentPort?.postMessage({ id: message.id, ok: true, cells: evaluation.cells, engineVersion: ENGINE_VERSION, evaluated: evaluation.evaluated.length });
  } catch (err) {
    if (message.key) caches.delete(message.key);
    parentPort?.postMessage({ id: message.id, ok: false, message: (err as Error).message });
  }
});

// Loaded (the engine is imported above): the pool starts an evaluation's deadline only from here on.
parentPort?.postMessage({ ready: true });
