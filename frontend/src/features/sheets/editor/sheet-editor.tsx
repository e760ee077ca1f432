/**
 * The sheet editor: an ordered column of cells, each saved and evaluated by the server as it is
 * edited. Deleted cells can be restored. Its keys are in keyboard.ts; F1 or ? (when not typing) open
 * their help.
 */
import { Alert, Box, Button, Snackbar, Stack, Typography } from '@mui/material';
import { useCallback, useLayoutEffect, useMemo, useRef, useState } from 'react';
import { describeDetected, type CellDto, type ImportResultDto, type QueryDto, type SheetDto } from '@ampwright/common';
import { cellBody, useCellChange } from '../api/change-sheet';
import { AddCellMenu, CellFrame, type CellActions, type ReviewSlot } from './cell-frame';
import { commandOf } from './keyboard';
import { SheetPreviewContext, useSheetPreview } from '../preview/use-sheet-preview';
import { newCellFields } from '@ampwright/common/cells/kinds';

function scopeOf(cells: CellDto[], position: number) {
  const names = new Map<string, string>();
  for (const c of cells.slice(0, position)) {
    const values = c.results && 'values' in c.results ? (c.results.values as Record<string, { display: string }>) : {};
    for (const [name, v] of Object.entries(values)) names.set(name, v.display);
  }
  return [...names.entries()].map(([label, detail]) => ({ label, detail: `= ${detail}` }));
}

const NO_QUERIES: QueryDto[] = [];

