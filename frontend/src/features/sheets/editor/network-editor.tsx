/** The network cell's editor: the analysis and its settings, and the element table (a row an element). */
import { Box, Button, MenuItem, Stack, TextField } from '@mui/material';
import { ELEMENT_VALUES, NETWORK_ELEMENT_KINDS, NETWORK_MAX_ELEMENTS, type NetworkElementRow } from '@ampwright/common';
import { monoFont, palette } from '../../../app/theme';
import type { KindEditorProps } from './cell-editors';
import { fieldText, wholeNumberOrText } from './field-text';

const ANALYSES: [string, string][] = [
  ['steady', 'Steady state'],
  ['scan', 'Frequency scan'],
  ['harmonics', 'Harmonic flow'],
  ['transient', 'Switching transient'],
];

const cellInput: React.CSSProperties = {
  width: '100%',
  boxSizing: 'border-box',
  font: 'inherit',
  fontFamily: monoFont,
  fontSize: 13,
  padding: '3px 5px',
  border: `1px solid ${palette.rule}`,
  borderRadius: 2,
  background: 'transparent',
};

export function NetworkEditor(p: KindEditorProps) {
  const elements = (Array.isArray(p.value.elements) ? p.value.elements : []) as NetworkElementRow[];
  const set = (k: string, v: unknown) => p.onChange({ ...p.value, [k]: v });
  const setRow = (i: number, patch: Partial<NetworkElementRow>) =>
    set(
      'elements',
      elements.map((e, k) => (k === i ? { ...e, ...patch } : e)),
    );
  const analysis = fieldText(p.value.analysis) || 'steady';
  const field = (k: string, label: string, helper?: string) => (
    <TextField
      key={k}
      label={label}
      size="small"
      value={fieldText(p.value[k])}
      helperText={helper}
      onChange={(e) => set(k, k === 'points' ? wholeNumberOrText(e.target.value) : e.target.value)}
      slotProps={{ htmlInput: { style: { fontFamily: monoFont } } }}
    />
  );
  const rowErrors = new Map(p.errors.map((d) => [d.line, d.message]));
  return (
    <Stack spacing={1.5}>
      <Stack direction={{ xs: 'column', sm: 'row' }} spacing={1.5} useFlexGap sx={{ flexWrap: 'wrap' }}>
        <TextField select label="Analysis" size="small" sx={{ minWidth: 190 }} value={analysis} onChange={(e) => set('analysis', e.target.value)}>
          {ANALYSES.map(([v, label]) => (
            <MenuItem key={v} value={v}>
              {label}
            </MenuItem>
          ))}
        </TextField>
        {field('frequency', 'Fundamental')}
        {field('reference', 'Reference node')}
        {analysis === 'scan' && [
          field('node', 'Looking into node'),
          field('from', 'From'),
          field('to', 'To'),
          field('points', 'Points', 'log spaced, 2 to 20 000'),
        ]}
        {analysis === 'transient' && [field('span', 'Time span'), field('points', 'Points', '2 to 20 000')]}
        {analysis === 'harmonics' && field('limitsVoltage', 'Bus voltage for limits', 'optional: else the supply’s U')}
      </Stack>
      <Box sx={{ overflowX: 'auto' }}>
        <Box component="table" sx={{ borderCollapse: 'collapse', width: '100%', minWidth: 760, '& td, & th': { p: 0.5, verticalAlign: 'top' } }}>
          <thead>
            <tr style={{ textAlign: 'left', fontSize: 12, color: palette.muted }}>
              <th style={{ width: 28 }}>#</th>
              <th>Element</th>
              <th>Kind</th>
              <th>From node</th>
              <th>To node</th>
              <th colSpan={4}>Values (expressions of the sheet)</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {elements.map((e, i) => {
              const labels = ELEMENT_VALUES[e.kind] ?? [];
              const error = rowErrors.get(i + 1);
              return (
                <tr key={i} style={error ? { outline: `2px solid ${palette.fail}`, outlineOffset: -1 } : undefined}>
                  <td style={{ fontSize: 12, color: palette.muted }}>{i + 1}</td>
                  <td>
                    <input aria-label={`Row ${i + 1} element name`} style={cellInput} value={e.name} onChange={(x) => setRow(i, { name: x.target.value })} />
                  </td>
                  <td>
                    <select
                      aria-label={`Row ${i + 1} kind`}
                      style={{ ...cellInput, minWidth: 112 }}
                      value={e.kind}
                      onChange={(x) => setRow(i, { kind: x.target.value as NetworkElementRow['kind'], values: [] })}
                    >
                      {NETWORK_ELEMENT_KINDS.map((k) => (
                        <option key={k} value={k}>
                          {k}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td>
                    <input aria-label={`Row ${i + 1} from node`} style={cellInput} value={e.a} onChange={(x) => setRow(i, { a: x.target.value })} />
                  </td>
                  <td>
                    <input aria-label={`Row ${i + 1} to node`} style={cellInput} value={e.b} onChange={(x) => setRow(i, { b: x.target.value })} />
                  </td>
                  {[0, 1, 2, 3].map((k) =>
                    k < labels.length ? (
                      <td key={k}>
                        <input
                          aria-label={`Row ${i + 1} ${labels[k]}`}
                          placeholder={labels[k]}
                          title={labels[k]}
                          style={cellInput}
                          value={e.values?.[k] ?? ''}
                          onChange={(x) => {
                            const values = [...(e.values ?? [])];
                            while (values.length <= k) values.push('');
                            values[k] = x.target.value;
                            while (values.length && values[values.length - 1] === '') values.pop();
                            setRow(i, { values });
                          }}
                        />
                      </td>
                    ) : (
                      <td key={k} />
                    ),
                  )}
                  <td>
                    <Button
                      size="small"
                      color="inherit"
                      sx={{ minWidth: 0, py: 0 }}
                      aria-label={`Remove row ${i + 1}`}
                      onClick={() =>
                        set(
                          'elements',
                          elements.filter((_, k) => k !== i),
                        )
                      }
                    >
                      Remove
                    </Button>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </Box>
      </Box>
      {p.errors.length > 0 && (
        <Box sx={{ color: palette.fail, fontSize: 13 }} data-testid="network-errors">
          {p.errors.map((d, k) => (
            <div key={k}>{d.message}</div>
          ))}
        </Box>
      )}
      <Box>
        <Button
          size="small"
          variant="outlined"
          disabled={elements.length >= NETWORK_MAX_ELEMENTS}
          onClick={() => set('elements', [...elements, { name: `E${elements.length + 1}`, kind: 'resistor', a: '', b: 'gnd', values: [] }])}
        >
          Add element
        </Button>
      </Box>
    </Stack>
  );
}
