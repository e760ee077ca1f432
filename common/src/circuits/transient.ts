/**
 * The series RLC driven by E(t): L q'' + R q' + q / C = E(t), q(0) = q0, i(0) = q'(0) = i0.
 * Analytic solution for a constant or sinusoidal source (complementary plus particular solution,
 * constants from the initial conditions), and a numeric solution for any E(t) with odex
 * (Hairer and Wanner's GBS extrapolation code, npm package odex).
 */
import { Solver } from 'odex';

export type DampingCase = 'overdamped' | 'critically damped' | 'underdamped' | 'undamped';

export interface RlcParameters {
  R: number;
  L: number;
  C: number;
  q0: number;
  i0: number;
}

export type SourceForm = { kind: 'constant'; E0: number } | { kind: 'sine'; E0: number; omega: number; theta: number };

export interface AnalyticSolution {
  q(t: number): number;
  i(t: number): number;
  /** The steady periodic (or constant) part, which remains when the transient has died away; none at resonance. */
  qSteady?(t: number): number;
  iSteady?(t: number): number;
  dampingCase: DampingCase;
  /** An undamped circuit driven at its resonant frequency: the response grows without bound. */
  resonant?: boolean;
}

export function dampingOf({ R, L, C }: Pick<RlcParameters, 'R' | 'L' | 'C'>): { alpha: number; omega0: number; dampingCase: DampingCase } {
  const alpha = R / (2 * L);
  const omega0 = 1 / Math.sqrt(L * C);
  const rel = (alpha - omega0) / omega0;
  const dampingCase: DampingCase = R === 0 ? 'undamped' : Math.abs(rel) <= 1e-9 ? 'critically damped' : alpha > omega0 ? 'overdamped' : 'underdamped';
  return { alpha, omega0, dampingCase };
}

/**
 * True when an undamped circuit is driven so close to its resonant frequency that, over the span, the
 * drive cannot be told from exact resonance: |ω − ω0|·span ≤ 1e-6 rad. The resonant form then differs
 * from the exact solution by O((|ω − ω0|·span)²), and the beat form would lose digits to cancellation.
 */
export function isResonantDrive(omega: number, omega0: number, span: number): boolean {
  return Math.abs(omega - omega0) * span <= 1e-6;
}

/**
 * L q'' + q/C = E0 sin(ω0 t + θ) with ω0 = 1/√(LC): no steady periodic part; the particular solution
 * q_p = −E0 t cos(ω0 t + θ) / (2 L ω0) grows linearly with t. With θ = 0 and q0 = i0 = 0 the sum is the
 * textbook q = E0 / (2 L ω0²) (sin ω0 t − ω0 t cos ω0 t) (Boyce and DiPrima, Elementary Differential
 * Equations, section on forced vibrations, resonance; from memory).
 */
function resonantSolution(p: RlcParameters, source: { E0: number; omega: number; theta: number }): AnalyticSolution {
  const { E0, theta } = source;
  const w0 = 1 / Math.sqrt(p.L * p.C);
  const k = -E0 / (2 * p.L * w0);
  const qp = (t: number) => k * t * Math.cos(w0 * t + theta);
  const ip = (t: number) => k * (Math.cos(w0 * t + theta) - w0 * t * Math.sin(w0 * t + theta));
  const A = p.q0 - qp(0);
  const B = (p.i0 - ip(0)) / w0;
  return {
    q: (t) => A * Math.cos(w0 * t) + B * Math.sin(w0 * t) + qp(t),
    i: (t) => w0 * (B * Math.cos(w0 * t) - A * Math.sin(w0 * t)) + ip(t),
    dampingCase: 'undamped',
    resonant: true,
  };
}

