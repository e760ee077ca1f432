/**
 * The conventions behind the trade's functions, said where their results are shown: which values are
 * rms, what basis a capacitor bank's figure is on, whether a power factor leads or lags. And a warning
 * where a value named as a peak reaches a function that takes rms values.
 */
import type { MathNode } from 'mathjs';
import type { CircuitFunctionName } from './functions';

type AnyNode = MathNode & Record<string, unknown>;

const RMS_POWER = 'from rms values of V and I (S = V·I*); a peak-valued phasor would give twice the power';

/** A sentence shown beside a line whose expression is a call to one of these functions. */
export const RESULT_CONVENTIONS: Partial<Record<CircuitFunctionName, string>> = {
  complex_power: RMS_POWER,
  apparent_power: RMS_POWER,
  real_power: RMS_POWER,
  reactive_power: `${RMS_POWER}; Q > 0 is inductive (lagging)`,
  power_factor: 'P/|S| = cos φ',
  bank_reactive_power:
    'of one capacitor, with V the rms voltage across it (Q = 2πf·C·V²): per phase of a star bank with V = V_LL/√3, or of a delta bank with V = V_LL; the three-phase total is 3 times this',
  bank_capacitance:
    'of one capacitor, for the reactive power Q on it and V the rms voltage across it: per phase of a star bank give Q/3 and V_LL/√3, of a delta bank Q/3 and V_LL',
  line_current_3ph: 'rms line current of a balanced three-phase load, |S|/(√3·V_LL)',
  power_3ph: 'balanced three-phase, √3·V_LL·I_L·pf with rms V_LL and I_L',
  apparent_power_3ph: 'balanced three-phase, √3·V_LL·I_L with rms V_LL and I_L',
  resonance_order: 'parallel resonance of the bank with the source, h = √(S_sc/Q_c), source reactance only',
  resonance_order_tr: 'h = √(S_sc,bus/Q_c), with 1/S_sc,bus = 1/S_sc + z%/(100·S_tr); without S_sc the source is taken as infinite, which gives the highest h',
  rms: 'of one sinusoid: peak/√2',
  peak: 'of one sinusoid: √2 × rms',
  total_rms: 'square root of the sum of the squares of the rms values of the fundamental and each harmonic (IEEE Std 519-2014, 3.1)',
  thd: 'rms of the harmonics 2 to 50 over the rms fundamental (IEEE Std 519-2014, 3.1)',
  tdd: 'rms of the harmonic currents 2 to 50 over the maximum demand load current I_L (IEEE Std 519-2014, 3.1)',
  attenuation: 'α = R/(2L), in s⁻¹',
  natural_frequency: 'ω0 = 1/√(LC), an angular frequency in rad/s',
  damped_frequency: 'ωd = √(ω0² − α²), an angular frequency in rad/s',
  resonant_frequency: 'f0 = 1/(2π√(LC)), a frequency in Hz',
};

const RMS_FUNCTIONS = new Set(['complex_power', 'apparent_power', 'real_power', 'reactive_power']);

/** Names engineers give peak values: E_pk, V_peak, I_hat, E0, V_m, I_max. */
export const isPeakName = (name: string) => /^[A-Za-z]+_?(pk|peak|hat)$/.test(name) || /^[EVUI]_?(0|m|max)$/.test(name);

/** A warning for each value named as a peak that reaches a function taking rms values, not through rms(…). */
export function rmsWarnings(node: MathNode): string[] {
  const out: string[] = [];
  node.traverse((n) => {
    const f = n as AnyNode;
    if (f.type !== 'FunctionNode' || !RMS_FUNCTIONS.has(String((f.fn as AnyNode).name))) return;
    const fn = String((f.fn as AnyNode).name);
    for (const arg of f.args as MathNode[]) {
      const visit = (m: MathNode) => {
        const a = m as AnyNode;
        if (a.type === 'FunctionNode' && String((a.fn as AnyNode).name) === 'rms') return;
        if (a.type === 'SymbolNode' && isPeakName(String(a.name))) {
          out.push(`${fn} takes rms values, and ${String(a.name)} is named as a peak value: if it is one, pass rms(${String(a.name)})`);
        }
        m.forEach(visit);
      };
      visit(arg);
    }
  });
  return [...new Set(out)];
}

/** The function a line's whole expression calls, if it is one call. */
export function calledFunction(node: MathNode): { name: string; args: MathNode[] } | undefined {
  let n = node as AnyNode;
  while (n.type === 'ParenthesisNode') n = n.content as AnyNode;
  if (n.type !== 'FunctionNode' || (n.fn as AnyNode).type !== 'SymbolNode') return undefined;
  return { name: String((n.fn as AnyNode).name), args: n.args as MathNode[] };
}
