/**
 * A network's switching transient: from the steady state with every switch open, the time response of
 * node voltages and element currents as switches close, by a state-space model built from the table and
 * solved with odex (Hairer and Wanner's GBS extrapolation code, npm package odex) — the ODE package of
 * the transient cell.
 *
 * States: each capacitor's voltage and each inductive branch's current (inductors, and sources, supplies
 * and transformers with inductance). Given the states at a time, the rest of the network is resistive:
 * capacitors act as voltage sources and inductive branches as current sources, and one real linear solve
 * gives the node voltages, the capacitors' currents (dv/dt = i/C) and the inductances' voltages
 * (di/dt = (v − e − R·i)/L). At a node reached only through inductances, Kirchhoff's current law fixes
 * the sum of their currents, not a voltage; that node's equation is the law differentiated in time, which
 * gives the node's voltage. A loop of capacitors and ideal sources or switches with no resistance or
 * inductance has no state-space model (its currents at a switching instant are impulses) and is refused.
 *
 * Peaks are located from the solution: the extrema of every node voltage and element current inside each
 * of the solver's steps, where the slope (from the same linear solve, differentiated) changes sign.
 */
import { Solver } from 'odex';
import { checkDeadline } from '../language/deadline';
import { extremaIn, summarise, type Extremum } from '../circuits/transient';
import { harmonicFlow, prepare } from './ac';
import { SingularMatrixError, realLu, realSolve, type RealLu } from './lu';
import { Groups, NetworkError, describe, firstLoop, list, type Network, type NetworkElement, type SeriesBranch } from './model';

/** The most values (quantities × points) one transient keeps: 32 MB of samples. */
export const MAX_SAMPLES = 4_000_000;

export interface TransientOptions {
  span: number;
  points: number;
  /** Relative and absolute tolerance of the solver on scaled states. */
  tolerance?: number;
}

export interface Peaks {
  max: Extremum;
  min: Extremum;
  /** The largest magnitude, with its sign. */
  peak: Extremum;
}

export interface NetworkTransient {
  t: number[];
  /** Node voltages over t. */
  nodes: Record<string, number[]>;
  /** Element currents (from a to b) over t. */
  currents: Record<string, number[]>;
  nodePeaks: Record<string, Peaks>;
  currentPeaks: Record<string, Peaks>;
  /** The times switches close, within the span. */
  switchings: number[];
  steps: number;
}

type Role =
  | { type: 'resistor'; G: number }
  /** A capacitor: a voltage source of its state. */
  | { type: 'capacitor'; state: number; C: number; unknown: number }
  /** An inductive branch: a current source of its state. */
  | { type: 'inductive'; state: number; s: SeriesBranch }
  /** A source or transformer with no inductance, or a closed switch: V(a) − V(b) − R·I = e(t). */
  | { type: 'resistive-branch'; s: SeriesBranch; unknown: number }
  | { type: 'injection' }
  | { type: 'open' };

/** The resistive network of one stretch between switchings, factorised. */
interface Stretch {
  roles: Role[];
  /**
   * Each node's group row: the row (its group's lowest node) that holds the differentiated current law of a
   * group of nodes reached only through inductances; −1 in the reference's group.
   */
  groupRow: number[];
  lu: RealLu;
  size: number;
}

/** A branch's EMF e(t) = √2·|E|·cos(ω1·t + angle), or its derivative. */
function emf(s: SeriesBranch, omega1: number, t: number, order: 0 | 1): number {
  const amplitude = Math.SQRT2 * Math.hypot(s.E.re, s.E.im);
  if (amplitude === 0) return 0;
  const phase = omega1 * t + Math.atan2(s.E.im, s.E.re);
  return order === 0 ? amplitude * Math.cos(phase) : -amplitude * omega1 * Math.sin(phase);
}

