/**
 * The transient cell: charge and current of a series RLC driven by E(t), from q0 and i0, over a span.
 * Reports the damping case, the analytic solution where one exists (a constant or sinusoidal source),
 * the numeric solution for any E(t), the peak current and its time, and the steady and transient parts.
 */
import type { MathNode } from 'mathjs';
import type { TransientCell } from '../sheet/sheet-format';
import { EngineError } from '../language/errors';
import { checkNames, evaluateNode, parseExpression, valueNames } from '../language/expression';
import { isUnit, math } from '../language/math';
import { analyticSolution, dampingOf, extremaOnGrid, numericSolution, summarise, type Extremum, type SourceForm } from '../circuits/transient';
import { formatValue, type DisplayOptions } from '../units/display';
import { angleValue } from '../circuits/functions';
import { real, type Dimension } from '../units/quantities';
import type { SheetScope } from './scope';
import type { ExtremaResult, SeriesData, TransientResult } from './types';

type AnyNode = MathNode & Record<string, unknown>;
const ODEX_VERSION = '2.0.4';

const dependsOnT = (node: MathNode) => node.filter((n) => n.type === 'SymbolNode' && (n as AnyNode).name === 't').length > 0;

/** Recognises E0, E0·sin(w t + θ) and E0·cos(w t + θ) (any order of factors) for the analytic solution. */
function sourceForm(node: MathNode, evaluateAt: (n: MathNode, t: number) => number): SourceForm | undefined {
  const inner = (n: AnyNode): AnyNode => (n.type === 'ParenthesisNode' ? inner(n.content as AnyNode) : n);
  const root = inner(node as AnyNode);
  if (!dependsOnT(root)) return { kind: 'constant', E0: evaluateAt(root, 0) };
  const factors: AnyNode[] = [];
  const collect = (n: AnyNode) => {
    const m = inner(n);
    if (m.type === 'OperatorNode' && m.fn === 'multiply') (m.args as AnyNode[]).forEach(collect);
    else factors.push(m);
  };
  collect(root);
  const trig = factors.filter(dependsOnT);
  if (trig.length !== 1) return undefined;
  const f = trig[0];
  if (f.type !== 'FunctionNode') return undefined;
  const fname = String((f.fn as AnyNode).name);
  if (fname !== 'sin' && fname !== 'cos') return undefined;
  const arg = (f.args as MathNode[])[0];
  const a0 = evaluateAt(arg, 0);
  const a1 = evaluateAt(arg, 1e-3);
  const a2 = evaluateAt(arg, 2e-3);
  const omega = (a1 - a0) / 1e-3;
  if (Math.abs(a2 - a0 - 2 * (a1 - a0)) > 1e-9 * Math.max(1, Math.abs(a2))) return undefined; // not linear in t
  const others = factors.filter((x) => x !== f);
  const E0 = others.reduce((acc, x) => acc * evaluateAt(x, 0), 1);
  const theta = fname === 'sin' ? a0 : a0 + Math.PI / 2;
  if (!(omega > 0)) return undefined;
  return { kind: 'sine', E0, omega, theta };
}

