/**
 * The charts of a sheet, built as SVG text from the engine's results: the same drawing is shown on
 * screen and put into the PDF package. Every axis is labelled with its unit.
 */
import { line } from 'd3-shape';
import type { CalcResult, FormattedValue, SeriesData, SweepResult, TransientResult } from '../cells/types';
import { axisLabel, drawAxes, scaleFor, type Frame } from './axes';
import { el, PLOT_COLOURS, svgDocument, text } from './svg';

const W = 640;
const TRACE = [PLOT_COLOURS.ink, PLOT_COLOURS.copper, PLOT_COLOURS.green, PLOT_COLOURS.grey];

function path(xs: number[], ys: number[], x: (v: number) => number, y: (v: number) => number): string {
  const points: [number, number][] = [];
  xs.forEach((xv, i) => {
    const yv = ys[i];
    if (Number.isFinite(xv) && Number.isFinite(yv)) points.push([x(xv), y(yv)]);
  });
  return line()(points) ?? '';
}

function legend(left: number, top: number, entries: { label: string; colour: string; dash?: string }[]): string[] {
  return entries.flatMap((e, i) => {
    const y = top + i * 14;
    return [
      el('line', { x1: left, x2: left + 18, y1: y, y2: y, stroke: e.colour, 'stroke-width': 1.8, 'stroke-dasharray': e.dash }),
      text(left + 22, y + 3.5, e.label, { 'font-size': 10 }),
    ];
  });
}

const magnitude = (s: SeriesData): number[] => (s.complex && s.im ? s.values.map((re, i) => Math.hypot(re, s.im![i])) : s.values);
const phaseDeg = (s: SeriesData): number[] => s.values.map((re, i) => (Math.atan2(s.im?.[i] ?? 0, re) * 180) / Math.PI);

export interface ChartOptions {
  /** Draw the frequency (or other swept variable) on a log axis. */
  logX?: boolean;
  /** Draw only this range of the horizontal variable (a zoom), in the variable's unit. */
  xRange?: [number, number];
  /** Vertical marks across every panel at these values of the variable, each with its label (resonances). */
  markers?: { at: number; label: string }[];
}

/** One plotted quantity: its name, unit and values (as drawn: a complex output's magnitude or phase). */
export interface PlotAxis {
  name: string;
  unit: string;
  values: number[];
}

/**
 * What a chart plots, beside its picture, for the screen to read values out under the pointer, zoom and
 * export the series: the horizontal variable, each series drawn against it, where the plot area is in the
 * SVG's own units, and the horizontal axis's domain and kind.
 */
export interface PlotData {
  x: PlotAxis;
  series: PlotAxis[];
  frame: { left: number; width: number; svgWidth: number };
  domain: [number, number];
  log: boolean;
}

/** A chart: its SVG and what it plots. */
export interface Plot {
  svg: string;
  data: PlotData;
}

/** The indexes of the points inside a range (all of them without one). */
const within = (xs: number[], range?: [number, number]): number[] =>
  xs.flatMap((v, i) => (!range || (v >= Math.min(...range) && v <= Math.max(...range)) ? [i] : []));
const pick = (values: number[], keep: number[]): number[] => keep.map((i) => values[i]);

/**
 * A sweep as a frequency-response chart: the magnitude of every output against the variable and,
 * when an output is complex, its phase in degrees below. Outputs with different units get their own
 * panels, since one axis cannot carry two units.
 */
export function sweepChart(result: SweepResult, options: ChartOptions = {}): string | null {
  return sweepPlot(result, options)?.svg ?? null;
}