/** `Review` draws a cell's review beside it (given by the route); `checking` marks cells changed after the checker agreed them. */
export function SheetEditor({
  sheet,
  editable,
  queries,
  Review,
  checking,
  openOnly = false,
  onShowKeys,
}: {
  sheet: SheetDto;
  editable: boolean;
  queries: QueryDto[];
  Review?: ReviewSlot;
  checking: boolean;
  openOnly?: boolean;
  /** Opens the keyboard help (the route holds it, beside its own button for it). */
  onShowKeys: () => void;
}) {
  const byCell = useMemo(() => {
    const m = new Map<string, QueryDto[]>();
    for (const q of queries) if (q.cellId) m.set(q.cellId, [...(m.get(q.cellId) ?? []), q]);
    return m;
  }, [queries]);
  const shown = openOnly ? sheet.cells.filter((c) => byCell.get(c.id)?.some((q) => q.status !== 'closed')) : sheet.cells;
  const change = useCellChange(sheet.id);
  const preview = useSheetPreview(sheet, editable);
  const [activeId, setActiveId] = useState<string | null>(null);
  const [deleted, setDeleted] = useState<{ cell: CellDto; position: number }[]>([]);
  const [notice, setNotice] = useState<string | null>(null);
  const csvInput = useRef<HTMLInputElement>(null);
  const csvPosition = useRef(0);
  const cellsRef = useRef(sheet.cells);
  const showKeysRef = useRef(onShowKeys);
  // A cell moved from the keyboard keeps the focus: moving its element in the page takes the focus away.
  const refocus = useRef<string | null>(null);
  useLayoutEffect(() => {
    cellsRef.current = sheet.cells;
    showKeysRef.current = onShowKeys;
    const moved = refocus.current && document.querySelector<HTMLElement>(`[data-cell-id="${refocus.current}"]`);
    if (moved && !moved.contains(document.activeElement)) {
      moved.querySelector<HTMLElement>('.cm-content, input, textarea')?.focus();
      moved.scrollIntoView({ block: 'nearest' });
      refocus.current = null;
    }
  });

  const report = (err: Error) => setNotice(err.message);

  const actions: CellActions = useMemo(
    () => ({
      activate: setActiveId,
      showKeys: () => showKeysRef.current(),
      neighbour: (id, step) => {
        const cells = cellsRef.current;
        const i = cells.findIndex((c) => c.id === id);
        const next = cells[i + step];
        if (next) {
          setActiveId(next.id);
          document.querySelector(`[data-cell-id="${next.id}"]`)?.scrollIntoView({ block: 'nearest' });
        }
      },
      add: (position, kind) => {
        const before = new Set(cellsRef.current.map((c) => c.id));
        // Open the new cell (the one cell of the answer that was not there before) for editing.
        change.mutate(
          { type: 'add', position, cell: { kind, ...newCellFields(kind) } },
          { onSuccess: (result) => setActiveId(result.changed.find((c) => !before.has(c.id))?.id ?? null), onError: report },
        );
      },
      importCsv: (position) => {
        csvPosition.current = position;
        csvInput.current?.click();
      },
      move: (id, position) => {
        if (document.querySelector(`[data-cell-id="${id}"]`)?.contains(document.activeElement)) refocus.current = id;
        // Once the moved sheet has been drawn, nothing is left to refocus (never later, when the person is elsewhere).
        const settle = () => setTimeout(() => (refocus.current = null), 200);
        change.mutate({ type: 'move', cellId: id, position }, { onSettled: settle, onError: report });
      },
      remove: (id) => {
        const position = cellsRef.current.findIndex((c) => c.id === id);
        const cell = cellsRef.current[position];
        if (!cell) return;
        change.mutate(
          { type: 'delete', cellId: cell.id },
          { onSuccess: () => (setDeleted((d) => [...d, { cell, position }]), setNotice(`Cell ${position + 1} deleted.`)), onError: report },
        );
      },
      scopeBefore: (position) => scopeOf(cellsRef.current, position),
    }),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [sheet.id],
  );

  const restore = useCallback(() => {
    const last = deleted[deleted.length - 1];
    if (!last) return;
    change.mutate(
      { type: 'add', position: last.position, cell: cellBody(last.cell) },
      { onSuccess: () => (setDeleted((d) => d.slice(0, -1)), setNotice(`Cell ${last.position + 1} restored.`)), onError: report },
    );
  }, [deleted, change]);

  const onCsv = (e: React.ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    e.target.value = '';
    if (!file) return;
    change.mutate(
      { type: 'import-csv', position: csvPosition.current, file },
      {
        onSuccess: (result) =>
          setNotice(`${file.name} imported as a table${'detected' in result ? `: ${describeDetected((result as ImportResultDto).detected)}` : ''}.`),
        onError: report,
      },
    );
  };

  // The help from anywhere in the sheet: its key, or ? where ? would not be typed into a field.
  const onKeyDown = (e: React.KeyboardEvent) => {
    if (e.defaultPrevented) return;
    const typing = e.target instanceof HTMLElement && (e.target.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(e.target.tagName));
    if (commandOf(e) === 'keysHelp' || (e.key === '?' && !typing)) {
      e.preventDefault();
      onShowKeys();
    }
  };

  return (
    <SheetPreviewContext.Provider value={preview}>
      <Stack spacing={2} data-testid="sheet-editor" onKeyDown={onKeyDown}>
        {shown.map((cell) => (
          <CellFrame
            key={cell.id}
            sheetId={sheet.id}
            cell={cell}
            index={cell.position}
            count={sheet.cells.length}
            active={activeId === cell.id}
            editable={editable}
            actions={actions}
            queries={byCell.get(cell.id) ?? NO_QUERIES}
            Review={Review}
            markChangedAfterAgreement={checking}
          />
        ))}
        {openOnly && shown.length === 0 && <Typography color="text.secondary">No cell has an open query.</Typography>}
        {sheet.cells.length === 0 && <Typography color="text.secondary">This sheet has no cells yet.</Typography>}
        {change.isError && (
          <Alert severity="error" onClose={() => change.reset()}>
            {change.error.message}
          </Alert>
        )}
        {editable && (
          <Box component="nav" aria-label="Sheet tools" sx={{ display: 'flex', gap: 1, flexWrap: 'wrap' }}>
            <AddCellMenu
              label="Add a cell at the end"
              onAdd={(kind) => actions.add(sheet.cells.length, kind)}
              onImportCsv={() => actions.importCsv(sheet.cells.length)}
            />
            {deleted.length > 0 && (
              <Button size="small" onClick={restore}>
                Restore the last deleted cell
              </Button>
            )}
            <input ref={csvInput} type="file" accept=".csv,text/csv" hidden onChange={onCsv} data-testid="csv-input" />
          </Box>
        )}
        <Snackbar
          open={!!notice}
          autoHideDuration={6000}
          onClose={() => setNotice(null)}
          message={notice}
          action={
            deleted.length > 0 && notice?.endsWith('deleted.') ? (
              <Button color="secondary" size="small" onClick={restore}>
                Undo
              </Button>
            ) : undefined
          }
        />
      </Stack>
    </SheetPreviewContext.Provider>
  );
}