export function analyticSolution(p: RlcParameters, source: SourceForm, span = Infinity): AnalyticSolution {
  const { R, L, C } = p;
  const { alpha, omega0, dampingCase } = dampingOf(p);
  let qSteady: (t: number) => number;
  let iSteady: (t: number) => number;
  if (source.kind === 'constant') {
    qSteady = () => C * source.E0;
    iSteady = () => 0;
  } else {
    const { E0, omega: w, theta } = source;
    if (R === 0 && isResonantDrive(w, omega0, span)) return resonantSolution(p, { E0, omega: w, theta });
    const S = w * L - 1 / (w * C);
    const Z = Math.hypot(R, S);
    const phi = Math.atan2(S, R);
    iSteady = (t) => (E0 / Z) * Math.sin(w * t + theta - phi);
    qSteady = (t) => (-E0 / (Z * w)) * Math.cos(w * t + theta - phi);
  }
  const Q0 = p.q0 - qSteady(0);
  const I0 = p.i0 - iSteady(0);
  let qc: (t: number) => number;
  let ic: (t: number) => number;
  if (dampingCase === 'overdamped') {
    const root = Math.sqrt(alpha * alpha - omega0 * omega0);
    const r1 = -alpha + root;
    const r2 = -alpha - root;
    const A = (I0 - r2 * Q0) / (r1 - r2);
    const B = Q0 - A;
    qc = (t) => A * Math.exp(r1 * t) + B * Math.exp(r2 * t);
    ic = (t) => A * r1 * Math.exp(r1 * t) + B * r2 * Math.exp(r2 * t);
  } else if (dampingCase === 'critically damped') {
    const A = Q0;
    const B = I0 + alpha * Q0;
    qc = (t) => (A + B * t) * Math.exp(-alpha * t);
    ic = (t) => (B - alpha * (A + B * t)) * Math.exp(-alpha * t);
  } else {
    const wd = Math.sqrt(omega0 * omega0 - alpha * alpha);
    const A = Q0;
    const B = (I0 + alpha * Q0) / wd;
    qc = (t) => Math.exp(-alpha * t) * (A * Math.cos(wd * t) + B * Math.sin(wd * t));
    ic = (t) => Math.exp(-alpha * t) * ((B * wd - alpha * A) * Math.cos(wd * t) - (A * wd + alpha * B) * Math.sin(wd * t));
  }
  return { q: (t) => qc(t) + qSteady(t), i: (t) => ic(t) + iSteady(t), qSteady, iSteady, dampingCase };
}

/** A local extremum of a waveform (or an end of the span), found by root-finding its slope. */
export interface Extremum {
  t: number;
  value: number;
}

export interface NumericSolution {
  t: number[];
  q: number[];
  i: number[];
  steps: number;
  evaluations: number;
  /** The ends of the solver's steps, from 0 to the span: a grid fine enough to bracket every extremum. */
  grid: number[];
  /**
   * Extrema of i (di/dt = (E − R i − q/C)/L = 0) and of q (dq/dt = i = 0) from the dense output, with the
   * values at the two ends of the span, in time order; only when asked for (`extrema`).
   */
  currentExtrema?: Extremum[];
  chargeExtrema?: Extremum[];
}

const SUBDIVISIONS = 16;

/**
 * Local extrema of value(t) on (a, b]: the slope is sampled at SUBDIVISIONS points, and each change of
 * sign is bisected to the last representable time. A zero slope at a sample counts once (at its right end).
 */
export function extremaIn(a: number, b: number, value: (t: number) => number, slope: (t: number) => number, out: Extremum[]): void {
  let t0 = a;
  let s0 = slope(a);
  for (let k = 1; k <= SUBDIVISIONS; k++) {
    const t1 = k === SUBDIVISIONS ? b : a + ((b - a) * k) / SUBDIVISIONS;
    const s1 = slope(t1);
    if (s0 !== 0 && s1 !== 0 && Math.sign(s0) !== Math.sign(s1)) {
      let lo = t0;
      let hi = t1;
      let slo = s0;
      for (let n = 0; n < 200; n++) {
        const mid = lo + (hi - lo) / 2;
        if (mid <= lo || mid >= hi) break;
        const sm = slope(mid);
        if (sm === 0) {
          lo = hi = mid;
          break;
        }
        if (Math.sign(sm) === Math.sign(slo)) {
          lo = mid;
          slo = sm;
        } else hi = mid;
      }
      const vlo = value(lo);
      const vhi = value(hi);
      out.push(Math.abs(vlo) >= Math.abs(vhi) ? { t: lo, value: vlo } : { t: hi, value: vhi });
    } else if (s1 === 0) {
      out.push({ t: t1, value: value(t1) });
    }
    t0 = t1;
    s0 = s1;
  }
}

