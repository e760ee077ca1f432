/** What the server computed for a cell: typeset lines, check outcomes, charts and tables. */
import { Alert, Box, Chip, LinearProgress, Stack, Table, TableBody, TableCell, TableHead, TableRow, Typography } from '@mui/material';
import { useMemo, type ReactNode } from 'react';
import type { CalcResult, CellKind, CellResult, CheckResult, Diagnostic, SweepResult, TransientResult } from '@ampwright/common';
import { calcFigures, checkPresentation, sweepChart, transientChart, transientSummary } from '@ampwright/common/plot/index';
import { monoFont, palette } from '../../../app/theme';
import { SvgFigure } from './svg-figure';
import { Tex } from './tex';

export function Problems({ errors, warnings }: { errors: Diagnostic[]; warnings: Diagnostic[] }) {
  if (!errors.length && !warnings.length) return null;
  return (
    <Stack spacing={0.5} sx={{ mt: 1 }}>
      {errors.map((e, i) => (
        <Alert key={`e${i}`} severity="error" variant="outlined" sx={{ py: 0 }} data-testid="cell-error">
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

export function SourceText({ text }: { text: string }) {
  return (
    <Box
      component="pre"
      sx={{
        fontFamily: monoFont,
        fontSize: 13,
        bgcolor: palette.paper,
        p: 1,
        m: 0,
        mb: 1,
        overflowX: 'auto',
        border: `1px solid ${palette.rule}`,
        whiteSpace: 'pre',
      }}
    >
      {text || ' '}
    </Box>
  );
}

function CalcResults({ result }: { result: CalcResult }) {
  const figures = useMemo(() => calcFigures(result), [result]);
  return (
    <Box>
      {result.lines.map((line) =>
        line.tex ? (
          <Box
            key={line.line}
            data-testid={`line-${line.name}`}
            sx={{
              display: 'grid',
              gridTemplateColumns: { md: '1fr 1.4fr 0.8fr' },
              gap: 2,
              alignItems: 'baseline',
              py: 0.5,
              borderBottom: `1px dotted ${palette.rule}`,
            }}
          >
            <Box>
              <Tex>{line.tex.formula}</Tex>
              {line.description && (
                <Typography variant="caption" color="text.secondary" sx={{ display: 'block' }}>
                  {line.description}
                </Typography>
              )}
              {line.convention && (
                <Typography variant="caption" color="text.secondary" sx={{ display: 'block' }} data-testid={`convention-${line.name}`}>
                  {line.convention}
                </Typography>
              )}
            </Box>
            <Box sx={{ color: 'text.secondary', overflowX: 'auto' }}>
              <Tex>{line.tex.working}</Tex>
            </Box>
            <Box sx={{ fontWeight: 600 }} data-testid={`result-${line.name}`} title={line.value?.displayAlt}>
              <Tex>{line.tex.result}</Tex>
            </Box>
          </Box>
        ) : null,
      )}
      {figures.length > 0 && (
        <Stack direction="row" spacing={2} sx={{ flexWrap: 'wrap', mt: 1 }}>
          {figures.map((f, i) => (
            <SvgFigure key={i} svg={f.svg} label={f.kind === 'impedance-triangle' ? 'Impedance triangle' : 'Phasor diagram'} />
          ))}
        </Stack>
      )}
    </Box>
  );
}

const TONE_COLOUR = { pass: 'success', caution: 'warning', fail: 'error', none: 'default' } as const;

function CheckResults({ result, basis }: { result: CheckResult; basis?: string }) {
  const p = checkPresentation(result);
  return (
    <Box>
      <Stack direction="row" spacing={1} sx={{ alignItems: 'center', mb: 1 }}>
        <Chip size="small" label={p.outcome} color={TONE_COLOUR[p.tone]} data-testid="check-outcome" />
        {p.advisory && <Chip size="small" variant="outlined" label="Advisory" />}
        {result.tex && <Tex>{result.tex.formula}</Tex>}
      </Stack>
      {result.tex?.working && (
        <Box sx={{ color: 'text.secondary', mb: 1 }}>
          <Tex>{result.tex.working}</Tex>
        </Box>
      )}
      {p.utilisation && (
        <Box sx={{ maxWidth: 420 }}>
          <LinearProgress
            variant="determinate"
            value={p.utilisation.fraction * 100}
            color={TONE_COLOUR[p.utilisation.band] as 'success' | 'warning' | 'error'}
            aria-label="Utilisation"
          />
          <Typography variant="caption" data-testid="utilisation">
            {p.utilisation.text}
          </Typography>
        </Box>
      )}
      {!!basis && (
        <Typography variant="body2" color="text.secondary">
          Basis: {basis}
        </Typography>
      )}
    </Box>
  );
}

export function TableView({ fields }: { fields: Record<string, unknown> }) {
  const columns = (fields.columns as { name: string; unit?: string }[]) ?? [];
  const rows = (fields.rows as unknown[][]) ?? [];
  return (
    <Table size="small" sx={{ width: 'auto' }} aria-label="Table">
      <TableHead>
        <TableRow>
          {columns.map((c, j) => (
            <TableCell key={j}>
              {c.name}
              {c.unit ? ` [${c.unit}]` : ''}
            </TableCell>
          ))}
        </TableRow>
      </TableHead>
      <TableBody>
        {rows.map((r, i) => (
          <TableRow key={i}>
            {r.map((v, j) => (
              <TableCell key={j}>{String(v ?? '')}</TableCell>
            ))}
          </TableRow>
        ))}
      </TableBody>
    </Table>
  );
}

function SweepResults({ result, logX }: { result: SweepResult; logX: boolean }) {
  const svg = useMemo(() => sweepChart(result, { logX }), [result, logX]);
  return (
    <Box>
      <Typography variant="body2">
        {result.variable?.values.length ?? 0} points of {result.variable?.name}
      </Typography>
      {svg && <SvgFigure svg={svg} label="Frequency response" />}
    </Box>
  );
}

function TransientResults({ result }: { result: TransientResult }) {
  const svg = useMemo(() => transientChart(result), [result]);
  const rows = useMemo(() => transientSummary(result), [result]);
  return (
    <Box>
      <Table size="small" sx={{ width: 'auto', mb: 1 }} aria-label="Transient results">
        <TableBody>
          {rows.map((r) => (
            <TableRow key={r.label}>
              <TableCell component="th" scope="row" sx={{ fontWeight: 600, verticalAlign: 'top' }}>
                {r.label}
              </TableCell>
              <TableCell>{r.text}</TableCell>
            </TableRow>
          ))}
        </TableBody>
      </Table>
      {svg && <SvgFigure svg={svg} label="Transient current" />}
    </Box>
  );
}

/** The results of one cell, as stored by the server. */
/** What each kind of cell shows of its results (notes, tables and figures show their fields instead): a new kind does not compile until it is here. */
const RESULT_VIEWS: Record<CellKind, (fields: Record<string, unknown>, result: CellResult) => ReactNode> = {
  calc: (_f, r) => r.kind === 'calc' && <CalcResults result={r} />,
  check: (f, r) => r.kind === 'check' && <CheckResults result={r} basis={f.basis as string | undefined} />,
  sweep: (f, r) => r.kind === 'sweep' && <SweepResults result={r} logX={f.spacing === 'log'} />,
  transient: (_f, r) => r.kind === 'transient' && <TransientResults result={r} />,
  note: () => null,
  table: () => null,
  figure: () => null,
};

export function CellResults({ kind, fields, result }: { kind: string; fields: Record<string, unknown>; result: CellResult | null }) {
  if (!result) return null;
  return (
    <Box>
      {RESULT_VIEWS[kind as CellKind]?.(fields, result)}
      <Problems errors={result.errors} warnings={result.warnings} />
    </Box>
  );
}
