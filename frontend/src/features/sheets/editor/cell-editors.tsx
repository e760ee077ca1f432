/** The editors of each kind of cell. Each edits a whole cell body and hands it to `onChange`. */
import { Box, Button, MenuItem, Stack, TextField } from '@mui/material';
import { TABLE_MAX_COLUMNS, TABLE_MAX_ROWS, TABLE_MAX_VALUES, type CellKind, type Diagnostic } from '@ampwright/common';
import { monoFont, palette } from '../../../app/theme';
import { TableGrid, type GridValue } from '../components/table-grid';
import type { CellBody } from '../api/change-sheet';
import { CodeEditor, type EditorKeys } from './code-editor';
import { NetworkEditor } from './network-editor';
import { fieldText, wholeNumberOrText } from './field-text';

export interface KindEditorProps extends EditorKeys {
  value: CellBody;
  onChange: (value: CellBody) => void;
  errors: Diagnostic[];
  warnings: Diagnostic[];
  scopeNames: () => { label: string; detail?: string }[];
  label: string;
}

export function CalcEditor(p: KindEditorProps) {
  return (
    <CodeEditor
      label={`${p.label} source`}
      value={fieldText(p.value.source)}
      onChange={(source) => p.onChange({ ...p.value, source })}
      errors={p.errors}
      warnings={p.warnings}
      scopeNames={p.scopeNames}
      autoFocus
      onCommand={p.onCommand}
      placeholder="R = 12 ohm   # one statement a line"
    />
  );
}

export function NoteEditor(p: KindEditorProps) {
  return (
    <TextField
      label="Note (headings with #, maths between $ signs)"
      multiline
      minRows={3}
      fullWidth
      autoFocus
      value={fieldText(p.value.text)}
      onChange={(e) => p.onChange({ ...p.value, text: e.target.value })}
      slotProps={{ htmlInput: { style: { fontFamily: monoFont, fontSize: 13 } } }}
    />
  );
}

export function CheckEditor(p: KindEditorProps) {
  return (
    <Stack spacing={1.5}>
      <CodeEditor
        label={`${p.label} condition`}
        singleLine
        value={fieldText(p.value.condition)}
        onChange={(condition) => p.onChange({ ...p.value, condition })}
        errors={p.errors}
        warnings={p.warnings}
        scopeNames={p.scopeNames}
        autoFocus
        onCommand={p.onCommand}
        placeholder="I_rms <= 1.35 * I_rated"
      />
      <Stack direction={{ xs: 'column', sm: 'row' }} spacing={1.5}>
        <TextField
          label="Basis (where the limit comes from)"
          size="small"
          fullWidth
          value={fieldText(p.value.basis)}
          onChange={(e) => p.onChange({ ...p.value, basis: e.target.value })}
        />
        <TextField
          select
          label="Severity"
          size="small"
          sx={{ minWidth: 160 }}
          value={fieldText(p.value.severity) || 'mandatory'}
          onChange={(e) => p.onChange({ ...p.value, severity: e.target.value })}
        >
          <MenuItem value="mandatory">Mandatory</MenuItem>
          <MenuItem value="advisory">Advisory</MenuItem>
        </TextField>
      </Stack>
    </Stack>
  );
}

export function SweepEditor(p: KindEditorProps) {
  const outputs = Array.isArray(p.value.outputs) ? (p.value.outputs as string[]) : [];
  const set = (k: string, v: unknown) => p.onChange({ ...p.value, [k]: v });
  return (
    <Stack spacing={1.5}>
      <Stack direction={{ xs: 'column', sm: 'row' }} spacing={1.5}>
        <TextField label="Variable" size="small" value={fieldText(p.value.variable)} onChange={(e) => set('variable', e.target.value)} autoFocus />
        <TextField label="From" size="small" value={fieldText(p.value.from)} onChange={(e) => set('from', e.target.value)} />
        <TextField label="To" size="small" value={fieldText(p.value.to)} onChange={(e) => set('to', e.target.value)} />
        <TextField
          label="Points"
          size="small"
          value={fieldText(p.value.points)}
          onChange={(e) => set('points', wholeNumberOrText(e.target.value))}
          helperText="2 to 20 000"
        />
        <TextField
          select
          label="Spacing"
          size="small"
          sx={{ minWidth: 130 }}
          value={fieldText(p.value.spacing) || 'linear'}
          onChange={(e) => set('spacing', e.target.value)}
        >
          <MenuItem value="linear">Linear</MenuItem>
          <MenuItem value="log">Logarithmic</MenuItem>
        </TextField>
      </Stack>
      <CodeEditor
        label={`${p.label} outputs`}
        value={outputs.join('\n')}
        onChange={(text) =>
          set(
            'outputs',
            text.split('\n').filter((l) => l.trim() !== ''),
          )
        }
        errors={p.errors}
        warnings={p.warnings}
        scopeNames={p.scopeNames}
        onCommand={p.onCommand}
        placeholder="One expression a line"
      />
    </Stack>
  );
}

const TRANSIENT_FIELDS: [string, string][] = [
  ['R', 'R'],
  ['L', 'L'],
  ['C', 'C'],
  ['source', 'Source E(t)'],
  ['q0', 'q0 (initial charge)'],
  ['i0', 'i0 (initial current)'],
  ['span', 'Time span'],
];

