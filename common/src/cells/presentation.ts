/**
 * The presentation model: what a cell shows, as a list of blocks that the screen (features/sheets'
 * `CellPresentation`) and the signed package (packages/package-pdf.ts) each draw in their own medium —
 * so the wording of an outcome, the utilisation bands, the rows of a transient's summary and the charts
 * are decided here once. Which blocks each kind of cell gives is its `present` in cells/kinds.ts.
 * Pure (no engine), so the browser can use it.
 */
import type { Plot, PlotData } from '../plot/charts';
import type { CheckResult, ExtremaResult, LineResult, TransientResult } from './types';

export interface SummaryRow {
  label: string;
  text: string;
}

/** One piece of a cell's presentation; each medium has one drawing per block type. */
export type PresentationBlock =
  /** A note's Markdown (headings, paragraphs, lists, $maths$). */
  | { type: 'note'; text: string }
  /** A calc's lines: each formula, its working with values, and its result, typeset. */
  | { type: 'lines'; lines: LineResult[] }
  /** A check's outcome, relation and utilisation. */
  | { type: 'outcome'; check: CheckPresentation; formula?: string; working?: string }
  /** Labelled rows of text (a transient's damping, peaks, steady state, method). */
  | { type: 'rows'; label: string; rows: SummaryRow[] }
  /** A drawing from common/plot; `small` ones sit side by side on screen and at 60 % width on paper. */
  /**
   * A chart or diagram. A chart of series also carries what it plots (`plot`) and `redraw`, which draws it
   * again over a range of its horizontal variable (null: the whole range): the screen reads values out,
   * zooms and exports from them; the package draws `svg`.
   */
  | { type: 'figure'; label: string; svg: string; small?: boolean; plot?: PlotData; redraw?: (xRange: [number, number] | null) => Plot | null }
  /** A sentence: `muted` for what the inputs were, `caption` for a figure's caption. */
  | { type: 'sentence'; text: string; style: 'plain' | 'muted' | 'caption' }
  /** A table of values as typed, a unit per column. */
  | { type: 'table'; columns: { name: string; unit?: string }[]; rows: string[][] };

export type BlockType = PresentationBlock['type'];
export type BlockOf<T extends BlockType> = Extract<PresentationBlock, { type: T }>;

/** pass: within the limit with room; caution: above 90 % of it; fail: over it; none: not evaluated. */
export type Tone = 'pass' | 'caution' | 'fail' | 'none';

export interface CheckPresentation {
  outcome: 'Pass' | 'Fail' | 'Not evaluated';
  tone: Tone;
  advisory: boolean;
  utilisation?: { fraction: number; band: Tone; text: string };
}

/** Utilisation above this fraction of the limit is shown as a caution (common practice). */
export const CAUTION_UTILISATION = 0.9;

export function checkPresentation(r: CheckResult): CheckPresentation {
  const outcome = r.pass === true ? 'Pass' : r.pass === false ? 'Fail' : 'Not evaluated';
  const tone: Tone = r.pass === true ? 'pass' : r.pass === false ? 'fail' : 'none';
  const u = r.utilization;
  return {
    outcome,
    tone,
    advisory: r.severity === 'advisory',
    ...(u !== null && u !== undefined
      ? {
          utilisation: {
            fraction: Math.min(1, Math.max(0, u)),
            band: u > 1 ? 'fail' : u > CAUTION_UTILISATION ? 'caution' : 'pass',
            text: `Utilisation ${(u * 100).toFixed(1)} %${r.margin !== null && r.margin !== undefined ? `, margin ${(r.margin * 100).toFixed(1)} %` : ''}`,
          },
        }
      : {}),
  };
}

const extremaRows = (what: string, symbol: string, e: ExtremaResult | undefined): SummaryRow[] =>
  e
    ? [
        { label: `Peak ${what}`, text: `${symbol} = ${e.peak.value.display} at t = ${e.peak.time.display} (largest magnitude, with its sign)` },
        { label: `Highest and lowest ${what}`, text: `${e.max.value.display} at ${e.max.time.display}; ${e.min.value.display} at ${e.min.time.display}` },
      ]
    : [];

export function transientSummary(r: TransientResult): SummaryRow[] {
  const rows: SummaryRow[] = [];
  const p = r.parameters ?? {};
  if (r.dampingCase) {
    rows.push({
      label: 'Damping',
      text: `${r.dampingCase}${p.zeta ? ` (ζ = ${p.zeta.display})` : ''}; α = ${p.alpha?.display ?? '—'}, ω0 = ${p.omega_0?.display ?? '—'}${p.omega_d ? `, ωd = ${p.omega_d.display}` : ''}`,
    });
  }
  rows.push(...extremaRows('current', 'i', r.peaks?.current), ...extremaRows('capacitor voltage', 'v_C = q/C', r.peaks?.capacitorVoltage));
  const s = r.steady;
  if (s?.q_ss) rows.push({ label: 'Steady state', text: `q = ${s.q_ss.display}, v_C = ${s.v_C_ss.display}, i = ${s.i_ss.display}` });
  if (s?.I_ss)
    rows.push({
      label: 'Steady state (amplitudes)',
      text: `i: ${s.I_ss.display}; q: ${s.Q_ss.display}; v_C: ${s.V_C_ss.display}; delay angle φ = ${s.phi.display}`,
    });
  if (r.peaks) {
    const agreement =
      r.analytic?.available && r.maxRelativeDeviation !== undefined
        ? `; the numeric solution agrees with the analytic one within ${(r.maxRelativeDeviation * 100).toExponential(1)} % of the peak`
        : '';
    rows.push({
      label: 'Method',
      text: `${r.peaks.from === 'analytic' ? 'extrema from the analytic solution' : 'extrema from the solver’s dense output'}, by root-finding the slope; ${r.solver ? `solver ${r.solver.name} ${r.solver.version}, ${r.solver.steps} steps` : ''}${agreement}`,
    });
  }
  if (r.analytic && !r.analytic.available && r.analytic.reason) rows.push({ label: 'Analytic solution', text: r.analytic.reason });
  return rows;
}