/** sweepChart with what it plots (PlotData). */
export function sweepPlot(result: SweepResult, options: ChartOptions = {}): Plot | null {
  const whole = result.variable;
  if (!whole || !result.outputs.length) return null;
  const keep = within(whole.values, options.xRange);
  if (!keep.length) return null;
  const v = { ...whole, values: pick(whole.values, keep) };
  const groups = new Map<string, SeriesData[]>();
  for (const o of result.outputs) groups.set(o.unit, [...(groups.get(o.unit) ?? []), o]);
  const complex = result.outputs.filter((o) => o.complex);
  const panelH = 180;
  const panels = [...groups.entries()].map(([unit, series]) => ({ unit, series, phase: false }));
  if (complex.length) panels.push({ unit: 'deg', series: complex, phase: true });
  const left = 64;
  const frameW = W - left - 20;
  const height = panels.length * (panelH + 46) + 20;
  const range = options.xRange && ([Math.min(...options.xRange), Math.max(...options.xRange)] as [number, number]);
  const x = scaleFor(v.values, [left, left + frameW], !!options.logX, 0, range);
  const out: string[] = [];
  const plotted: PlotAxis[] = [];
  panels.forEach((panel, p) => {
    const top = 16 + p * (panelH + 46);
    const frame: Frame = { left, top, width: frameW, height: panelH };
    const ys = panel.series.map((s) => pick(panel.phase ? phaseDeg(s) : magnitude(s), keep));
    panel.series.forEach((s, i) =>
      plotted.push({
        name: panel.phase ? `arg(${shortName(s.name)})` : s.complex ? `|${shortName(s.name)}|` : shortName(s.name),
        unit: panel.unit,
        values: ys[i],
      }),
    );
    const all = ys.flat();
    const positive = all.every((t) => !Number.isFinite(t) || t > 0);
    const finite = all.filter(Number.isFinite);
    const wide = positive && finite.length > 0 && Math.max(...finite) / Math.min(...finite) > 100;
    const y = scaleFor(all, [top + panelH, top], !panel.phase && wide, 0.05);
    const label = panel.phase
      ? 'phase [deg]'
      : axisLabel(
          panel.series.length === 1
            ? panel.series[0].complex
              ? `|${shortName(panel.series[0].name)}|`
              : shortName(panel.series[0].name)
            : panel.series.some((s) => s.complex)
              ? 'magnitude'
              : 'value',
          panel.unit,
        );
    out.push(...drawAxes(frame, x, y, axisLabel(v.name, v.unit), label));
    const [lo, hi] = x.domain() as [number, number];
    (options.markers ?? []).forEach((m, k) => {
      if (!(m.at >= Math.min(lo, hi) && m.at <= Math.max(lo, hi))) return;
      const xm = x(m.at);
      out.push(el('line', { x1: xm, x2: xm, y1: top, y2: top + panelH, stroke: PLOT_COLOURS.copper, 'stroke-width': 1, 'stroke-dasharray': '4 3' }));
      // Labels one under another, so that resonances close together stay readable.
      if (!panel.phase) out.push(text(xm + 3, top + 11 + 11 * (k % 6), m.label, { 'font-size': 9, fill: PLOT_COLOURS.copper }));
    });
    ys.forEach((vals, i) => out.push(el('path', { d: path(v.values, vals, x, y), fill: 'none', stroke: TRACE[i % TRACE.length], 'stroke-width': 1.6 })));
    if (panel.series.length > 1)
      out.push(
        ...legend(
          left + 10,
          top + 12,
          panel.series.map((s, i) => ({ label: shortName(s.name), colour: TRACE[i % TRACE.length] })),
        ),
      );
  });
  const [d0, d1] = x.domain() as [number, number];
  return {
    svg: svgDocument(W, height, `Response against ${v.name}`, out),
    data: {
      x: { name: v.name, unit: v.unit, values: v.values },
      series: plotted,
      frame: { left, width: frameW, svgWidth: W },
      domain: [d0, d1],
      log: !!options.logX,
    },
  };
}

const shortName = (expression: string): string => (expression.length > 40 ? `${expression.slice(0, 37)}…` : expression);

/** A transient as a time chart: the current (numeric), and, where there is an analytic solution, its steady periodic part. */
export function transientChart(result: TransientResult): string | null {
  return transientPlot(result)?.svg ?? null;
}

