/**
 * A chart of series (a sweep, a transient) that can be read and zoomed: the values of every series at the
 * point under the pointer, with their units; a drag across the chart zooms to that range, Zoom in to its
 * middle half, Whole range back; Export as CSV saves the series plotted. By keyboard the chart is a slider
 * over its points: ← → move the read-out (with Shift ten points), Home and End go to the ends, + and − zoom
 * in and out around the point read, Escape shows the whole range; the Pan buttons move a zoomed range. The picture is common/plot's,
 * drawn again for a range by the block's `redraw` — the package prints the whole range.
 */
import { Box, Button, Stack, Typography } from '@mui/material';
import { useMemo, useRef, useState, type PointerEvent } from 'react';
import type { BlockOf, PlotData } from '@ampwright/common';
import { SvgFigure } from './svg-figure';

type Figure = BlockOf<'figure'>;

/** A value to four significant figures, as a read-out under a pointer warrants (the stored value is exact). */
const approx = (v: number) => (Number.isFinite(v) ? String(Number(v.toPrecision(4))) : '—');
const withUnit = (v: number, unit: string) => `${approx(v)}${unit ? ` ${unit}` : ''}`;

/** The value of the horizontal variable at a fraction of the plot area's width. */
function valueAt(plot: PlotData, fraction: number): number {
  const [d0, d1] = plot.domain;
  return plot.log ? d0 * Math.pow(d1 / d0, fraction) : d0 + fraction * (d1 - d0);
}

/** The index of the point nearest to `v` (on a log axis, nearest by ratio). */
function nearest(plot: PlotData, v: number): number {
  const key = (x: number) => (plot.log ? Math.log(x) : x);
  let best = 0;
  plot.x.values.forEach((x, i) => {
    if (Math.abs(key(x) - key(v)) < Math.abs(key(plot.x.values[best]) - key(v))) best = i;
  });
  return best;
}

/** The series as CSV: one column a quantity, named with its unit; every digit the engine gave. */
export function plotCsv(plot: PlotData): string {
  const head = [plot.x, ...plot.series].map((a) => `"${`${a.name}${a.unit ? ` [${a.unit}]` : ''}`.replace(/"/g, '""')}"`).join(',');
  const rows = plot.x.values.map((x, i) => [x, ...plot.series.map((s) => s.values[i])].map(String).join(','));
  return [head, ...rows].join('\n') + '\n';
}

