/**
 * A table cell's grid: rows and columns virtualised by TanStack Virtual, so 20 000 rows cost what the
 * visible ones cost. One component for reading (the sheet, the review) and for editing (the table's
 * editor). The grid is one focus stop (role grid, aria-activedescendant) walked with the keys in
 * TABLE_KEYS (editor/keyboard.ts); a block copied from a spreadsheet is pasted at the selection, and the selection copies
 * out as tab-separated text.
 */
import { useId, useRef, useState, type ReactNode } from 'react';
import { Box, Typography } from '@mui/material';
import { useVirtualizer } from '@tanstack/react-virtual';
import { gridValue, readDecimal, readPastedBlock, type GridValue } from '@ampwright/common';
import { monoFont, palette } from '../../../app/theme';

export type { GridValue };

export interface GridColumn {
  name: string;
  unit?: string;
}

/** A rectangle of cells, corners included. */
export interface GridSelection {
  top: number;
  left: number;
  bottom: number;
  right: number;
}

export interface TableGridProps {
  label: string;
  columns: readonly GridColumn[];
  rows: readonly (readonly GridValue[])[];
  /** Writes a block of values with its top-left corner at (row, column); rows past the end are added. Absent: the grid is read only. */
  onSet?: (row: number, column: number, block: GridValue[][]) => void;
  /** The heading of a column where it is edited (name and unit fields); absent: its name and [unit]. */
  columnHeader?: (column: number) => ReactNode;
  /** Rows the table may hold: a paste that would go past it is refused. */
  maxRows?: number;
  /** Below the grid, given the selection: the editor's buttons. */
  toolbar?: (selection: GridSelection) => ReactNode;
}

const ROW_HEIGHT = 30;
const COLUMN_WIDTH = 128;
const NUMBER_WIDTH = 64;
const HEADER_HEIGHT_READ = 34;
const MAX_HEIGHT = 420;
/** A selected value's ground: the ink's blue, faint enough for the text to keep its contrast. */
const SELECTED = '#dde6ee';

const show = (v: GridValue | undefined) => (v === null || v === undefined ? '' : String(v));
/** Numbers are set right, so their digits line up; text left. */
const numeric = (v: GridValue | undefined) => typeof v === 'number' || (typeof v === 'string' && readDecimal(v, '.') !== undefined);
const clamp = (v: number, lo: number, hi: number) => Math.max(lo, Math.min(hi, v));

