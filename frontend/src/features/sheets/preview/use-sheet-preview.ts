/** The sheet page's preview (sheet-preview.ts) for the cells below it: one per open sheet, its worker ended when the sheet closes. */
import { createContext, useContext, useEffect, useLayoutEffect, useMemo, useSyncExternalStore } from 'react';
import type { SheetDto } from '@ampwright/common';
import type { CellBody } from '../api/change-sheet';
import { SheetPreview, type CellPreview } from './sheet-preview';
import { WorkerEngine } from './worker-engine';

export const SheetPreviewContext = createContext<SheetPreview | null>(null);

/** A preview for this sheet while it is open; null where it is not edited (nothing to preview). Its worker starts at the first edit. */
export function useSheetPreview(sheet: SheetDto, editable: boolean): SheetPreview | null {
  const preview = useMemo(() => (editable ? new SheetPreview(new WorkerEngine(`sheet-preview ${sheet.id}`)) : null), [sheet.id, editable]);
  useEffect(() => () => preview?.dispose(), [preview]);
  useLayoutEffect(() => preview?.setSheet(sheet), [preview, sheet]);
  return preview;
}

const noSubscription = () => () => undefined;

/** Hands the cell's draft (null when there is none) to the sheet's preview. */
export function usePreviewDraft(cellId: string, draft: CellBody | null): void {
  const preview = useContext(SheetPreviewContext);
  // As soon as the keystroke's render is committed, not a frame later.
  useLayoutEffect(() => {
    preview?.setDraft(cellId, draft);
  }, [preview, cellId, draft]);
  useEffect(() => () => preview?.setDraft(cellId, null), [preview, cellId]);
}

/** What a cell shows given the preview: its result, whether that is a preview, and any difference from the stored result. */
export function useCellPreview(cellId: string, stored: CellPreview['result']): CellPreview {
  const preview = useContext(SheetPreviewContext);
  const view = useSyncExternalStore(preview?.subscribe ?? noSubscription, () => preview?.view(cellId) ?? null);
  return view ?? { result: stored, preview: false, differs: null };
}
