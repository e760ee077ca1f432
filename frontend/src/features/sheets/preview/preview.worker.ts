/**
 * The preview worker: the engine from common (the same code the server's evaluation processes run),
 * evaluating the sheet as it is being typed, off the page's thread. It keeps the evaluation's cache
 * between requests, so an edit re-evaluates only the edited cell and the cells that depend on it. A
 * sheet that takes longer than PREVIEW_DEADLINE_MS is stopped (the server's evaluation still comes);
 * one that does not even reach a check of the clock is ended by the page, which replaces the worker.
 */
import { evaluateSheet, runWithDeadline, type EvaluationCache } from '@ampwright/common';
import { PartialCadence } from './partial-cadence';
import type { PreviewReply, PreviewRequest } from './preview-protocol';

const PREVIEW_DEADLINE_MS = 2000;

let cache: EvaluationCache | undefined;
const reply = (message: PreviewReply) => (self as unknown as Worker).postMessage(message);

self.onmessage = (event: MessageEvent<PreviewRequest>) => {
  const { id, sheet } = event.data;
  const started = performance.now();
  try {
    const cadence = new PartialCadence(started);
    const outcome = runWithDeadline(Date.now() + PREVIEW_DEADLINE_MS, () =>
      // Called before each cell evaluated afresh, with the results done so far.
      evaluateSheet(sheet, cache, (_index, done) => {
        if (cadence.due(done.length, performance.now())) reply({ id, partial: true, results: done.slice() });
      }),
    );
    if (outcome.passed) {
      cache = undefined;
      reply({ id, ok: false, stopped: true, message: 'the preview took too long; the server is evaluating the sheet' });
      return;
    }
    cache = outcome.value.cache;
    reply({ id, ok: true, results: outcome.value.cells, evaluated: outcome.value.evaluated, ms: performance.now() - started });
  } catch (err) {
    cache = undefined;
    reply({ id, ok: false, message: (err as Error).message });
  }
};

reply({ ready: true });
