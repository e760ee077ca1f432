/** The messages between the sheet page and its preview worker (preview.worker.ts). */
import type { CellResult, SheetFile } from '@ampwright/common';

export interface PreviewRequest {
  id: number;
  sheet: Pick<SheetFile, 'cells' | 'settings'>;
}

export type PreviewReply =
  | { id: number; ok: true; results: CellResult[]; evaluated: number[]; ms: number }
  /** The results of the first cells, sent while the rest are still being evaluated (a long sheet's top shows sooner). */
  | { id: number; partial: true; results: CellResult[] }
  /** `stopped`: the sheet took longer than a preview may; the server's evaluation will still come. */
  | { id: number; ok: false; message: string; stopped?: boolean }
  /** Sent once the engine is loaded. */
  | { ready: true };
