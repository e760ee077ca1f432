/** Chart frames and axes with ticks and unit labels, on d3 scales. */
import { scaleLinear, scaleLog, type ScaleContinuousNumeric } from 'd3-scale';
import { prettyUnit } from '../units/pretty-unit';
import { el, PLOT_COLOURS, text } from './svg';

export type Scale = ScaleContinuousNumeric<number, number>;

export interface Frame {
  left: number;
  top: number;
  width: number;
  height: number;
}

/** A linear or logarithmic scale over the finite values; log only when every value is positive. */
export function scaleFor(values: number[], range: [number, number], log: boolean, padFraction = 0, fixed?: [number, number]): Scale {
  // A domain given (a chart zoomed to a range) is kept exactly, so the pointer's read-out maps back to it.
  if (fixed) return (log && fixed[0] > 0 ? scaleLog() : scaleLinear()).domain(fixed).range(range);
  const finite = values.filter(Number.isFinite);
  let lo = finite.length ? Math.min(...finite) : 0;
  let hi = finite.length ? Math.max(...finite) : 1;
  if (log && lo > 0) {
    if (hi / lo < 10) {
      lo /= 1.5;
      hi *= 1.5;
    }
    return scaleLog().domain([lo, hi]).range(range).nice();
  }
  if (lo === hi) {
    const d = lo === 0 ? 1 : Math.abs(lo) * 0.1;
    lo -= d;
    hi += d;
  }
  const pad = (hi - lo) * padFraction;
  return scaleLinear()
    .domain([lo - pad, hi + pad])
    .range(range)
    .nice();
}

/** Engineering-style tick text: 1k, 2.5m, 100 and so on, with few digits. */
export function tickText(v: number): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  const prefixes: [number, string][] = [
    [1e9, 'G'],
    [1e6, 'M'],
    [1e3, 'k'],
    [1, ''],
    [1e-3, 'm'],
    [1e-6, 'µ'],
    [1e-9, 'n'],
    [1e-12, 'p'],
  ];
  const [factor, p] = prefixes.find(([f]) => a >= f) ?? prefixes[prefixes.length - 1];
  const scaled = v / factor;
  return `${Number(scaled.toPrecision(3))}${p}`;
}

function ticksOf(scale: Scale, count: number): number[] {
  const ticks = scale.ticks(count);
  const isLog = (scale as unknown as { base?: unknown }).base !== undefined;
  // On a log axis keep the decades (and 2, 5 within them when there are few decades).
  if (isLog) {
    const [a, b] = scale.domain();
    const decades = Math.log10(b / a);
    return ticks.filter((t) => {
      const m = Math.round(t / 10 ** Math.floor(Math.log10(t) + 1e-9));
      return m === 1 || (decades <= 3 && (m === 2 || m === 5));
    });
  }
  return ticks;
}

/** Grid, ticks and labels for a frame; `xLabel` and `yLabel` carry the unit, as `f [Hz]`. */
export function drawAxes(frame: Frame, x: Scale, y: Scale, xLabel: string, yLabel: string, options: { xTicks?: boolean } = {}): string[] {
  const out: string[] = [];
  const { left, top, width, height } = frame;
  const bottom = top + height;
  for (const t of ticksOf(y, 5)) {
    const py = y(t);
    out.push(el('line', { x1: left, x2: left + width, y1: py, y2: py, stroke: PLOT_COLOURS.rule, 'stroke-width': 0.6 }));
    out.push(text(left - 5, py + 3.5, tickText(t), { 'text-anchor': 'end' }));
  }
  for (const t of ticksOf(x, 8)) {
    const px = x(t);
    out.push(el('line', { x1: px, x2: px, y1: top, y2: bottom, stroke: PLOT_COLOURS.rule, 'stroke-width': 0.6 }));
    if (options.xTicks !== false) out.push(text(px, bottom + 14, tickText(t), { 'text-anchor': 'middle' }));
  }
  out.push(el('rect', { x: left, y: top, width, height, fill: 'none', stroke: PLOT_COLOURS.grey, 'stroke-width': 0.8 }));
  if (options.xTicks !== false) out.push(text(left + width / 2, bottom + 30, xLabel, { 'text-anchor': 'middle', 'font-size': 12 }));
  out.push(text(left - 42, top + height / 2, yLabel, { 'text-anchor': 'middle', 'font-size': 12, transform: `rotate(-90 ${left - 42} ${top + height / 2})` }));
  return out;
}

export const axisLabel = (name: string, unit: string): string => (unit ? `${name} [${prettyUnit(unit)}]` : name);