/** transientChart with what it plots (PlotData); `xRange` zooms to a span of time. */
export function transientPlot(result: TransientResult, options: Pick<ChartOptions, 'xRange'> = {}): Plot | null {
  if (!result.time || !result.current) return null;
  const keep = within(result.time.values, options.xRange);
  if (!keep.length) return null;
  const cut = (s: SeriesData | undefined): SeriesData | undefined => s && { ...s, values: pick(s.values, keep) };
  const t = cut(result.time)!;
  const i = cut(result.current)!;
  const left = 64;
  const frame: Frame = { left, top: 16, width: W - left - 20, height: 240 };
  const series: { s: SeriesData; colour: string; dash?: string; label: string }[] = [{ s: i, colour: PLOT_COLOURS.ink, label: 'i(t), numeric solution' }];
  if (result.currentSteady) series.push({ s: cut(result.currentSteady)!, colour: PLOT_COLOURS.copper, dash: '5 3', label: 'steady periodic part' });
  if (result.currentTransient) series.push({ s: cut(result.currentTransient)!, colour: PLOT_COLOURS.grey, dash: '2 2', label: 'transient part' });
  const range = options.xRange && ([Math.min(...options.xRange), Math.max(...options.xRange)] as [number, number]);
  const x = scaleFor(t.values, [left, left + frame.width], false, 0, range);
  const y = scaleFor(
    series.flatMap((s) => s.s.values),
    [frame.top + frame.height, frame.top],
    false,
    0.05,
  );
  const out = drawAxes(frame, x, y, axisLabel('t', t.unit), axisLabel('i', i.unit));
  const [y0, y1] = y.domain();
  if (y0 < 0 && y1 > 0) out.push(el('line', { x1: left, x2: left + frame.width, y1: y(0), y2: y(0), stroke: PLOT_COLOURS.grey, 'stroke-width': 0.8 }));
  for (const s of series)
    out.push(
      el('path', { d: path(t.values, s.s.values, x, y), fill: 'none', stroke: s.colour, 'stroke-width': s.dash ? 1.2 : 1.6, 'stroke-dasharray': s.dash }),
    );
  out.push(
    ...legend(
      left + frame.width - 170,
      frame.top + 12,
      series.map((s) => ({ label: s.label, colour: s.colour, dash: s.dash })),
    ),
  );
  const [d0, d1] = x.domain() as [number, number];
  return {
    svg: svgDocument(W, frame.top + frame.height + 46, 'Current against time', out),
    data: {
      x: { name: 't', unit: t.unit, values: t.values },
      series: series.map((s) => ({ name: s.label, unit: i.unit, values: s.s.values })),
      frame: { left, width: frame.width, svgWidth: W },
      domain: [d0, d1],
      log: false,
    },
  };
}

interface Phasor {
  name: string;
  re: number;
  im: number;
  value: FormattedValue;
}

const complexValues = (result: CalcResult): Phasor[] =>
  Object.entries(result.values).flatMap(([name, value]) => {
    const si = value.si;
    if (!si || typeof si !== 'object' || Array.isArray(si) || !('re' in si)) return [];
    if (!Number.isFinite(si.re) || !Number.isFinite(si.im)) return [];
    return [{ name, re: si.re, im: si.im, value }];
  });

const isImpedance = (p: Phasor): boolean => p.value.siUnit === 'ohm';

/**
 * The impedance triangle of a complex impedance Z = R + jX: R along the base, X upright, Z the
 * hypotenuse and φ the angle between R and Z (above the base for inductive, below for capacitive).
 */