export function evaluateTransientCell(cell: TransientCell, cellIndex: number, scope: SheetScope, display: DisplayOptions): TransientResult {
  const result: TransientResult = { kind: 'transient', status: 'ok', errors: [], warnings: [] };
  const place = { cell: cellIndex, line: 1 };
  const mathScope = scope.asMathScope();
  try {
    const value = (text: string | undefined, dim: Dimension, what: string, fallback?: number) => {
      if (text === undefined || text.trim() === '') {
        if (fallback !== undefined) return fallback;
        throw new EngineError(`${what} is missing`, 1, 1);
      }
      const node = parseExpression(text, 1, 0, valueNames(scope));
      checkNames(node, text, scope, place);
      const v = evaluateNode(node, node.compile(), mathScope, text, 1);
      if (v === 0 && fallback !== undefined) return 0; // a plain 0 is zero charge or current in any unit
      try {
        return real(v, dim, what);
      } catch (err) {
        throw new EngineError((err as Error).message, 1, 1);
      }
    };
    const R = value(cell.R, 'impedance', 'R');
    const L = value(cell.L, 'inductance', 'L');
    const C = value(cell.C, 'capacitance', 'C');
    const q0 = value(cell.q0, 'charge', 'q0', 0);
    const i0 = value(cell.i0, 'current', 'i0', 0);
    const span = value(cell.span, 'time', 'the time span');
    if (!(R >= 0)) throw new EngineError('R must not be negative', 1, 1);
    if (!(L > 0) || !(C > 0)) throw new EngineError('L and C must be greater than zero', 1, 1);
    if (!(span > 0)) throw new EngineError('the time span must be greater than zero', 1, 1);
    const points = cell.points ?? 1000;

    const sourceNode = parseExpression(cell.source, 1, 0, valueNames(scope));
    checkNames(sourceNode, cell.source, scope, place, 0, new Set(['t']));
    const tScope = new Map(scope.values);
    const evalAtUnits = (n: MathNode, t: number) => {
      tScope.set('t', math.unit(t, 's'));
      return n.compile().evaluate(tScope) as unknown;
    };
    const first = evalAtUnits(sourceNode, 0);
    // A plain 0 is no source at all (a free response from q0 and i0), as it is for q0 and i0.
    const zeroSource = first === 0 && !dependsOnT(sourceNode);
    if (!zeroSource) {
      try {
        real(first, 'voltage', 'the source E(t)');
      } catch (err) {
        throw new EngineError(`${(err as Error).message} (at t = 0)`, 1, 1);
      }
    }
    const compiledSource = sourceNode.compile();
    const E = zeroSource
      ? () => 0
      : (t: number) => {
          tScope.set('t', math.unit(t, 's'));
          return (compiledSource.evaluate(tScope) as { value: number }).value;
        };
    const scalarAt = (n: MathNode, t: number) => {
      let v = evalAtUnits(n, t);
      // A bare unit (the V of "100 V") has no value of its own: give it one, in SI.
      if (isUnit(v) && (v as unknown as { value: unknown }).value === null) v = math.multiply(1, v as never);
      return isUnit(v)
        ? (() => {
            try {
              return angleValue(v);
            } catch {
              return (v as unknown as { value: number }).value;
            }
          })()
        : Number(v);
    };

    const { alpha, omega0, dampingCase } = dampingOf({ R, L, C });
    result.dampingCase = dampingCase;
    result.parameters = {
      alpha: formatValue(math.unit(alpha, 's^-1'), display),
      omega_0: formatValue(math.unit(omega0, 'rad/s'), display),
      zeta: formatValue((R / 2) * Math.sqrt(C / L), display),
      ...(omega0 > alpha ? { omega_d: formatValue(math.unit(Math.sqrt(omega0 ** 2 - alpha ** 2), 'rad/s'), display) } : {}),
    };

    let form: SourceForm | undefined;
    try {
      form = zeroSource ? { kind: 'constant', E0: 0 } : sourceForm(sourceNode, scalarAt);
    } catch {
      form = undefined;
    }
    // The extrema come from the closed form where there is one, else from the solver's dense output.
    const numeric = numericSolution({ R, L, C, q0, i0 }, E, span, points, { deadline: Date.now() + 5000, extrema: !form });
    result.solver = { name: 'odex', version: ODEX_VERSION, steps: numeric.steps, evaluations: numeric.evaluations };
    result.time = { name: 't', unit: 's', values: numeric.t };
    result.charge = { name: 'q', unit: 'C', values: numeric.q };
    result.current = { name: 'i', unit: 'A', values: numeric.i };

    let currentExtrema: Extremum[];
    let chargeExtrema: Extremum[];
    if (form) {
      const a = analyticSolution({ R, L, C, q0, i0 }, form, span);
      const Ea = form.kind === 'constant' ? () => form.E0 : (t: number) => form.E0 * Math.sin(form.omega * t + form.theta);
      const ia = numeric.t.map(a.i);
      const peak = Math.max(...numeric.i.map(Math.abs), 1e-300);
      result.analytic = { available: true, sourceForm: form.kind === 'constant' ? 'constant' : 'sinusoid' };
      result.chargeAnalytic = { name: 'q (analytic)', unit: 'C', values: numeric.t.map(a.q) };
      result.currentAnalytic = { name: 'i (analytic)', unit: 'A', values: ia };
      if (a.iSteady) {
        const steady: SeriesData = { name: 'i steady', unit: 'A', values: numeric.t.map(a.iSteady) };
        result.currentSteady = steady;
        result.currentTransient = { name: 'i transient', unit: 'A', values: numeric.i.map((x, j) => x - steady.values[j]) };
      }
      result.maxRelativeDeviation = Math.max(...ia.map((x, j) => Math.abs(x - numeric.i[j]))) / peak;
      currentExtrema = extremaOnGrid(numeric.grid, a.i, (t) => Ea(t) - R * a.i(t) - a.q(t) / C);
      chargeExtrema = extremaOnGrid(numeric.grid, a.q, a.i);
      if (!a.resonant) result.steady = steadyState(form, { R, L, C }, display);
      else {
        result.warnings.push({
          line: 1,
          column: 1,
          message:
            'R = 0 and the source is at the resonant frequency: the current grows in proportion to time without bound and has no steady state; the solution is given over this span only',
        });
      }
    } else {
      result.analytic = { available: false, reason: 'the source is not a constant or a single sinusoid, so only the numeric solution is given' };
      currentExtrema = numeric.currentExtrema!;
      chargeExtrema = numeric.chargeExtrema!;
    }
    const current = summarise(currentExtrema);
    result.peaks = {
      from: form ? 'analytic' : 'numeric',
      current: extremaResult(current, 'A', 1, display),
      capacitorVoltage: extremaResult(summarise(chargeExtrema), 'V', 1 / C, display),
    };
    result.peakCurrent = result.peaks.current.peak.value;
    result.peakTime = result.peaks.current.peak.time;
    if (current.peak.t === span) {
      result.warnings.push({
        line: 1,
        column: 1,
        message: 'the largest current is at the end of the span, so it may be larger later: lengthen the span to find the peak',
      });
    }
  } catch (err) {
    result.status = 'error';
    result.errors.push(err instanceof EngineError ? err.toDiagnostic() : { line: 1, column: 1, message: (err as Error).message });
  }
  return result;
}