/** Extrema over the whole span on a grid of step ends, with the values at the two ends of the span. */
export function extremaOnGrid(grid: number[], value: (t: number) => number, slope: (t: number) => number): Extremum[] {
  const points: Extremum[] = [{ t: grid[0], value: value(grid[0]) }];
  for (let k = 1; k < grid.length; k++) extremaIn(grid[k - 1], grid[k], value, slope, points);
  const end = grid[grid.length - 1];
  points.push({ t: end, value: value(end) });
  return points;
}

/** The largest value, the smallest value, and the largest magnitude (with its sign) among extrema. */
export function summarise(points: Extremum[]): { max: Extremum; min: Extremum; peak: Extremum } {
  let [max, min, peak] = [points[0], points[0], points[0]];
  for (const p of points) {
    if (p.value > max.value) max = p;
    if (p.value < min.value) min = p;
    if (Math.abs(p.value) > Math.abs(peak.value)) peak = p;
  }
  return { max, min, peak };
}

/**
 * Solves the circuit numerically at `points` evenly spaced times over [0, span], recording the ends of
 * its steps; with `extrema`, also finds the extrema of i and q inside every step from the dense output
 * (where no closed form gives them). The solver's steps do not depend on `points`, so neither do the extrema.
 */
export function numericSolution(
  p: RlcParameters,
  E: (t: number) => number,
  span: number,
  points: number,
  options: { tolerance?: number; deadline?: number; extrema?: boolean } = {},
): NumericSolution {
  const { R, L, C } = p;
  // Scale charge so the solver's absolute tolerance means the same for µC and kC circuits.
  let Emax = 0;
  for (let k = 0; k <= 200; k++) Emax = Math.max(Emax, Math.abs(E((span * k) / 200)));
  const scale = Math.max(Math.abs(p.q0), Math.abs(p.i0) * span, C * Emax, 1e-300);
  const solver = new Solver(2);
  solver.denseOutput = true;
  solver.absoluteTolerance = options.tolerance ?? 1e-12;
  solver.relativeTolerance = options.tolerance ?? 1e-12;
  solver.maxSteps = 1_000_000;
  solver.initialStepSize = span / 1000;
  const t = Array.from({ length: points }, (_, k) => (span * k) / (points - 1));
  const q = new Array<number>(points);
  const i = new Array<number>(points);
  const grid: number[] = [0];
  const iPoints: Extremum[] = [{ t: 0, value: p.i0 }];
  const qPoints: Extremum[] = [{ t: 0, value: p.q0 }];
  let next = 0;
  let evaluations = 0;
  const f = (x: number, y: number[]) => {
    evaluations++;
    if (options.deadline !== undefined && (evaluations & 1023) === 0 && Date.now() > options.deadline)
      throw new Error('the transient took longer than the time allowed for an evaluation');
    return [y[1], (E(x) / scale - R * y[1] - y[0] / C) / L];
  };
  let last = { q: p.q0, i: p.i0 };
  const out = solver.solve(
    f,
    0,
    [p.q0 / scale, p.i0 / scale],
    span,
    (_n: number, x0: number, x1: number, y: number[], dense?: (c: number, x: number) => number) => {
      if (dense && x1 > x0) {
        if (options.extrema) {
          const qAt = (x: number) => dense(0, x) * scale;
          const iAt = (x: number) => dense(1, x) * scale;
          extremaIn(x0, x1, iAt, (x) => E(x) - R * iAt(x) - qAt(x) / C, iPoints);
          extremaIn(x0, x1, qAt, iAt, qPoints);
        }
        grid.push(x1);
      }
      while (next < points && t[next] <= x1 + 1e-15 * span) {
        const tk = Math.min(t[next], x1);
        if (dense && x1 > x0) {
          q[next] = dense(0, tk) * scale;
          i[next] = dense(1, tk) * scale;
        } else {
          q[next] = y[0] * scale;
          i[next] = y[1] * scale;
        }
        next++;
      }
      last = { q: y[0] * scale, i: y[1] * scale };
      return undefined;
    },
  );
  if (out.outcome !== 0) throw new Error('the numeric solver did not reach the end of the time span (the circuit may be too stiff for this span)');
  iPoints.push({ t: span, value: last.i });
  qPoints.push({ t: span, value: last.q });
  return { t, q, i, steps: out.nStep, evaluations: out.nEval, grid, ...(options.extrema ? { currentExtrema: iPoints, chargeExtrema: qPoints } : {}) };
}
