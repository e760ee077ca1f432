/**
 * The preview of a sheet being edited: the cells as they are on screen (the stored sheet with the
 * drafts being typed) evaluated in the browser by the engine from common, so an edit's results show at
 * once, marked as a preview, before the server's stored results arrive. Once the stored sheet holds
 * what the preview evaluated (every draft saved), the stored results stand; where they differ from the
 * preview that was shown, the difference is given to the cell to show.
 *
 * Requests are latest-wins: while the engine works, only the newest sheet waits for it.
 */
import { resultFigures, type CellDto, type CellResult, type SheetDto, type SheetFile } from '@ampwright/common';
import { cellBody, sameCell, type CellBody } from '../api/change-sheet';

/**
 * Evaluates a sheet; rejects when it cannot (the preview is then left out, nothing else). It may first
 * hand `partial` the final results of the sheet's first cells.
 */
export interface PreviewEngine {
  evaluate(sheet: Pick<SheetFile, 'cells' | 'settings'>, partial?: (results: CellResult[]) => void): Promise<CellResult[]>;
  dispose(): void;
}

export interface CellPreview {
  /** The result to show: the preview's where it is ahead of the stored one, else the stored one. */
  result: CellResult | null;
  /** The result shown is the preview's, not yet stored. */
  preview: boolean;
  /** The stored result differs from the preview evaluated for the same content: what differs. */
  differs: string | null;
}

interface Evaluated {
  /** The cells the preview evaluated: the stored cell where it had no draft, and the body evaluated. */
  inputs: { id: string; stored?: CellDto; body: CellBody }[];
  results: Map<string, CellResult>;
  /** Every cell's result is of these inputs (not only the first cells'). */
  complete: boolean;
}

const outcomes = new WeakMap<CellResult, Record<string, string>>();
/** What a result shows, as text by name: its figures, its errors, a check's verdict. */
function outcome(kind: string, r: CellResult): Record<string, string> {
  let o = outcomes.get(r);
  if (!o) {
    o = { ...resultFigures(kind, r), status: r.status };
    if (r.kind === 'check') o.pass = String((r as { pass: boolean | null }).pass);
    outcomes.set(r, o);
  }
  return o;
}

/** The names whose shown value differs, as "name: preview a, stored b"; null when none does. */
export function difference(kind: string, preview: CellResult, stored: CellResult): string | null {
  const a = outcome(kind, preview);
  const b = outcome(kind, stored);
  const names = [...new Set([...Object.keys(a), ...Object.keys(b)])].filter((n) => a[n] !== b[n]);
  return names.length ? names.map((n) => `${n}: preview ${a[n] ?? '(none)'}, stored ${b[n] ?? '(none)'}`).join('; ') : null;
}

/**
 * The stored result is the preview's in every part (not only what is shown): the preview's object, already
 * drawn, then stands for it, and nothing is drawn again.
 */
function sameResult(preview: CellResult, stored: CellResult): boolean {
  return preview === stored || JSON.stringify(preview) === JSON.stringify(stored);
}

export class SheetPreview {
  private stored: SheetDto | null = null;
  private readonly drafts = new Map<string, CellBody>();
  private latest: Evaluated | null = null;
  private running = false;
  private queued = false;
  private views = new Map<string, CellPreview>();
  private readonly listeners = new Set<() => void>();

  constructor(private readonly engine: PreviewEngine) {}

  /** The sheet as the server holds it (the page's cached copy). */
  setSheet(sheet: SheetDto): void {
    if (sheet === this.stored) return;
    this.stored = sheet;
    // The drafts now sit on another stored sheet (a save's answer, or someone else's change): evaluated again on it.
    if (this.drafts.size) this.request();
    // Nothing is typed and the new stored sheet is not what the preview evaluated (someone else's change): the preview is of nothing on screen.
    else if (this.latest && !this.caughtUp(this.latest, sheet.cells)) this.latest = null;
    this.refresh();
  }

  /** A cell's draft as typed, or null once there is none (saved, or given up). */
  setDraft(cellId: string, body: CellBody | null): void {
    if (body) this.drafts.set(cellId, body);
    else if (!this.drafts.delete(cellId)) return;
    if (body) this.request();
    this.refresh();
  }

  /** The cell's view, or null before the sheet has been given (the stored result then stands). The same object until it changes. */
  view = (cellId: string): CellPreview | null => this.views.get(cellId) ?? null;

  subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  /** Ends the engine's work (a worker); a later edit starts it again. */
  dispose(): void {
    this.engine.dispose();
  }

  private request(): void {
    if (this.running) {
      this.queued = true;
      return;
    }
    const stored = this.stored;
    if (!stored) return;
    const inputs = stored.cells.map((c) => {
      const draft = this.drafts.get(c.id);
      return draft ? { id: c.id, body: draft } : { id: c.id, stored: c, body: cellBody(c) };
    });
    this.running = true;
    // The first cells' results at once; the others keep what the last preview showed until theirs come.
    const partial = (results: CellResult[]) => {
      const shown = new Map(this.latest?.results);
      results.forEach((r, k) => shown.set(inputs[k].id, r));
      this.latest = { inputs, results: shown, complete: false };
      this.refresh();
    };
    this.engine
      .evaluate({ cells: inputs.map((i) => i.body) as SheetFile['cells'], settings: stored.settings as SheetFile['settings'] }, partial)
      .then(
        (results) => {
          this.latest = { inputs, results: new Map(inputs.map((i, k) => [i.id, results[k]])), complete: true };
        },
        () => {
          // No preview for this content (too slow, or the engine failed): the stored results show, dimmed.
          this.latest = null;
        },
      )
      .finally(() => {
        this.running = false;
        this.refresh();
        if (this.queued) {
          this.queued = false;
          if (this.drafts.size) this.request();
        }
      });
  }

  /** The stored sheet holds what the preview evaluated, and nothing is being typed. */
  private caughtUp(latest: Evaluated, cells: CellDto[]): boolean {
    if (this.drafts.size || !latest.complete || latest.inputs.length !== cells.length) return false;
    return latest.inputs.every((input, k) => input.id === cells[k].id && (input.stored === cells[k] || sameCell(input.body, cellBody(cells[k]))));
  }

  private refresh(): void {
    const stored = this.stored;
    if (!stored) return;
    const latest = this.latest;
    const caughtUp = latest ? this.caughtUp(latest, stored.cells) : false;
    const next = new Map<string, CellPreview>();
    for (const cell of stored.cells) {
      const r = cell.results;
      const p = latest?.results.get(cell.id);
      let view: CellPreview;
      if (!p) view = { result: r, preview: false, differs: null };
      else if (caughtUp)
        view =
          r && sameResult(p, r) ? { result: p, preview: false, differs: null } : { result: r, preview: false, differs: r ? difference(cell.kind, p, r) : null };
      else view = !r || difference(cell.kind, p, r) ? { result: p, preview: true, differs: null } : { result: r, preview: false, differs: null };
      const before = this.views.get(cell.id);
      next.set(cell.id, before && before.result === view.result && before.preview === view.preview && before.differs === view.differs ? before : view);
    }
    const changed = next.size !== this.views.size || [...next].some(([id, v]) => this.views.get(id) !== v);
    this.views = next;
    if (changed) for (const listener of this.listeners) listener();
  }
}
