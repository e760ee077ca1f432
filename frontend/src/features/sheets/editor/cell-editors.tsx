/** The editors of each kind of cell. Each edits a whole cell body and hands it to `onChange`. */
import { Box, Button, IconButton, MenuItem, Stack, TextField, Tooltip } from '@mui/material';
import type { CellKind, Diagnostic } from '@ampwright/common';
import { monoFont } from '../../../app/theme';
import type { CellBody } from '../api/change-sheet';
import { CodeEditor, type EditorKeys } from './code-editor';

export interface KindEditorProps extends EditorKeys {
  value: CellBody;
  onChange: (value: CellBody) => void;
  errors: Diagnostic[];
  warnings: Diagnostic[];
  scopeNames: () => { label: string; detail?: string }[];
  label: string;
}

const str = (v: unknown) => (typeof v === 'string' ? v : v === undefined || v === null ? '' : String(v));

export function CalcEditor(p: KindEditorProps) {
  return (
    <CodeEditor
      label={`${p.label} source`}
      value={str(p.value.source)}
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
      value={str(p.value.text)}
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
        value={str(p.value.condition)}
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
          value={str(p.value.basis)}
          onChange={(e) => p.onChange({ ...p.value, basis: e.target.value })}
        />
        <TextField
          select
          label="Severity"
          size="small"
          sx={{ minWidth: 160 }}
          value={str(p.value.severity) || 'mandatory'}
          onChange={(e) => p.onChange({ ...p.value, severity: e.target.value })}
        >
          <MenuItem value="mandatory">Mandatory</MenuItem>
          <MenuItem value="advisory">Advisory</MenuItem>
        </TextField>
      </Stack>
    </Stack>
  );
}

const toInt = (s: string): number | string => (/^\s*\d+\s*$/.test(s) ? Number(s) : s);

export function SweepEditor(p: KindEditorProps) {
  const outputs = Array.isArray(p.value.outputs) ? (p.value.outputs as string[]) : [];
  const set = (k: string, v: unknown) => p.onChange({ ...p.value, [k]: v });
  return (
    <Stack spacing={1.5}>
      <Stack direction={{ xs: 'column', sm: 'row' }} spacing={1.5}>
        <TextField label="Variable" size="small" value={str(p.value.variable)} onChange={(e) => set('variable', e.target.value)} autoFocus />
        <TextField label="From" size="small" value={str(p.value.from)} onChange={(e) => set('from', e.target.value)} />
        <TextField label="To" size="small" value={str(p.value.to)} onChange={(e) => set('to', e.target.value)} />
        <TextField label="Points" size="small" value={str(p.value.points)} onChange={(e) => set('points', toInt(e.target.value))} helperText="2 to 20 000" />
        <TextField
          select
          label="Spacing"
          size="small"
          sx={{ minWidth: 130 }}
          value={str(p.value.spacing) || 'linear'}
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
          value={str(p.value[k])}
          onChange={(e) =>
            e.target.value === '' && (k === 'q0' || k === 'i0')
              ? p.onChange(Object.fromEntries(Object.entries(p.value).filter(([x]) => x !== k)) as CellBody)
              : set(k, e.target.value)
          }
          slotProps={{ htmlInput: { style: { fontFamily: monoFont } } }}
        />
      ))}
      <TextField label="Points" size="small" value={str(p.value.points)} onChange={(e) => set('points', toInt(e.target.value))} />
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
      value={str(p.value.caption)}
      onChange={(e) => p.onChange({ ...p.value, caption: e.target.value })}
    />
  );
}

type Column = { name: string; unit?: string };
const cellValue = (s: string): number | string | null => (s.trim() === '' ? null : Number.isFinite(Number(s)) ? Number(s) : s);

/** A grid: one name and unit a column, a value a cell; numbers are kept as numbers. */
export function TableEditor(p: KindEditorProps) {
  const columns = (Array.isArray(p.value.columns) ? p.value.columns : []) as Column[];
  const rows = (Array.isArray(p.value.rows) ? p.value.rows : []) as (number | string | null)[][];
  const set = (cols: Column[], rs: (number | string | null)[][]) => p.onChange({ ...p.value, columns: cols, rows: rs });
  const setColumn = (j: number, patch: Partial<Column>) =>
    set(
      columns.map((c, k) => (k === j ? { ...c, ...patch } : c)),
      rows,
    );
  const setCell = (i: number, j: number, v: string) =>
    set(
      columns,
      rows.map((r, k) => (k === i ? columns.map((_, m) => (m === j ? cellValue(v) : (r[m] ?? null))) : r)),
    );
  return (
    <Box sx={{ overflowX: 'auto' }}>
      <Box component="table" sx={{ borderCollapse: 'collapse', '& td, & th': { p: 0.25, verticalAlign: 'top' } }} aria-label="Table grid">
        <thead>
          <tr>
            {columns.map((c, j) => (
              <th key={j}>
                <Stack spacing={0.5}>
                  <TextField
                    size="small"
                    label="Name"
                    value={c.name}
                    onChange={(e) => setColumn(j, { name: e.target.value })}
                    sx={{ width: 120 }}
                    slotProps={{ htmlInput: { 'aria-label': `Column ${j + 1} name` } }}
                  />
                  <TextField
                    size="small"
                    label="Unit"
                    value={c.unit ?? ''}
                    onChange={(e) => setColumn(j, { unit: e.target.value || undefined })}
                    sx={{ width: 120 }}
                    slotProps={{ htmlInput: { 'aria-label': `Column ${j + 1} unit` } }}
                  />
                  <Button
                    size="small"
                    color="inherit"
                    onClick={() =>
                      set(
                        columns.filter((_, k) => k !== j),
                        rows.map((r) => r.filter((_, k) => k !== j)),
                      )
                    }
                  >
                    Remove column
                  </Button>
                </Stack>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r, i) => (
            <tr key={i}>
              {columns.map((_, j) => (
                <td key={j}>
                  <TextField
                    size="small"
                    value={r[j] === null || r[j] === undefined ? '' : String(r[j])}
                    onChange={(e) => setCell(i, j, e.target.value)}
                    sx={{ width: 120 }}
                    slotProps={{ htmlInput: { 'aria-label': `Row ${i + 1}, ${columns[j].name}`, style: { fontFamily: monoFont } } }}
                  />
                </td>
              ))}
              <td>
                <Tooltip title="Remove this row">
                  <IconButton
                    size="small"
                    aria-label={`Remove row ${i + 1}`}
                    onClick={() =>
                      set(
                        columns,
                        rows.filter((_, k) => k !== i),
                      )
                    }
                  >
                    ×
                  </IconButton>
                </Tooltip>
              </td>
            </tr>
          ))}
        </tbody>
      </Box>
      <Stack direction="row" spacing={1} sx={{ mt: 1 }}>
        <Button size="small" onClick={() => set(columns, [...rows, columns.map(() => null)])} disabled={!columns.length}>
          Add row
        </Button>
        <Button
          size="small"
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
    </Box>
  );
}

/** Each kind's editor: a new kind does not compile until it has one. */
export const KIND_EDITORS: Record<CellKind, (p: KindEditorProps) => React.ReactElement> = {
  calc: CalcEditor,
  note: NoteEditor,
  check: CheckEditor,
  sweep: SweepEditor,
  transient: TransientEditor,
  table: TableEditor,
  figure: FigureEditor,
};
