/** What a cell shows on screen: the blocks of its presentation (typeset lines, check outcomes, charts, tables, notes) and its problems. */
import { Alert, Box, Chip, LinearProgress, Stack, Table, TableBody, TableCell, TableRow, Typography } from '@mui/material';
import { Fragment, memo, useMemo, type ReactNode } from 'react';
import type { BlockOf, BlockType, CellResult, Diagnostic, PresentationBlock } from '@ampwright/common';
import { presentCell } from '@ampwright/common/cells/kinds';
import { monoFont, palette } from '../../../app/theme';
import { NoteText } from './note-text';
import { SvgFigure } from './svg-figure';
import { ChartFigure } from './chart-figure';
import { Tex } from './tex';
import { ScrollBox } from '../../../components/scroll-box';
import { TableGrid } from './table-grid';

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

export const SourceText = memo(function SourceText({ text }: { text: string }) {
  return (
    <ScrollBox
      component="pre"
      label="Source, scrolls sideways"
      sx={{
        fontFamily: monoFont,
        fontSize: 13,
        bgcolor: palette.paper,
        p: 1,
        m: 0,
        mb: 1,
        border: `1px solid ${palette.rule}`,
        whiteSpace: 'pre',
      }}
    >
      {text || ' '}
    </ScrollBox>
  );
});

function Lines({ lines }: BlockOf<'lines'>) {
  return (
    <Box>
      {lines.map((line) =>
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
            <ScrollBox label={`Working of ${line.name}, scrolls sideways`} sx={{ color: 'text.secondary' }}>
              <Tex>{line.tex.working}</Tex>
            </ScrollBox>
            <Box sx={{ fontWeight: 600 }} data-testid={`result-${line.name}`} title={line.value?.displayAlt}>
              <Tex>{line.tex.result}</Tex>
            </Box>
          </Box>
        ) : null,
      )}
    </Box>
  );
}

const TONE_COLOUR = { pass: 'success', caution: 'warning', fail: 'error', none: 'default' } as const;

function Outcome({ check: p, formula, working }: BlockOf<'outcome'>) {
  return (
    <Box>
      <Stack direction="row" spacing={1} sx={{ alignItems: 'center', mb: 1 }}>
        {/* Its colours change at once: MUI's fading background would show the new dark text on the old green for 300 ms. */}
        <Chip
          size="small"
          label={p.outcome}
          color={TONE_COLOUR[p.tone]}
          role="status"
          aria-label={`Check: ${p.outcome}`}
          data-testid="check-outcome"
          sx={{ transition: 'none' }}
        />
        {p.advisory && <Chip size="small" variant="outlined" label="Advisory" />}
        {formula && <Tex>{formula}</Tex>}
      </Stack>
      {working && (
        <Box sx={{ color: 'text.secondary', mb: 1 }}>
          <Tex>{working}</Tex>
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
    </Box>
  );
}

function TableBlock({ columns, rows }: BlockOf<'table'>) {
  return <TableGrid label="Table" columns={columns} rows={rows} />;
}

function Rows({ label, rows }: BlockOf<'rows'>) {
  return (
    <Table size="small" sx={{ width: 'auto', mb: 1 }} aria-label={label}>
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
  );
}

/** How each block of a cell's presentation (common/cells/presentation.ts) is drawn on screen; the package draws the same blocks. */
const BLOCK_VIEWS: { [T in BlockType]: (block: BlockOf<T>) => ReactNode } = {
  note: (b) => <NoteText text={b.text} />,
  lines: (b) => <Lines {...b} />,
  outcome: (b) => <Outcome {...b} />,
  rows: (b) => <Rows {...b} />,
  figure: (b) => (b.plot && b.redraw ? <ChartFigure block={b} /> : <SvgFigure svg={b.svg} label={b.label} />),
  sentence: (b) =>
    b.style === 'caption' ? (
      <Typography variant="body2">{b.text}</Typography>
    ) : (
      <Typography variant="body2" color={b.style === 'muted' ? 'text.secondary' : undefined}>
        {b.text}
      </Typography>
    ),
  table: (b) => <TableBlock {...b} />,
};

/** A cell's presentation blocks, drawn in order; small figures side by side. */
export function Presentation({ blocks }: { blocks: PresentationBlock[] }) {
  const small = blocks.filter((b) => b.type === 'figure' && b.small);
  return (
    <>
      {blocks.map((b, i) =>
        b.type === 'figure' && b.small ? null : <Fragment key={i}>{(BLOCK_VIEWS[b.type] as (block: PresentationBlock) => ReactNode)(b)}</Fragment>,
      )}
      {small.length > 0 && (
        <Stack direction="row" spacing={2} sx={{ flexWrap: 'wrap', mt: 1 }}>
          {small.map((b, i) => (
            <Fragment key={i}>{BLOCK_VIEWS.figure(b as BlockOf<'figure'>)}</Fragment>
          ))}
        </Stack>
      )}
    </>
  );
}

/** What a cell shows from its fields and the results the server stored, then its problems. */
export const CellPresentation = memo(function CellPresentation({
  kind,
  fields,
  result,
}: {
  kind: string;
  fields: Record<string, unknown>;
  result: CellResult | null;
}) {
  const blocks = useMemo(() => presentCell(kind, fields, result), [kind, fields, result]);
  return (
    <Box>
      <Presentation blocks={blocks} />
      {result && <Problems errors={result.errors} warnings={result.warnings} />}
    </Box>
  );
});