/** An injection's current (from a to b) and its derivatives: Σ √2·I_h·cos(h·ω1·t + θ_h). */
function injection(el: Extract<NetworkElement, { kind: 'injection' }>, omega1: number, t: number, order: 0 | 1 | 2): number {
  let sum = 0;
  for (const line of el.spectrum) {
    const w = line.order * omega1;
    const phase = w * t + line.angle;
    const a = Math.SQRT2 * line.current;
    sum += order === 0 ? a * Math.cos(phase) : order === 1 ? -a * w * Math.sin(phase) : -a * w * w * Math.cos(phase);
  }
  return sum;
}

export function networkTransient(network: Network, options: TransientOptions): NetworkTransient {
  const { span, points } = options;
  if (!(Number.isFinite(span) && span > 0)) throw new NetworkError('the time span must be more than 0 s');
  const omega1 = 2 * Math.PI * network.frequency;
  const elements = network.elements;
  // The steady state before switching (every switch open): the phasors of every order, at t = 0.
  const before = prepare(network, { switchesClosed: false });
  const topology = before.topology;
  const flow = harmonicFlow(before);
  const nodeNames = topology.nodes;
  const nodeIndex = topology.nodeIndex;
  const nNodes = nodeNames.length;
  const series = before.series;

  // States, and their values at t = 0 from the steady state: Re(√2·Σ X_h).
  const stateOf = new Map<number, number>();
  const y0: number[] = [];
  const atZero = (name: string, what: 'voltage' | 'current') => flow.byOrder.reduce((acc, s) => acc + Math.SQRT2 * s.elements[name][what].re, 0);
  elements.forEach((el, k) => {
    if (el.kind === 'capacitor') {
      stateOf.set(k, y0.length);
      y0.push(atZero(el.name, 'voltage'));
    } else if (series[k] && series[k]!.L > 0) {
      stateOf.set(k, y0.length);
      y0.push(atZero(el.name, 'current'));
    }
  });
  const nStates = y0.length;
  if (!nStates) throw new NetworkError('the network has no capacitance or inductance, so it has no transient');
  // Scale: voltages by the largest voltage and currents by the largest current of the steady state (or 1).
  let vMax = 1;
  let iMax = 1e-3;
  for (const s of flow.byOrder) {
    for (const v of Object.values(s.nodes)) vMax = Math.max(vMax, Math.SQRT2 * Math.hypot(v.re, v.im));
    for (const e of Object.values(s.elements)) iMax = Math.max(iMax, Math.SQRT2 * Math.hypot(e.current.re, e.current.im));
  }
  const scale = new Float64Array(nStates);
  elements.forEach((el, k) => {
    const i = stateOf.get(k);
    if (i !== undefined) scale[i] = el.kind === 'capacitor' ? vMax : iMax;
  });

  const switchings = [...new Set(elements.flatMap((el) => (el.kind === 'switch' && el.closesAt < span ? [el.closesAt] : [])))].sort((a, b) => a - b);

  /** The resistive network while the switches closed by time `t` are closed. */
  const stretchAt = (t: number): Stretch => {
    const roles: Role[] = [];
    let size = nNodes;
    elements.forEach((el, k) => {
      const s = series[k];
      if (el.kind === 'resistor') roles.push({ type: 'resistor', G: 1 / el.R });
      else if (el.kind === 'capacitor') roles.push({ type: 'capacitor', state: stateOf.get(k)!, C: el.C, unknown: size++ });
      else if (el.kind === 'injection') roles.push({ type: 'injection' });
      else if (el.kind === 'switch') roles.push(el.closesAt <= t ? { type: 'resistive-branch', s: s!, unknown: size++ } : { type: 'open' });
      else if (s!.L > 0) roles.push({ type: 'inductive', state: stateOf.get(k)!, s: s! });
      else roles.push({ type: 'resistive-branch', s: s!, unknown: size++ });
    });
    // A loop of capacitors, ideal sources and closed switches (no resistance, no inductance) has no state-space model.
    const loop = firstLoop(elements, (_el, k) => {
      const role = roles[k];
      return role.type === 'capacitor' || (role.type === 'resistive-branch' && role.s.R === 0);
    });
    if (loop)
      throw new NetworkError(
        `${list(loop.map(describe))} form a loop of capacitors, ideal sources and closed switches with no resistance or inductance in it${t > 0 ? ` once the switches close at ${t} s` : ''}: ` +
          'its current at switching would be unbounded. Add the series inductance of the connection (a bank’s reactor, a cable) or a resistance.',
        loop[loop.length - 1].row,
      );
    // Groups of nodes joined by resistors, capacitors and resistive branches. A group without the reference
    // is reached only through inductances (and injections): its current law fixes the sum of their currents,
    // not a voltage, so one of its rows (its lowest node's) becomes that law differentiated in time.
    const ground = nNodes;
    const joined = new Groups(nNodes + 1);
    elements.forEach((el, k) => {
      const type = roles[k].type;
      if (type === 'resistor' || type === 'capacitor' || type === 'resistive-branch') joined.join(nodeIndex.get(el.a) ?? ground, nodeIndex.get(el.b) ?? ground);
    });
    const lowest = new Map<number, number>();
    for (let k = nNodes - 1; k >= 0; k--) lowest.set(joined.find(k), k);
    // Each node's group row: its group's lowest node; the reference's group has none (−1).
    const groupRow = nodeNames.map((_n, k) => (joined.find(k) === joined.find(ground) ? -1 : lowest.get(joined.find(k))!));
    const differentiated = (row: number) => groupRow[row] === row;
    const a = new Float64Array(size * size);
    const at = (name: string) => nodeIndex.get(name) ?? -1;
    elements.forEach((el, k) => {
      const role = roles[k];
      const p = at(el.a);
      const q = at(el.b);
      if (role.type === 'resistor') {
        for (const [r, c, g] of [
          [p, p, role.G],
          [q, q, role.G],
          [p, q, -role.G],
          [q, p, -role.G],
        ] as const)
          if (r >= 0 && c >= 0 && !differentiated(r)) a[r * size + c] += g;
      } else if (role.type === 'capacitor' || role.type === 'resistive-branch') {
        const m = role.unknown;
        if (p >= 0) {
          if (!differentiated(p)) a[p * size + m] += 1;
          a[m * size + p] += 1;
        }
        if (q >= 0) {
          if (!differentiated(q)) a[q * size + m] -= 1;
          a[m * size + q] -= 1;
        }
        if (role.type === 'resistive-branch') a[m * size + m] -= role.s.R;
      } else if (role.type === 'inductive') {
        // In a group's differentiated row: Σ ±(V(a) − V(b))/L over the branches that leave the group = Σ ±(e + R·i)/L + (the injections' derivative).
        const invL = 1 / role.s.L;
        const ga = p >= 0 ? groupRow[p] : -1;
        const gb = q >= 0 ? groupRow[q] : -1;
        if (ga === gb) return;
        for (const [r, sign] of [
          [ga, 1],
          [gb, -1],
        ] as const) {
          if (r < 0) continue;
          if (p >= 0) a[r * size + p] += sign * invL;
          if (q >= 0) a[r * size + q] -= sign * invL;
        }
      }
    });
    try {
      return { roles, groupRow, lu: realLu(size, a), size };
    } catch (err) {
      if (err instanceof SingularMatrixError) {
        const what = err.unknown < nNodes ? `node ${nodeNames[err.unknown]}` : 'a branch current';
        throw new NetworkError(
          `the switching transient has no unique solution${t > 0 ? ` after ${t} s` : ''} (at ${what}): a group of nodes reached only through ` +
            'inductances or injections, or a part of the network that floats',
        );
      }
      throw err;
    }
  };

  /**
   * Solves the resistive network for the states y (scaled) at time t; with `slope`, the same for the
   * derivatives (y being the derivatives of the states, the sources differentiated).
   */
  const solveAt = (st: Stretch, t: number, y: ArrayLike<number>, slope: boolean, out: Float64Array) => {
    const b = new Float64Array(st.size);
    const d: 0 | 1 = slope ? 1 : 0;
    const at = (name: string) => nodeIndex.get(name) ?? -1;
    elements.forEach((el, k) => {
      const role = st.roles[k];
      const p = at(el.a);
      const q = at(el.b);
      if (role.type === 'capacitor') b[role.unknown] = y[role.state] * scale[role.state];
      else if (role.type === 'resistive-branch') b[role.unknown] = emf(role.s, omega1, t, d);
      else if (role.type === 'inductive') {
        const i = y[role.state] * scale[role.state];
        // The branch current leaves a and enters b: on the right-hand side of the current law, −i at a, +i at b.
        if (p >= 0 && st.groupRow[p] !== p) b[p] -= i;
        if (q >= 0 && st.groupRow[q] !== q) b[q] += i;
        // A group's differentiated row: ±(e + R·i)/L for a branch that leaves the group (differentiated once more with the slope).
        const ga = p >= 0 ? st.groupRow[p] : -1;
        const gb = q >= 0 ? st.groupRow[q] : -1;
        if (ga !== gb) {
          const rhs = (emf(role.s, omega1, t, d) + role.s.R * i) / role.s.L;
          if (ga >= 0) b[ga] += rhs;
          if (gb >= 0) b[gb] -= rhs;
        }
      } else if (role.type === 'injection') {
        const e = el as Extract<NetworkElement, { kind: 'injection' }>;
        // Its current leaves a and enters b: in the current law of a node, and differentiated (once more with
        // the slope) in the row of a group it leaves or enters.
        const j = injection(e, omega1, t, d);
        if (p >= 0 && st.groupRow[p] !== p) b[p] -= j;
        if (q >= 0 && st.groupRow[q] !== q) b[q] += j;
        const ga = p >= 0 ? st.groupRow[p] : -1;
        const gb = q >= 0 ? st.groupRow[q] : -1;
        if (ga !== gb) {
          const jDot = injection(e, omega1, t, slope ? 2 : 1);
          if (ga >= 0) b[ga] -= jDot;
          if (gb >= 0) b[gb] += jDot;
        }
      }
    });
    return realSolve(st.lu, b, out);
  };

  /** The states' derivatives (scaled) from the solved network. */
  const derivatives = (st: Stretch, t: number, y: ArrayLike<number>, z: Float64Array, out: number[]) => {
    const at = (name: string) => {
      const k = nodeIndex.get(name);
      return k === undefined ? 0 : z[k];
    };
    elements.forEach((el, k) => {
      const role = st.roles[k];
      if (role.type === 'capacitor') out[role.state] = z[role.unknown] / role.C / scale[role.state];
      else if (role.type === 'inductive') {
        const i = y[role.state] * scale[role.state];
        out[role.state] = (at(el.a) - at(el.b) - emf(role.s, omega1, t, 0) - role.s.R * i) / role.s.L / scale[role.state];
      }
    });
    return out;
  };

  const nOutputs = nNodes + elements.length;
  /** Node voltages, then element currents, from a solution z (or its derivative, with `slope` and y the states' derivatives). */
  const readOutputs = (st: Stretch, t: number, y: ArrayLike<number>, z: Float64Array, slope: boolean, out: Float64Array) => {
    for (let k = 0; k < nNodes; k++) out[k] = z[k];
    const v = (name: string) => {
      const k = nodeIndex.get(name);
      return k === undefined ? 0 : z[k];
    };
    elements.forEach((el, k) => {
      const role = st.roles[k];
      let i = 0;
      if (role.type === 'resistor') i = role.G * (v(el.a) - v(el.b));
      else if (role.type === 'capacitor' || role.type === 'resistive-branch') i = z[role.unknown];
      else if (role.type === 'inductive') i = y[role.state] * scale[role.state];
      else if (role.type === 'injection') i = injection(el as Extract<NetworkElement, { kind: 'injection' }>, omega1, t, slope ? 1 : 0);
      out[nNodes + k] = i;
    });
    return out;
  };

  if (nOutputs * points > MAX_SAMPLES)
    throw new NetworkError(
      `the transient would keep ${nOutputs} quantities at ${points} points, more than ${MAX_SAMPLES.toLocaleString('en')} values: ask for fewer points`,
    );
  const t = Array.from({ length: points }, (_, k) => (span * k) / (points - 1));
  const samples = Array.from({ length: nOutputs }, () => new Array<number>(points));
  const extrema: Extremum[][] = Array.from({ length: nOutputs }, () => []);
  const bounds = [0, ...switchings.filter((x) => x > 0), span];
  let y = y0.map((x, k) => x / scale[k]);
  let next = 0;
  let steps = 0;
  const tolerance = options.tolerance ?? 1e-10;

  for (let segment = 0; segment + 1 < bounds.length; segment++) {
    const t0 = bounds[segment];
    const t1 = bounds[segment + 1];
    const st = stretchAt(t0);
    const z = new Float64Array(st.size);
    const zDot = new Float64Array(st.size);
    const f = (x: number, state: number[]) => {
      checkDeadline();
      return derivatives(st, x, state, solveAt(st, x, state, false, z), new Array<number>(nStates));
    };
    /** Outputs and their slopes at time x from states `state`. */
    const evaluate = (x: number, state: number[]) => {
      const values = readOutputs(st, x, state, solveAt(st, x, state, false, z), false, new Float64Array(nOutputs));
      const rates = f(x, state);
      const slopes = readOutputs(st, x, rates, solveAt(st, x, rates, true, zDot), true, new Float64Array(nOutputs));
      return { values, slopes };
    };
    const first = evaluate(t0, y);
    for (let o = 0; o < nOutputs; o++) extrema[o].push({ t: t0, value: first.values[o] });
    const solver = new Solver(nStates);
    solver.denseOutput = true;
    solver.absoluteTolerance = tolerance;
    solver.relativeTolerance = tolerance;
    solver.maxSteps = 1_000_000;
    solver.initialStepSize = Math.min(t1 - t0, span / 1000);
    const result = solver.solve(f, t0, y, t1, (_n, x0, x1, state, dense) => {
      if (!dense || !(x1 > x0)) return;
      steps++;
      const at = (x: number) => {
        const s = new Array<number>(nStates);
        for (let c = 0; c < nStates; c++) s[c] = dense(c, x);
        return s;
      };
      const cache = new Map<number, { values: Float64Array; slopes: Float64Array }>();
      const point = (x: number) => {
        let hit = cache.get(x);
        if (!hit) cache.set(x, (hit = evaluate(x, at(x))));
        return hit;
      };
      for (let o = 0; o < nOutputs; o++)
        extremaIn(
          x0,
          x1,
          (x) => point(x).values[o],
          (x) => point(x).slopes[o],
          extrema[o],
        );
      while (next < points && t[next] <= x1 + 1e-15 * span) {
        const values = point(Math.max(x0, Math.min(t[next], x1))).values;
        for (let o = 0; o < nOutputs; o++) samples[o][next] = values[o];
        next++;
      }
    });
    if (result.outcome !== 0) throw new NetworkError('the solver did not reach the end of the time span (the network may be too stiff for this span)');
    y = result.y;
    const last = evaluate(t1, y);
    for (let o = 0; o < nOutputs; o++) extrema[o].push({ t: t1, value: last.values[o] });
  }
  while (next < points) {
    for (let o = 0; o < nOutputs; o++) samples[o][next] = samples[o][next - 1];
    next++;
  }

  const nodes: Record<string, number[]> = {};
  const nodePeaks: Record<string, Peaks> = {};
  nodeNames.forEach((name, k) => {
    nodes[name] = samples[k];
    nodePeaks[name] = summarise(extrema[k]);
  });
  const currents: Record<string, number[]> = {};
  const currentPeaks: Record<string, Peaks> = {};
  elements.forEach((el, k) => {
    currents[el.name] = samples[nNodes + k];
    currentPeaks[el.name] = summarise(extrema[nNodes + k]);
  });
  return { t, nodes, currents, nodePeaks, currentPeaks, switchings, steps };
}