export function impedanceTriangle(name: string, R: number, X: number, labels: { R: string; X: string; Z: string; phi: string }): string {
  const size = 260;
  const pad = 56;
  const scale = (size - 2 * pad) / Math.max(Math.abs(R), Math.abs(X), 1e-300);
  const ox = pad;
  const oy = X >= 0 ? size - pad : pad;
  const rx = ox + R * scale;
  const xy = oy - X * scale;
  const out: string[] = [
    el('line', { x1: ox, y1: oy, x2: rx, y2: oy, stroke: PLOT_COLOURS.ink, 'stroke-width': 2 }),
    el('line', { x1: rx, y1: oy, x2: rx, y2: xy, stroke: PLOT_COLOURS.copper, 'stroke-width': 2 }),
    el('line', { x1: ox, y1: oy, x2: rx, y2: xy, stroke: PLOT_COLOURS.text, 'stroke-width': 2 }),
    text((ox + rx) / 2, oy + (X >= 0 ? 16 : -8), `R = ${labels.R}`, { 'text-anchor': 'middle' }),
    text(rx + 6, (oy + xy) / 2 + 4, `X = ${labels.X}`),
    text((ox + rx) / 2 - 8, (oy + xy) / 2 + (X >= 0 ? -6 : 14), `|${name}| = ${labels.Z}`, { 'text-anchor': 'end' }),
  ];
  const angle = Math.atan2(X, R);
  const r = 28;
  const arc = `M${ox + r},${oy} A${r},${r} 0 0 ${X >= 0 ? 0 : 1} ${ox + r * Math.cos(angle)},${oy - r * Math.sin(angle)}`;
  out.push(el('path', { d: arc, fill: 'none', stroke: PLOT_COLOURS.grey, 'stroke-width': 1 }));
  out.push(text(ox + r + 6, oy + (X >= 0 ? -6 : 14), `φ = ${labels.phi}`, { 'font-size': 10 }));
  return svgDocument(size + 80, size, `Impedance triangle of ${name}`, out);
}

/** The phasors of a calc cell (its complex results other than impedances), each scaled to the largest of its unit. */
export function phasorDiagram(phasors: Phasor[]): string {
  const size = 300;
  const c = size / 2;
  const radius = c - 40;
  const maxByUnit = new Map<string, number>();
  for (const p of phasors) maxByUnit.set(p.value.siUnit, Math.max(maxByUnit.get(p.value.siUnit) ?? 0, Math.hypot(p.re, p.im)));
  const out: string[] = [
    el('circle', { cx: c, cy: c, r: radius, fill: 'none', stroke: PLOT_COLOURS.rule }),
    el('line', { x1: c - radius - 10, x2: c + radius + 10, y1: c, y2: c, stroke: PLOT_COLOURS.grey, 'stroke-width': 0.8 }),
    el('line', { x1: c, x2: c, y1: c - radius - 10, y2: c + radius + 10, stroke: PLOT_COLOURS.grey, 'stroke-width': 0.8 }),
    text(c + radius + 12, c + 4, 'Re'),
    text(c + 4, c - radius - 12, 'Im'),
    el('defs', {}, [
      el('marker', { id: 'aw-arrow', viewBox: '0 0 10 10', refX: 9, refY: 5, markerWidth: 7, markerHeight: 7, orient: 'auto-start-reverse' }, [
        el('path', { d: 'M0,0 L10,5 L0,10 z', fill: 'context-stroke' }),
      ]),
    ]),
  ];
  phasors.forEach((p, i) => {
    const m = maxByUnit.get(p.value.siUnit) || 1;
    const x = c + (p.re / m) * radius;
    const y = c - (p.im / m) * radius;
    const colour = TRACE[i % TRACE.length];
    out.push(el('line', { x1: c, y1: c, x2: x, y2: y, stroke: colour, 'stroke-width': 2, 'marker-end': 'url(#aw-arrow)' }));
    out.push(text(x + (x >= c ? 6 : -6), y + (y >= c ? 12 : -4), p.name, { 'text-anchor': x >= c ? 'start' : 'end', fill: colour, 'font-weight': 600 }));
  });
  out.push(...phasors.map((p, i) => text(8, size + 14 + i * 14, `${p.name} = ${p.value.display}`, { 'font-size': 10, fill: TRACE[i % TRACE.length] })));
  return svgDocument(size + 60, size + 20 + phasors.length * 14, 'Phasor diagram', out);
}

export interface CalcFigure {
  kind: 'impedance-triangle' | 'phasors';
  svg: string;
}

