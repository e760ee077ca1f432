import { Alert, Box, Chip, LinearProgress, Paper, Stack, Table, TableBody, TableCell, TableHead, TableRow, Typography } from '@mui/material';
import type { CalcResult, CheckResult, Diagnostic, SweepResult, TableResult, TransientResult } from '@ampwright/common';
import { monoFont, palette } from '../../../app/theme';
import type { CellView as Cell } from '../api/sheets';
import { Tex, TextWithMaths } from './tex';

function Problems({ errors, warnings }: { errors: Diagnostic[]; warnings: Diagnostic[] }) {
  if (!errors.length && !warnings.length) return null;
  return (
    <Stack spacing={0.5} sx={{ mt: 1 }}>
      {errors.map((e, i) => (
        <Alert key={`e${i}`} severity="error" variant="outlined" sx={{ py: 0 }}>
          Line {e.line}, column {e.column}: {e.message}
        </Alert>
      ))}
      {warnings.map((w, i) => (
        <Alert key={`w${i}`} severity="warning" variant="outlined" sx={{ py: 0 }}>
          Line {w.line}: {w.message}
        </Alert>
      ))}
    </Stack>
  );
}

/** Markdown kept simple: headings (#, ##, ###), paragraphs, *emphasis* of a whole paragraph, $maths$. */
function NoteCell({ cell }: { cell: Cell }) {
  const text = String(cell.fields.text ?? '');
  const blocks = text.split(/\n{2,}/).flatMap((block) => {
    const lines = block.split('\n');
    const heading = /^(#{1,3})\s+(.*)$/.exec(lines[0]);
    return heading ? [{ level: heading[1].length, text: heading[2] }, ...(lines.length > 1 ? [{ level: 0, text: lines.slice(1).join(' ') }] : [])] : [{ level: 0, text: lines.join(' ') }];
  });
  return (
    <Box>
      {blocks.map((b, i) => {
        if (b.level) return <Typography key={i} variant={b.level === 1 ? 'h2' : b.level === 2 ? 'h3' : 'h4'} gutterBottom><TextWithMaths text={b.text} /></Typography>;
        const emphasis = /^\*(.*)\*$/s.exec(b.text);
        return <Typography key={i} sx={{ mb: 1.5, fontStyle: emphasis ? 'italic' : undefined }}><TextWithMaths text={emphasis ? emphasis[1] : b.text} /></Typography>;
      })}
    </Box>
  );
}

function CalcCell({ cell, result }: { cell: Cell; result?: CalcResult }) {
  return (
    <Box>
      <Box component="pre" sx={{ fontFamily: monoFont, fontSize: 13, bgcolor: palette.paper, p: 1, m: 0, mb: 1, overflowX: 'auto', border: `1px solid ${palette.rule}` }}>{String(cell.fields.source ?? '')}</Box>
      {result?.lines.map((line) =>
        line.tex ? (
          <Box key={line.line} data-testid={`line-${line.name}`} sx={{ display: 'grid', gridTemplateColumns: { md: '1fr 1.4fr 0.8fr' }, gap: 2, alignItems: 'baseline', py: 0.5, borderBottom: `1px dotted ${palette.rule}` }}>
            <Box>
              <Tex>{line.tex.formula}</Tex>
              {line.description && <Typography variant="caption" color="text.secondary" sx={{ display: 'block' }}>{line.description}</Typography>}
            </Box>
            <Box sx={{ color: 'text.secondary', overflowX: 'auto' }}><Tex>{line.tex.working}</Tex></Box>
            <Box sx={{ fontWeight: 600 }} data-testid={`result-${line.name}`} title={line.value?.displayAlt}>
              <Tex>{line.tex.result}</Tex>
            </Box>
          </Box>
        ) : null,
      )}
      {result && <Problems errors={result.errors} warnings={result.warnings} />}
    </Box>
  );
}

function CheckCell({ cell, result }: { cell: Cell; result?: CheckResult }) {
  const u = result?.utilization ?? null;
  return (
    <Box>
      <Stack direction="row" spacing={1} sx={{ alignItems: 'center', mb: 1 }}>
        <Chip size="small" label={result?.pass === true ? 'Pass' : result?.pass === false ? 'Fail' : 'Not evaluated'} color={result?.pass === true ? 'success' : result?.pass === false ? 'error' : 'default'} data-testid="check-outcome" />
        {result?.severity === 'advisory' && <Chip size="small" variant="outlined" label="Advisory" />}
        {result?.tex && <Tex>{result.tex.formula}</Tex>}
      </Stack>
      {u !== null && (
        <Box sx={{ maxWidth: 420 }}>
          <LinearProgress variant="determinate" value={Math.min(100, u * 100)} color={u > 1 ? 'error' : u > 0.9 ? 'warning' : 'success'} aria-label="Utilisation" />
          <Typography variant="caption">Utilisation {(u * 100).toFixed(1)} %{result?.margin !== null && result?.margin !== undefined ? `, margin ${(result.margin * 100).toFixed(1)} %` : ''}</Typography>
        </Box>
      )}
      {!!cell.fields.basis && <Typography variant="body2" color="text.secondary">Basis: {String(cell.fields.basis)}</Typography>}
      {result && <Problems errors={result.errors} warnings={result.warnings} />}
    </Box>
  );
}

function TableCellView({ cell, result }: { cell: Cell; result?: TableResult }) {
  const columns = (cell.fields.columns as { name: string; unit?: string }[]) ?? [];
  const rows = (cell.fields.rows as unknown[][]) ?? [];
  return (
    <Box>
      <Table size="small" sx={{ width: 'auto' }}>
        <TableHead>
          <TableRow>{columns.map((c) => <TableCell key={c.name}>{c.name}{c.unit ? ` [${c.unit}]` : ''}</TableCell>)}</TableRow>
        </TableHead>
        <TableBody>
          {rows.map((r, i) => <TableRow key={i}>{r.map((v, j) => <TableCell key={j}>{String(v ?? '')}</TableCell>)}</TableRow>)}
        </TableBody>
      </Table>
      {result && <Problems errors={result.errors} warnings={result.warnings} />}
    </Box>
  );
}

function SeriesSummary({ result }: { result?: SweepResult | TransientResult }) {
  if (!result) return null;
  if (result.kind === 'sweep') {
    return <Typography variant="body2">{result.variable?.values.length ?? 0} points of {result.variable?.name}; outputs: {result.outputs.map((o) => o.name).join('; ')}. (Charts come with the editor.)</Typography>;
  }
  return (
    <Typography variant="body2">
      {result.dampingCase}; peak current {result.peakCurrent?.display} at {result.peakTime?.display}; {result.analytic?.available ? `analytic solution agrees within ${((result.maxRelativeDeviation ?? 0) * 100).toExponential(1)} %` : 'numeric solution only'}.
    </Typography>
  );
}

const KIND_LABELS: Record<string, string> = { note: 'Note', calc: 'Calculation', check: 'Check', sweep: 'Sweep', transient: 'Transient', table: 'Table', figure: 'Figure' };

/** One cell, read-only: its content and the results the server stored with it. */
export function CellView({ cell, index }: { cell: Cell; index: number }) {
  const r = cell.results;
  return (
    <Paper component="section" sx={{ p: 2, borderLeft: `3px solid ${r?.status === 'error' ? palette.fail : cell.kind === 'check' ? palette.copper : palette.ink}` }} aria-label={`Cell ${index + 1}: ${KIND_LABELS[cell.kind] ?? cell.kind}`}>
      <Typography variant="overline" color="text.secondary">{index + 1} · {KIND_LABELS[cell.kind] ?? cell.kind}</Typography>
      {cell.kind === 'note' && <NoteCell cell={cell} />}
      {cell.kind === 'calc' && <CalcCell cell={cell} result={r as CalcResult | undefined} />}
      {cell.kind === 'check' && <CheckCell cell={cell} result={r as CheckResult | undefined} />}
      {cell.kind === 'table' && <TableCellView cell={cell} result={r as TableResult | undefined} />}
      {(cell.kind === 'sweep' || cell.kind === 'transient') && (
        <>
          <SeriesSummary result={r as SweepResult | TransientResult | undefined} />
          {r && <Problems errors={r.errors} warnings={r.warnings} />}
        </>
      )}
    </Paper>
  );
}