export function TransientEditor(p: KindEditorProps) {
  const set = (k: string, v: unknown) => p.onChange({ ...p.value, [k]: v });
  return (
    <Box sx={{ display: 'grid', gridTemplateColumns: { xs: '1fr', sm: 'repeat(4, 1fr)' }, gap: 1.5 }}>
      {TRANSIENT_FIELDS.map(([k, label], i) => (
        <TextField
          key={k}
          label={label}
          size="small"
          autoFocus={i === 0}
          value={fieldText(p.value[k])}
          onChange={(e) =>
            e.target.value === '' && (k === 'q0' || k === 'i0')
              ? p.onChange(Object.fromEntries(Object.entries(p.value).filter(([x]) => x !== k)) as CellBody)
              : set(k, e.target.value)
          }
          slotProps={{ htmlInput: { style: { fontFamily: monoFont } } }}
        />
      ))}
      <TextField label="Points" size="small" value={fieldText(p.value.points)} onChange={(e) => set('points', wholeNumberOrText(e.target.value))} />
    </Box>
  );
}

export function FigureEditor(p: KindEditorProps) {
  return (
    <TextField
      label="Caption"
      size="small"
      fullWidth
      autoFocus
      value={fieldText(p.value.caption)}
      onChange={(e) => p.onChange({ ...p.value, caption: e.target.value })}
    />
  );
}

type Column = { name: string; unit?: string };

/** Values written as a block at (row, column), rows added past the end; the rows not touched are kept as they are. */
function setBlock(rows: readonly (readonly GridValue[])[], width: number, row: number, column: number, block: GridValue[][]): GridValue[][] {
  const next = rows.slice() as GridValue[][];
  block.forEach((values, i) => {
    const r = row + i;
    const line = next[r] ? next[r].slice() : [];
    while (line.length < width) line.push(null);
    values.forEach((v, k) => {
      if (column + k < width) line[column + k] = v;
    });
    next[r] = line;
  });
  return next;
}

/** The table's editor: its grid (virtualised, keyboard editing, paste of a block), a name and unit a column. */
export function TableEditor(p: KindEditorProps) {
  const columns = (Array.isArray(p.value.columns) ? p.value.columns : []) as Column[];
  const rows = (Array.isArray(p.value.rows) ? p.value.rows : []) as GridValue[][];
  const set = (cols: Column[], rs: GridValue[][]) => p.onChange({ ...p.value, columns: cols, rows: rs });
  const setColumn = (j: number, patch: Partial<Column>) =>
    set(
      columns.map((c, k) => (k === j ? { ...c, ...patch } : c)),
      rows,
    );
  const header = (j: number) => (
    <Stack spacing={0.5}>
      <input
        aria-label={`Column ${j + 1} name`}
        placeholder="name"
        value={columns[j].name}
        onChange={(e) => setColumn(j, { name: e.target.value })}
        style={headerInput}
      />
      <input
        aria-label={`Column ${j + 1} unit`}
        placeholder="unit"
        value={columns[j].unit ?? ''}
        onChange={(e) => setColumn(j, { unit: e.target.value || undefined })}
        style={headerInput}
      />
      <Button
        size="small"
        color="inherit"
        sx={{ py: 0, minWidth: 0, justifyContent: 'flex-start' }}
        aria-label={`Remove column ${j + 1}`}
        onClick={() =>
          set(
            columns.filter((_, k) => k !== j),
            rows.map((r) => r.filter((_, k) => k !== j)),
          )
        }
      >
        Remove
      </Button>
    </Stack>
  );
  // Rows × columns stay within what one save carries.
  const maxRows = Math.min(TABLE_MAX_ROWS, Math.floor(TABLE_MAX_VALUES / Math.max(1, columns.length)));
  return (
    <TableGrid
      label={`${p.label} table`}
      columns={columns}
      rows={rows}
      maxRows={maxRows}
      columnHeader={header}
      onSet={(row, column, block) => set(columns, setBlock(rows, columns.length, row, column, block))}
      toolbar={(sel) => (
        <Stack direction="row" spacing={1} sx={{ mt: 0.5, flexWrap: 'wrap' }}>
          <Button size="small" onClick={() => set(columns, [...rows, columns.map(() => null)])} disabled={!columns.length || rows.length >= maxRows}>
            Add row
          </Button>
          <Button
            size="small"
            disabled={!rows.length}
            onClick={() =>
              set(
                columns,
                rows.filter((_, k) => k < sel.top || k > sel.bottom),
              )
            }
          >
            {sel.top === sel.bottom ? `Remove row ${sel.top + 1}` : `Remove rows ${sel.top + 1}–${sel.bottom + 1}`}
          </Button>
          <Button
            size="small"
            disabled={columns.length >= TABLE_MAX_COLUMNS || rows.length * (columns.length + 1) > TABLE_MAX_VALUES}
            onClick={() =>
              set(
                [...columns, { name: `x${columns.length + 1}` }],
                rows.map((r) => [...r, null]),
              )
            }
          >
            Add column
          </Button>
        </Stack>
      )}
    />
  );
}

const headerInput: React.CSSProperties = {
  width: '100%',
  boxSizing: 'border-box',
  font: 'inherit',
  padding: '2px 4px',
  border: `1px solid ${palette.rule}`,
  borderRadius: 2,
};

/** Each kind's editor: a new kind does not compile until it has one. */
export const KIND_EDITORS: Record<CellKind, (p: KindEditorProps) => React.ReactElement> = {
  calc: CalcEditor,
  note: NoteEditor,
  check: CheckEditor,
  sweep: SweepEditor,
  transient: TransientEditor,
  table: TableEditor,
  figure: FigureEditor,
  network: NetworkEditor,
};