/** The figures a calc cell's complex results call for: an impedance triangle per complex impedance, one phasor diagram for the rest. */
export function calcFigures(result: CalcResult): CalcFigure[] {
  const all = complexValues(result);
  const figures: CalcFigure[] = [];
  for (const z of all.filter(isImpedance)) {
    const [mag, ang] = polar([z.value.display, z.value.displayAlt ?? ''].find((d) => d.includes('∠')) ?? '');
    figures.push({
      kind: 'impedance-triangle',
      svg: impedanceTriangle(z.name, z.re, z.im, {
        R: `${Number(z.re.toPrecision(4))} Ω`,
        X: `${Number(z.im.toPrecision(4))} Ω`,
        Z: mag ?? `${Number(Math.hypot(z.re, z.im).toPrecision(4))} Ω`,
        phi: ang ?? `${((Math.atan2(z.im, z.re) * 180) / Math.PI).toFixed(1)}°`,
      }),
    });
  }
  const others = all.filter((p) => !isImpedance(p));
  if (others.length) figures.push({ kind: 'phasors', svg: phasorDiagram(others) });
  return figures;
}

/** "13.42 Ω ∠ −26.9°" → ["13.42 Ω", "−26.9°"]. */
function polar(display: string): [string | undefined, string | undefined] {
  const m = /^(.*?)\s*∠\s*(.*)$/.exec(display);
  return m ? [m[1], m[2]] : [undefined, undefined];
}

/**
 * Harmonic voltages as bars: each order's individual distortion (percent of the fundamental) at each node,
 * side by side, against the limit for one order drawn as a line across (when a limit applies).
 */
export function harmonicBarsPlot(orders: number[], nodes: { node: string; individual: number[] }[], limit: number | null): Plot | null {
  if (!orders.length || !nodes.length) return null;
  const left = 64;
  const frame: Frame = { left, top: 16, width: W - left - 20, height: 220 };
  const slot = frame.width / orders.length;
  const bar = Math.max(2, (slot * 0.8) / nodes.length);
  const top = Math.max(limit ?? 0, ...nodes.flatMap((n) => n.individual.filter(Number.isFinite))) * 1.15 || 1;
  const y = scaleFor([0, top], [frame.top + frame.height, frame.top], false, 0, [0, top]);
  const x = scaleFor([0, orders.length], [left, left + frame.width], false, 0, [0, orders.length]);
  const out = drawAxes(frame, x, y, 'harmonic order', axisLabel('individual distortion', '%'), { xTicks: false });
  orders.forEach((h, k) => {
    const x0 = left + k * slot + slot * 0.1;
    nodes.forEach((n, i) => {
      const v = n.individual[k];
      if (!Number.isFinite(v)) return;
      out.push(el('rect', { x: x0 + i * bar, y: y(v), width: bar * 0.9, height: Math.max(0, y(0) - y(v)), fill: TRACE[i % TRACE.length] }));
    });
    out.push(text(left + k * slot + slot / 2, frame.top + frame.height + 14, String(h), { 'font-size': 10, 'text-anchor': 'middle' }));
  });
  out.push(text(left + frame.width / 2, frame.top + frame.height + 30, 'harmonic order h', { 'text-anchor': 'middle', 'font-size': 12 }));
  if (limit !== null)
    out.push(
      el('line', { x1: left, x2: left + frame.width, y1: y(limit), y2: y(limit), stroke: PLOT_COLOURS.copper, 'stroke-width': 1.2, 'stroke-dasharray': '6 3' }),
      text(left + frame.width - 4, y(limit) - 4, `limit ${limit} %`, { 'font-size': 10, 'text-anchor': 'end', fill: PLOT_COLOURS.copper }),
    );
  if (nodes.length > 1)
    out.push(
      ...legend(
        left + 10,
        frame.top + 12,
        nodes.map((n, i) => ({ label: n.node, colour: TRACE[i % TRACE.length] })),
      ),
    );
  return {
    svg: svgDocument(W, frame.top + frame.height + 46, 'Harmonic voltages against their limit', out),
    data: {
      x: { name: 'h', unit: '', values: orders },
      series: nodes.map((n) => ({ name: n.node, unit: '%', values: n.individual })),
      frame: { left, width: frame.width, svgWidth: W },
      domain: [orders[0], orders[orders.length - 1]],
      log: false,
    },
  };
}
