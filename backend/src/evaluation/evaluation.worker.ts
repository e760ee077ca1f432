/** Runs one sheet evaluation off the main thread, so the server can stop it at its deadline. */
import { parentPort } from 'node:worker_threads';
import { ENGINE_VERSION, evaluateSheet, type SheetFile } from '@ampwright/common';

parentPort?.on('message', (message: { id: number; sheet: SheetFile }) => {
  try {
    const evaluation = evaluateSheet(message.sheet);
    parentPort?.postMessage({ id: message.id, ok: true, cells: evaluation.cells, engineVersion: ENGINE_VERSION });
  } catch (err) {
    parentPort?.postMessage({ id: message.id, ok: false, message: (err as Error).message });
  }
});

// Loaded (the engine is imported above): the pool starts an evaluation's deadline only from here on.
parentPort?.postMessage({ ready: true });
