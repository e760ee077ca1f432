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
  /** The steady periodic (or constant) part, which remains when the transient has died away. */
  qSteady(t: number): number;
  iSteady(t: number): number;
  dampingCase: DampingCase;
}

export function dampingOf({ R, L, C }: Pick<RlcParameters, 'R' | 'L' | 'C'>): { alpha: number; omega0: number; dampingCase: DampingCase } {
  const alpha = R / (2 * L);
  const omega0 = 1 / Math.sqrt(L * C);
  const rel = (alpha - omega0) / omega0;
  const dampingCase: DampingCase = R === 0 ? 'undamped' : Math.abs(rel) <= 1e-9 ? 'critically damped' : alpha > omega0 ? 'overdamped' : 'underdamped';
  return { alpha, omega0, dampingCase };
}

export function analyticSolution(p: RlcParameters, source: SourceForm): AnalyticSolution {
  const { R, L, C } = p;
  const { alpha, omega0, dampingCase } = dampingOf(p);
  let qSteady: (t: number) => number;
  let iSteady: (t: number) => number;
  if (source.kind === 'constant') {
    qSteady = () => C * source.E0;
    iSteady = () => 0;
  } else {
    const { E0, omega: w, theta } = source;
    const S = w * L - 1 / (w * C);
    const Z = Math.hypot(R, S);
    if (Z === 0) throw new Error('the source drives an undamped circuit at its resonant frequency: the response grows without bound');
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

export interface NumericSolution {
  t: number[];
  q: number[];
  i: number[];
  steps: number;
  evaluations: number;
}

/** Solves the circuit numerically at `points` evenly spaced times over [0, span]. */
export function numericSolution(p: RlcParameters, E: (t: number) => number, span: number, points: number, options: { tolerance?: number; deadline?: number } = {}): NumericSolution {
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
  solver.initialStepSize = span / Math.max(points, 1000);
  const t = Array.from({ length: points }, (_, k) => (span * k) / (points - 1));
  const q = new Array<number>(points);
  const i = new Array<number>(points);
  let next = 0;
  let evaluations = 0;
  const f = (x: number, y: number[]) => {
    evaluations++;
    if (options.deadline !== undefined && (evaluations & 1023) === 0 && Date.now() > options.deadline) throw new Error('the transient took longer than the time allowed for an evaluation');
    return [y[1], (E(x) / scale - R * y[1] - y[0] / C) / L];
  };
  const out = solver.solve(f, 0, [p.q0 / scale, p.i0 / scale], span, (_n: number, x0: number, x1: number, y: number[], dense?: (c: number, x: number) => number) => {
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
    return undefined;
  });
  if (out.outcome !== 0) throw new Error('the numeric solver did not reach the end of the time span (the circuit may be too stiff for this span)');
  return { t, q, i, steps: out.nStep, evaluations: out.nEval };
}
