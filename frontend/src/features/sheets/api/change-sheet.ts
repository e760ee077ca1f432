/**
 * Saving edits of a sheet. Every change is a React Query mutation in one scope per sheet, so changes
 * run one after another and each is sent against the latest version the app knows. The server answers
 * with the new version and every cell whose content or results changed; those are merged into the
 * cached sheet, so the page shows the server's numbers.
 *
 * When someone else saved in between (409 with the sheet's cells as they now stand, without results),
 * nothing is lost: a change to a cell that nobody else touched is sent again on the new version, and the
 * sheet is read again afterwards for the results of the others' change; a change to a cell that someone
 * else also changed is refused as a conflict, with both texts, for the user to settle.
 */
import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CellDto, SaveResultDto, SheetContentsDto, SheetDto } from '@ampwright/common';
import { api, ApiError } from '../../../lib/api-client';
import { sheetKeys } from './sheet-keys';
import { SheetErrorCode } from '@ampwright/common/api/error-codes';

export type CellBody = Record<string, unknown> & { kind: string };

export const cellBody = (c: Pick<CellDto, 'kind' | 'fields'>): CellBody => ({ ...c.fields, kind: c.kind });

/** Whether two cells hold the same content (key order does not matter). */
export function sameCell(a: Record<string, unknown>, b: Record<string, unknown>): boolean {
  const canon = (v: unknown): unknown =>
    Array.isArray(v)
      ? v.map(canon)
      : v && typeof v === 'object'
        ? Object.fromEntries(
            Object.keys(v)
              .sort()
              .map((k) => [k, canon((v as Record<string, unknown>)[k])]),
          )
        : v;
  return JSON.stringify(canon(a)) === JSON.stringify(canon(b));
}

export type CellChange =
  | { type: 'update'; cellId: string; cell: CellBody; /** the server's content this edit started from */ base: CellBody }
  | { type: 'add'; position: number; cell: CellBody }
  | { type: 'move'; cellId: string; position: number }
  | { type: 'delete'; cellId: string }
  /** A CSV of measurements as a new table cell at `position`. */
  | { type: 'import-csv'; position: number; file: File };

/** Someone else changed (or deleted) the same cell: the user's text is kept, theirs is shown. */
export class EditConflict extends Error {
  constructor(readonly theirs: CellDto | null) {
    super(
      theirs
        ? `${theirs.changedBy ?? 'Someone'} changed this cell while you were editing it. Your text is kept; choose which to keep.`
        : 'Someone deleted this cell while you were editing it. Your text is kept; you can add it again as a new cell.',
    );
    this.name = 'EditConflict';
  }
}

/**
 * The cached sheet with a save's answer merged in: the cells it touched replaced, the new results of the
 * others evaluated afresh put in place, the removed ones gone.
 */
export function mergeSave(sheet: SheetDto, result: SaveResultDto): SheetDto {
  const changed = new Map(result.changed.map((c) => [c.id, c]));
  const results = new Map(result.reevaluated.map((r) => [r.id, r.results]));
  const removed = new Set(result.removed);
  const cells = sheet.cells
    .filter((c) => !removed.has(c.id))
    .map((c) => {
      const next = changed.get(c.id);
      if (!next) {
        const fresh = results.get(c.id);
        return fresh ? ({ ...c, results: fresh } as CellDto) : c;
      }
      // A cell whose content is as it was keeps its fields object (only its results are new), so what is drawn
      // from the content is not drawn again.
      return next.kind === c.kind && sameCell(next.fields, c.fields) ? ({ ...next, fields: c.fields } as CellDto) : next;
    });
  for (const c of result.changed) if (!sheet.cells.some((x) => x.id === c.id)) cells.push(c);
  cells.sort((a, b) => a.position - b.position);
  return { ...sheet, version: Math.max(sheet.version, result.version), cells };
}

/**
 * The cached sheet brought to the cells of a stale save's answer: their order and content; the cached
 * results kept for cells whose content is unchanged, none (until the sheet is read again) for the others.
 */
export function mergeContents(sheet: SheetDto, theirs: SheetContentsDto): SheetDto {
  const mine = new Map(sheet.cells.map((c) => [c.id, c]));
  const cells = theirs.cells.map((c) => {
    const known = mine.get(c.id);
    return known && sameCell(cellBody(known), cellBody(c)) ? { ...c, results: known.results } : c;
  });
  return { ...sheet, version: theirs.version, state: theirs.state, cells };
}

function send(sheetId: string, change: CellChange, version: number): Promise<SaveResultDto> {
  switch (change.type) {
    case 'update':
      return api.patch(`/sheets/${sheetId}/cells/${change.cellId}`, { version, cell: change.cell });
    case 'add':
      return api.post(`/sheets/${sheetId}/cells`, { version, position: change.position, cell: change.cell });
    case 'move':
      return api.post(`/sheets/${sheetId}/cells/${change.cellId}/move`, { version, position: change.position });
    case 'delete':
      return api.delete(`/sheets/${sheetId}/cells/${change.cellId}?version=${version}`);
    case 'import-csv': {
      const form = new FormData();
      form.set('version', String(version));
      form.set('position', String(change.position));
      form.set('file', change.file);
      return api.post(`/sheets/${sheetId}/cells/import-csv`, form);
    }
  }
}

const isTransient = (err: unknown) => err instanceof ApiError && (err.status === 0 || err.status >= 500 || err.status === 429);

export function useCellChange(sheetId: string) {
  const queryClient = useQueryClient();
  const key = sheetKeys.one(sheetId);
  const current = () => queryClient.getQueryData<SheetDto>(key);

  async function apply(change: CellChange, attempt = 0): Promise<SaveResultDto> {
    const sheet = current();
    if (!sheet) throw new Error('The sheet is not loaded.');
    try {
      const result = await send(sheetId, change, sheet.version);
      queryClient.setQueryData<SheetDto>(key, (s) => (s ? mergeSave(s, result) : s));
      // Saved after a stale attempt: the others' cells get their results from a fresh read.
      if (attempt > 0) void queryClient.invalidateQueries({ queryKey: key });
      return result;
    } catch (err) {
      if (!(err instanceof ApiError && err.code === SheetErrorCode.StaleVersion) || attempt >= 5) throw err;
      const theirs = (err.body as { current?: SheetContentsDto } | undefined)?.current;
      if (!theirs) throw err;
      queryClient.setQueryData<SheetDto>(key, (s) => (s ? mergeContents(s, theirs) : s));
      const target = 'cellId' in change ? (theirs.cells.find((c) => c.id === change.cellId) ?? null) : null;
      if (change.type === 'update' && (!target || !sameCell(cellBody(target), change.base))) throw new EditConflict(target);
      if (change.type === 'delete' && !target) {
        void queryClient.invalidateQueries({ queryKey: key });
        return { version: theirs.version, changed: [], reevaluated: [], removed: [change.cellId] };
      }
      if (change.type === 'move' && !target) throw new EditConflict(null);
      return apply(change, attempt + 1);
    }
  }

  return useMutation<SaveResultDto, Error, CellChange>({
    mutationFn: (change) => apply(change),
    // One queue per sheet: each change waits for the one before it.
    scope: { id: `sheet:${sheetId}` },
    retry: (count, err) => isTransient(err) && count < 4,
    retryDelay: (count) => Math.min(500 * 2 ** count, 5000),
  });
}