export function TableGrid({ label, columns, rows, onSet, columnHeader, maxRows = Infinity, toolbar }: TableGridProps) {
  const id = useId();
  const scroller = useRef<HTMLDivElement>(null);
  const [cursor, setActive] = useState({ r: 0, c: 0 });
  const [mark, setAnchor] = useState({ r: 0, c: 0 });
  const [editing, setEditingState] = useState<{ text: string } | null>(null);
  // Set at once (the blur that follows a commit by Enter must not commit again).
  const editingNow = useRef(false);
  const setEditing = (v: { text: string } | null) => {
    editingNow.current = !!v;
    setEditingState(v);
  };
  const [said, setSaid] = useState('');
  const rowCount = rows.length;
  const colCount = columns.length;
  // Kept inside the table when rows or columns are removed under the selection.
  const inTable = (p: { r: number; c: number }) => ({ r: clamp(p.r, 0, rowCount - 1), c: clamp(p.c, 0, colCount - 1) });
  const active = inTable(cursor);
  const anchor = inTable(mark);
  // The app is not built with the React Compiler; the virtualiser re-renders this component as it scrolls.
  // eslint-disable-next-line react-hooks/incompatible-library -- see above
  const rowVirtualizer = useVirtualizer({ count: rowCount, getScrollElement: () => scroller.current, estimateSize: () => ROW_HEIGHT, overscan: 8 });
  const colVirtualizer = useVirtualizer({
    horizontal: true,
    count: colCount,
    getScrollElement: () => scroller.current,
    estimateSize: () => COLUMN_WIDTH,
    overscan: 2,
  });
  const headerHeight = columnHeader ? 112 : HEADER_HEIGHT_READ;
  const height = Math.min(MAX_HEIGHT, headerHeight + Math.max(1, rowCount) * ROW_HEIGHT + 2);
  const width = NUMBER_WIDTH + colCount * COLUMN_WIDTH;
  const selection: GridSelection = {
    top: Math.min(active.r, anchor.r),
    bottom: Math.max(active.r, anchor.r),
    left: Math.min(active.c, anchor.c),
    right: Math.max(active.c, anchor.c),
  };
  const cellId = (r: number, c: number) => `${id}-${r}-${c}`;
  const inside = (r: number, c: number) => r >= selection.top && r <= selection.bottom && c >= selection.left && c <= selection.right;

  const moveTo = (r: number, c: number, extend = false) => {
    const next = inTable({ r, c });
    setActive(next);
    if (!extend) setAnchor(next);
    rowVirtualizer.scrollToIndex(next.r, { align: 'auto' });
    colVirtualizer.scrollToIndex(next.c, { align: 'auto' });
  };
  const focusGrid = () => scroller.current?.focus({ preventScroll: true });
  const commit = (text: string) => {
    if (!editingNow.current) return;
    setEditing(null);
    if (onSet && text !== show(rows[active.r]?.[active.c])) onSet(active.r, active.c, [[gridValue(text)]]);
  };

  const onKeyDown = (e: React.KeyboardEvent<HTMLDivElement>) => {
    if (e.target !== e.currentTarget || !rowCount || !colCount) return;
    const mod = e.ctrlKey || e.metaKey;
    const page = Math.max(1, Math.floor((MAX_HEIGHT - headerHeight) / ROW_HEIGHT) - 1);
    const moves: Record<string, () => void> = {
      ArrowUp: () => moveTo(active.r - 1, active.c, e.shiftKey),
      ArrowDown: () => moveTo(active.r + 1, active.c, e.shiftKey),
      ArrowLeft: () => moveTo(active.r, active.c - 1, e.shiftKey),
      ArrowRight: () => moveTo(active.r, active.c + 1, e.shiftKey),
      Home: () => (mod ? moveTo(0, active.c, e.shiftKey) : moveTo(active.r, 0, e.shiftKey)),
      End: () => (mod ? moveTo(rowCount - 1, active.c, e.shiftKey) : moveTo(active.r, colCount - 1, e.shiftKey)),
      PageUp: () => moveTo(active.r - page, active.c, e.shiftKey),
      PageDown: () => moveTo(active.r + page, active.c, e.shiftKey),
    };
    // Ctrl with an arrow belongs to the sheet (the next or previous cell), so it is left to bubble.
    if (moves[e.key] && !(mod && e.key.startsWith('Arrow')) && !e.altKey) {
      e.preventDefault();
      moves[e.key]();
      return;
    }
    if (!onSet) return;
    if (e.key === 'Enter' || e.key === 'F2') {
      e.preventDefault();
      setEditing({ text: show(rows[active.r]?.[active.c]) });
    } else if (e.key === 'Delete' || e.key === 'Backspace') {
      e.preventDefault();
      const block = Array.from({ length: selection.bottom - selection.top + 1 }, () => Array<GridValue>(selection.right - selection.left + 1).fill(null));
      onSet(selection.top, selection.left, block);
    } else if (e.key.length === 1 && !mod && !e.altKey) {
      // Typing over a value starts editing it afresh, as in any grid.
      e.preventDefault();
      setAnchor(active);
      setEditing({ text: e.key });
    }
  };

  const onEditorKeyDown = (e: React.KeyboardEvent<HTMLInputElement>) => {
    const step: Record<string, [number, number]> = { Enter: [e.shiftKey ? -1 : 1, 0], Tab: [0, e.shiftKey ? -1 : 1] };
    if (e.key === 'Escape') {
      e.preventDefault();
      e.stopPropagation();
      setEditing(null);
      focusGrid();
    } else if (step[e.key]) {
      e.preventDefault();
      e.stopPropagation();
      commit(e.currentTarget.value);
      moveTo(active.r + step[e.key][0], active.c + step[e.key][1]);
      focusGrid();
    }
  };

  const onCopy = (e: React.ClipboardEvent) => {
    if (e.target !== e.currentTarget || !rowCount) return;
    e.preventDefault();
    const lines: string[] = [];
    for (let r = selection.top; r <= selection.bottom; r++)
      lines.push(
        columns
          .slice(selection.left, selection.right + 1)
          .map((_, k) => show(rows[r]?.[selection.left + k]))
          .join('\t'),
      );
    e.clipboardData.setData('text/plain', `${lines.join('\n')}\n`);
  };

  const onPaste = (e: React.ClipboardEvent) => {
    if (e.target !== e.currentTarget || !onSet || !colCount) return;
    e.preventDefault();
    const block = readPastedBlock(e.clipboardData.getData('text/plain'));
    const top = rowCount ? selection.top : 0;
    const left = rowCount ? selection.left : 0;
    if (left + block.columns > colCount) {
      setSaid(`Not pasted: the block is ${block.columns} columns wide and only ${colCount - left} fit from column ${columns[left]?.name}. Add columns first.`);
      return;
    }
    if (top + block.rows > maxRows) {
      setSaid(`Not pasted: the table would have ${(top + block.rows).toLocaleString('en')} rows; it may hold at most ${maxRows.toLocaleString('en')}.`);
      return;
    }
    onSet(top, left, block.values);
    const added = Math.max(0, top + block.rows - rowCount);
    setSaid(
      `Pasted ${block.rows.toLocaleString('en')} × ${block.columns} values at row ${top + 1}, ${columns[left].name}, read with a decimal ${block.decimalMark === ',' ? 'comma' : 'point'}${added ? `; ${added.toLocaleString('en')} rows added` : ''}.`,
    );
    setActive({ r: top + block.rows - 1, c: left + block.columns - 1 });
    setAnchor({ r: top, c: left });
  };

  const activeId = rowCount && colCount ? cellId(active.r, active.c) : undefined;
  return (
    <Box>
      <Box
        ref={scroller}
        role="grid"
        aria-label={label}
        aria-rowcount={rowCount + 1}
        aria-colcount={colCount + 1}
        aria-readonly={!onSet}
        aria-multiselectable
        aria-activedescendant={editing ? undefined : activeId}
        tabIndex={0}
        onKeyDown={onKeyDown}
        onCopy={onCopy}
        onPaste={onPaste}
        sx={{
          height,
          width: width + 2,
          maxWidth: '100%',
          overflow: 'auto',
          position: 'relative',
          border: `1px solid ${palette.rule}`,
          borderRadius: 1,
          fontFamily: monoFont,
          fontSize: 13,
          '&:focus-visible': { outline: `2px solid ${palette.ink}`, outlineOffset: 1 },
        }}
      >
        <Box role="rowgroup" sx={{ position: 'sticky', top: 0, zIndex: 2, width, bgcolor: palette.sheet }}>
          <Box role="row" aria-rowindex={1} sx={{ display: 'flex', height: headerHeight, borderBottom: `1px solid ${palette.rule}` }}>
            <Box role="columnheader" aria-colindex={1} sx={{ width: NUMBER_WIDTH, flex: 'none', px: 1, py: 0.75, color: 'text.secondary' }}>
              Row
            </Box>
            {columns.map((c, j) => (
              <Box
                key={j}
                role="columnheader"
                aria-colindex={j + 2}
                sx={{
                  width: COLUMN_WIDTH,
                  flex: 'none',
                  px: 0.5,
                  py: 0.75,
                  fontWeight: 600,
                  overflow: 'hidden',
                  textOverflow: 'ellipsis',
                  whiteSpace: 'nowrap',
                }}
              >
                {columnHeader ? columnHeader(j) : `${c.name}${c.unit ? ` [${c.unit}]` : ''}`}
              </Box>
            ))}
          </Box>
        </Box>
        <Box role="rowgroup" sx={{ position: 'relative', height: rowVirtualizer.getTotalSize(), width }}>
          {rowVirtualizer.getVirtualItems().map((vr) => (
            <Box
              key={vr.index}
              role="row"
              aria-rowindex={vr.index + 2}
              sx={{ position: 'absolute', top: 0, left: 0, width, height: ROW_HEIGHT, transform: `translateY(${vr.start}px)` }}
            >
              <Box
                role="rowheader"
                aria-colindex={1}
                sx={{ position: 'absolute', left: 0, width: NUMBER_WIDTH, height: ROW_HEIGHT, px: 1, lineHeight: `${ROW_HEIGHT}px`, color: 'text.secondary' }}
              >
                {vr.index + 1}
              </Box>
              {colVirtualizer.getVirtualItems().map((vc) => {
                const here = vr.index === active.r && vc.index === active.c;
                const selected = inside(vr.index, vc.index);
                return (
                  <Box
                    key={vc.index}
                    id={cellId(vr.index, vc.index)}
                    role="gridcell"
                    aria-colindex={vc.index + 2}
                    aria-selected={selected}
                    onMouseDown={(e) => {
                      if (editing && here) return;
                      e.preventDefault();
                      if (editing) commit(editing.text);
                      moveTo(vr.index, vc.index, e.shiftKey);
                      focusGrid();
                    }}
                    onDoubleClick={() => onSet && setEditing({ text: show(rows[vr.index]?.[vc.index]) })}
                    sx={{
                      position: 'absolute',
                      left: NUMBER_WIDTH + vc.start,
                      width: COLUMN_WIDTH,
                      height: ROW_HEIGHT,
                      px: 1,
                      lineHeight: `${ROW_HEIGHT - 2}px`,
                      borderRight: `1px solid ${palette.rule}`,
                      borderBottom: `1px solid ${palette.rule}`,
                      whiteSpace: 'nowrap',
                      overflow: 'hidden',
                      textOverflow: 'ellipsis',
                      textAlign: numeric(rows[vr.index]?.[vc.index]) ? 'right' : 'left',
                      bgcolor: selected ? SELECTED : undefined,
                      outline: here ? `2px solid ${palette.ink}` : undefined,
                      outlineOffset: -2,
                      cursor: 'cell',
                    }}
                  >
                    {here && editing ? (
                      <input
                        autoFocus
                        aria-label={`Row ${vr.index + 1}, ${columns[vc.index]?.name}`}
                        defaultValue={editing.text}
                        onKeyDown={onEditorKeyDown}
                        onFocus={(e) => e.currentTarget.setSelectionRange(e.currentTarget.value.length, e.currentTarget.value.length)}
                        onBlur={(e) => commit(e.currentTarget.value)}
                        style={{
                          width: '100%',
                          height: ROW_HEIGHT - 4,
                          font: 'inherit',
                          border: 'none',
                          outline: 'none',
                          background: 'transparent',
                          padding: 0,
                        }}
                      />
                    ) : (
                      show(rows[vr.index]?.[vc.index])
                    )}
                  </Box>
                );
              })}
            </Box>
          ))}
        </Box>
      </Box>
      <Typography variant="caption" color="text.secondary" sx={{ display: 'block' }}>
        {rowCount.toLocaleString('en')} rows × {colCount} columns
        {rowCount && colCount ? ` · at row ${active.r + 1}, ${columns[active.c]?.name}` : ''}
      </Typography>
      <Typography role="status" variant="caption" sx={{ display: 'block' }}>
        {said}
      </Typography>
      {toolbar?.(selection)}
    </Box>
  );
}
