/**
 * What a transient cell reports, as labelled rows of text: the same rows on screen and in the signed
 * package. Pure (types only), so the browser can use it without the engine.
 */
import type { ExtremaResult, TransientResult } from '../cells/types';

export interface SummaryRow {
  label: string;
  text: string;
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
