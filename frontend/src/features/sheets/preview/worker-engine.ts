/** The preview's engine in a Web Worker (preview.worker.ts), replaced when one evaluation runs on past its time. */
import type { CellResult, SheetFile } from '@ampwright/common';
import type { PreviewEngine } from './sheet-preview';
import type { PreviewReply, PreviewRequest } from './preview-protocol';

/** Past this, the worker is stuck in one operation that never checks the clock: it is ended and a new one started. */
const HARD_LIMIT_MS = 5000;

export class WorkerEngine implements PreviewEngine {
  private worker: Worker | null = null;
  private next = 1;
  private readonly waiting = new Map<
    number,
    { resolve: (r: CellResult[]) => void; reject: (e: Error) => void; partial?: (r: CellResult[]) => void; timer: ReturnType<typeof setTimeout> }
  >();

  /** `name`: the worker's name in the browser's developer tools. */
  constructor(private readonly name: string) {}

  private start(): Worker {
    const worker = new Worker(new URL('./preview.worker.ts', import.meta.url), { type: 'module', name: this.name });
    worker.onmessage = (event: MessageEvent<PreviewReply>) => {
      const m = event.data;
      if ('ready' in m) return;
      const w = this.waiting.get(m.id);
      if (!w) return;
      if ('partial' in m) return w.partial?.(m.results);
      this.waiting.delete(m.id);
      clearTimeout(w.timer);
      if (m.ok) w.resolve(m.results);
      else w.reject(new Error(m.message));
    };
    worker.onerror = (event) => this.restart(new Error(event.message || 'the preview engine failed'));
    return worker;
  }

  private restart(err: Error) {
    this.worker?.terminate();
    this.worker = null;
    for (const w of this.waiting.values()) {
      clearTimeout(w.timer);
      w.reject(err);
    }
    this.waiting.clear();
  }

  evaluate(sheet: Pick<SheetFile, 'cells' | 'settings'>, partial?: (results: CellResult[]) => void): Promise<CellResult[]> {
    this.worker ??= this.start();
    const id = this.next++;
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => this.restart(new Error('the preview took too long')), HARD_LIMIT_MS);
      this.waiting.set(id, { resolve, reject, partial, timer });
      this.worker!.postMessage({ id, sheet } satisfies PreviewRequest);
    });
  }

  dispose(): void {
    this.restart(new Error('the sheet was closed'));
  }
}