export function ChartFigure({ block }: { block: Figure }) {
  const [range, setShownRange] = useState<[number, number] | null>(null);
  const drawn = useMemo(() => (range && block.redraw ? block.redraw(range) : null), [range, block]);
  const svg = drawn?.svg ?? block.svg;
  const plot = drawn?.data ?? block.plot!;
  const host = useRef<HTMLDivElement>(null);
  const [at, setAt] = useState<number | null>(null);
  /** Another range drawn: its points are others, so the read-out starts again. */
  const setRange = (next: [number, number] | null) => {
    setAt(null);
    setShownRange(next);
  };
  const dragFrom = useRef<{ fraction: number; clientX: number } | null>(null);

  /** Where the pointer is across the plot area, 0 to 1 (null: outside it). */
  const fractionOf = (e: PointerEvent): number | null => {
    const el = host.current?.querySelector('svg');
    const matrix = el?.getScreenCTM();
    if (!el || !matrix) return null;
    const point = new DOMPoint(e.clientX, e.clientY).matrixTransform(matrix.inverse());
    const f = (point.x - plot.frame.left) / plot.frame.width;
    return f >= 0 && f <= 1 ? f : null;
  };
  const onMove = (e: PointerEvent) => {
    const f = fractionOf(e);
    setAt(f === null ? null : nearest(plot, valueAt(plot, f)));
  };
  const onDown = (e: PointerEvent) => {
    const f = fractionOf(e);
    dragFrom.current = f === null ? null : { fraction: f, clientX: e.clientX };
  };
  const onUp = (e: PointerEvent) => {
    const from = dragFrom.current;
    dragFrom.current = null;
    const f = fractionOf(e);
    if (!from || f === null || Math.abs(e.clientX - from.clientX) < 8) return;
    setRange([valueAt(plot, Math.min(from.fraction, f)), valueAt(plot, Math.max(from.fraction, f))]);
  };
  const whole = block.plot!.domain;
  /** A range `scale` times the one shown, centred on `centre` (a value of the variable), kept inside the whole range. */
  const zoomAround = (centre: number, scale: number) => {
    const [w0, w1] = whole;
    const [d0, d1] = plot.domain;
    const span = plot.log ? Math.log(d1 / d0) * scale : (d1 - d0) * scale;
    if (span >= (plot.log ? Math.log(w1 / w0) : w1 - w0)) return setRange(null);
    let lo = plot.log ? Math.log(centre) - span / 2 : centre - span / 2;
    lo = Math.max(plot.log ? Math.log(w0) : w0, Math.min(lo, (plot.log ? Math.log(w1) : w1) - span));
    setRange(plot.log ? [Math.exp(lo), Math.exp(lo + span)] : [lo, lo + span]);
  };
  const centreValue = () => (at !== null ? plot.x.values[at] : valueAt(plot, 0.5));
  const zoomIn = () => zoomAround(centreValue(), 0.5);
  /** Moves a zoomed range by half its width, within the whole range. */
  const pan = (direction: -1 | 1) => zoomAround(valueAt(plot, 0.5 + direction * 0.5), 1);
  const onKey = (e: React.KeyboardEvent) => {
    const last = plot.x.values.length - 1;
    const step = e.shiftKey ? 10 : 1;
    const moves: Record<string, () => void> = {
      ArrowLeft: () => setAt(Math.max(0, (at ?? 0) - step)),
      ArrowRight: () => setAt(Math.min(last, (at ?? -1) + step)),
      Home: () => setAt(0),
      End: () => setAt(last),
      '+': zoomIn,
      '=': zoomIn,
      '-': () => zoomAround(centreValue(), 2),
      Escape: () => setRange(null),
    };
    const move = moves[e.key];
    if (!move) return;
    e.preventDefault();
    move();
  };
  const exportCsv = () => {
    const url = URL.createObjectURL(new Blob([plotCsv(plot)], { type: 'text/csv' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = `${block.label.toLowerCase().replace(/[^a-z0-9]+/g, '-')}.csv`;
    a.click();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  };
  const readout =
    at === null
      ? 'Point at the chart to read its values (or focus it and use ← →); drag across it to zoom.'
      : [`${plot.x.name} = ${withUnit(plot.x.values[at], plot.x.unit)}`, ...plot.series.map((s) => `${s.name} = ${withUnit(s.values[at], s.unit)}`)].join(
          ' · ',
        );
  return (
    <Box>
      <Box
        ref={host}
        onPointerMove={onMove}
        onPointerLeave={() => setAt(null)}
        onPointerDown={onDown}
        onPointerUp={onUp}
        tabIndex={0}
        role="slider"
        aria-label={`${block.label}: point read`}
        aria-valuemin={0}
        aria-valuemax={plot.x.values.length - 1}
        aria-valuenow={at ?? 0}
        aria-valuetext={readout}
        onKeyDown={onKey}
        sx={{ cursor: 'crosshair', touchAction: 'pan-y', userSelect: 'none', '&:focus-visible': { outline: '2px solid', outlineOffset: 2 } }}
      >
        <SvgFigure svg={svg} label={block.label} />
      </Box>
      <Typography variant="caption" color="text.secondary" data-testid="chart-readout" sx={{ display: 'block', minHeight: '1.5em' }}>
        {readout}
      </Typography>
      <Stack direction="row" spacing={1} sx={{ flexWrap: 'wrap' }} role="group" aria-label={`${block.label}: zoom and export`}>
        <Button size="small" onClick={zoomIn}>
          Zoom in
        </Button>
        <Button size="small" onClick={() => zoomAround(centreValue(), 2)} disabled={!range}>
          Zoom out
        </Button>
        <Button size="small" onClick={() => pan(-1)} disabled={!range} aria-label="Pan to lower values">
          ← Pan
        </Button>
        <Button size="small" onClick={() => pan(1)} disabled={!range} aria-label="Pan to higher values">
          Pan →
        </Button>
        <Button size="small" onClick={() => setRange(null)} disabled={!range}>
          Whole range
        </Button>
        <Button size="small" onClick={exportCsv}>
          Export as CSV
        </Button>
        {range && (
          <Typography variant="caption" color="text.secondary" sx={{ alignSelf: 'center' }} data-testid="chart-range">
            {plot.x.name} from {withUnit(plot.domain[0], plot.x.unit)} to {withUnit(plot.domain[1], plot.x.unit)}
          </Typography>
        )}
      </Stack>
    </Box>
  );
}