/** The largest value, the smallest and the largest magnitude, each with its time, in `unit` (value × factor). */
function extremaResult({ max, min, peak }: ReturnType<typeof summarise>, unit: string, factor: number, display: DisplayOptions): ExtremaResult {
  const shown = (p: { t: number; value: number }) => ({
    value: formatValue(math.unit(p.value * factor, unit), display),
    time: formatValue(math.unit(p.t, 's'), display),
  });
  return { peak: shown(peak), max: shown(max), min: shown(min) };
}

/**
 * What remains when the transient has died away: for a constant source the charge C·E0 and the
 * capacitor voltage E0 with no current; for E0 sin(ωt + θ), the amplitudes of current E0/Z, charge
 * E0/(ωZ) and capacitor voltage E0/(ωCZ), and the delay angle. None at resonance without damping.
 */
function steadyState(
  form: SourceForm,
  { R, L, C }: { R: number; L: number; C: number },
  display: DisplayOptions,
): Record<string, ReturnType<typeof formatValue>> | undefined {
  if (form.kind === 'constant') {
    return {
      q_ss: formatValue(math.unit(C * form.E0, 'C'), display),
      v_C_ss: formatValue(math.unit(form.E0, 'V'), display),
      i_ss: formatValue(math.unit(0, 'A'), display),
    };
  }
  const w = form.omega;
  const S = w * L - 1 / (w * C);
  const Z = Math.hypot(R, S);
  if (Z === 0) return undefined;
  return {
    I_ss: formatValue(math.unit(Math.abs(form.E0) / Z, 'A'), display),
    Q_ss: formatValue(math.unit(Math.abs(form.E0) / (w * Z), 'C'), display),
    V_C_ss: formatValue(math.unit(Math.abs(form.E0) / (w * C * Z), 'V'), display),
    phi: formatValue(math.unit(Math.atan2(S, R), 'rad'), display, 'deg'),
  };
}
