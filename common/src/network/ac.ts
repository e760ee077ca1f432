/**
 * The network in the frequency domain, by modified nodal analysis with complex matrices: node voltages
 * and the currents of branch elements (inductors, sources, supplies, transformers, closed switches) as the
 * unknowns; resistors and capacitors stamped as admittances; injections on the right-hand side.
 * (Ho, Ruehli and Brennan, "The modified nodal approach to network analysis", IEEE Trans. Circuits and
 * Systems 22 (1975) 504–509; from memory.)
 *
 * Analyses: the steady state at one frequency; the driving-point impedance seen from a node over a range,
 * with its resonances located where the reactance changes sign; the harmonic flow of the injections'
 * spectra, with IEEE Std 519-2014's distortion of the voltage.
 */
import { checkDeadline } from '../language/deadline';
import { SingularMatrixError, complexLu, complexSolve, type ComplexLu } from './lu';
import { NetworkError, seriesBranch, topologyOf, type Network, type NetworkElement, type Topology } from './model';

export interface Complex {
  re: number;
  im: number;
}

const mul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const conj = (a: Complex): Complex => ({ re: a.re, im: -a.im });
const abs = (a: Complex) => Math.hypot(a.re, a.im);

/** A network ready to solve: its topology and each element's series model, computed once. */
export interface PreparedNetwork {
  network: Network;
  topology: Topology;
  series: (ReturnType<typeof seriesBranch> | null)[];
}

export function prepare(network: Network, options: { switchesClosed?: boolean } = {}): PreparedNetwork {
  const topology = topologyOf(network, options);
  return { network, topology, series: network.elements.map((el) => seriesBranch(el, network.frequency)) };
}

/** The nodal matrix at angular frequency ω, factorised; a singular one is refused with a sentence naming the unknown. */
function factorise(p: PreparedNetwork, omega: number): ComplexLu {
  checkDeadline();
  const { topology, network } = p;
  const n = topology.size;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  const node = (name: string) => topology.nodeIndex.get(name) ?? -1;
  const addAdmittance = (a: number, b: number, yr: number, yi: number) => {
    if (a >= 0) {
      re[a * n + a] += yr;
      im[a * n + a] += yi;
    }
    if (b >= 0) {
      re[b * n + b] += yr;
      im[b * n + b] += yi;
    }
    if (a >= 0 && b >= 0) {
      re[a * n + b] -= yr;
      im[a * n + b] -= yi;
      re[b * n + a] -= yr;
      im[b * n + a] -= yi;
    }
  };
  network.elements.forEach((el, k) => {
    const a = node(el.a);
    const b = node(el.b);
    if (el.kind === 'resistor') addAdmittance(a, b, 1 / el.R, 0);
    else if (el.kind === 'capacitor') addAdmittance(a, b, 0, omega * el.C);
    const m = topology.branchIndex.get(k);
    if (m === undefined) return;
    const s = p.series[k]!;
    // KCL: the branch current leaves a and enters b. Branch: V(a) − V(b) − (R + jωL)·I = E.
    if (a >= 0) {
      re[a * n + m] += 1;
      re[m * n + a] += 1;
    }
    if (b >= 0) {
      re[b * n + m] -= 1;
      re[m * n + b] -= 1;
    }
    re[m * n + m] -= s.R;
    im[m * n + m] -= omega * s.L;
  });
  try {
    return complexLu(n, re, im);
  } catch (err) {
    if (err instanceof SingularMatrixError) {
      const f = omega / (2 * Math.PI);
      throw new NetworkError(
        `the network has no unique solution at ${f.toPrecision(6)} Hz (at ${topology.unknownNames[err.unknown]}): ` +
          'an ideal loop of inductance and capacitance resonating exactly there, or a part of the network that floats',
      );
    }
    throw err;
  }
}

/** Right-hand side: the sources' EMFs (when `emf`) and the injections' currents at `order`. */
function rightHandSide(p: PreparedNetwork, { emf, order }: { emf: boolean; order: number | null }) {
  const { topology, network } = p;
  const n = topology.size;
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  network.elements.forEach((el, k) => {
    const m = topology.branchIndex.get(k);
    if (emf && m !== undefined) {
      re[m] += p.series[k]!.E.re;
      im[m] += p.series[k]!.E.im;
    }
    if (el.kind === 'injection' && order !== null) {
      const line = el.spectrum.find((l) => l.order === order);
      if (!line) return;
      const jr = line.current * Math.cos(line.angle);
      const ji = line.current * Math.sin(line.angle);
      // The injection's current leaves a and enters b through the rest of the network.
      const a = topology.nodeIndex.get(el.a);
      const b = topology.nodeIndex.get(el.b);
      if (a !== undefined) {
        re[a] -= jr;
        im[a] -= ji;
      }
      if (b !== undefined) {
        re[b] += jr;
        im[b] += ji;
      }
    }
  });
  return { re, im };
}

export interface ElementState {
  /** V(a) − V(b). */
  voltage: Complex;
  /** From a to b through the element. */
  current: Complex;
  /** V·I*: what the element absorbs. */
  power: Complex;
}

export interface Solution {
  frequency: number;
  nodes: Record<string, Complex>;
  elements: Record<string, ElementState>;
}

/** Node voltages and element states from the unknowns. */
function readSolution(p: PreparedNetwork, x: { re: Float64Array; im: Float64Array }, omega: number, order: number | null): Solution {
  const { topology, network } = p;
  const v = (name: string): Complex => {
    const k = topology.nodeIndex.get(name);
    return k === undefined ? { re: 0, im: 0 } : { re: x.re[k], im: x.im[k] };
  };
  const nodes: Record<string, Complex> = {};
  for (const name of topology.nodes) nodes[name] = v(name);
  const elements: Record<string, ElementState> = {};
  network.elements.forEach((el: NetworkElement, k) => {
    const va = v(el.a);
    const vb = v(el.b);
    const voltage = { re: va.re - vb.re, im: va.im - vb.im };
    let current: Complex;
    const m = topology.branchIndex.get(k);
    if (m !== undefined) current = { re: x.re[m], im: x.im[m] };
    else if (el.kind === 'resistor') current = { re: voltage.re / el.R, im: voltage.im / el.R };
    else if (el.kind === 'capacitor') current = mul({ re: 0, im: omega * el.C }, voltage);
    else if (el.kind === 'injection') {
      const line = order === null ? undefined : el.spectrum.find((l) => l.order === order);
      current = line ? { re: line.current * Math.cos(line.angle), im: line.current * Math.sin(line.angle) } : { re: 0, im: 0 };
    } else current = { re: 0, im: 0 }; // an open switch
    elements[el.name] = { voltage, current, power: mul(voltage, conj(current)) };
  });
  return { frequency: omega / (2 * Math.PI), nodes, elements };
}

/** The steady state at `frequency` (the fundamental when not given): sources and the injections' fundamentals. */
export function steadyState(p: PreparedNetwork, frequency = p.network.frequency): Solution {
  const omega = 2 * Math.PI * frequency;
  const atFundamental = Math.abs(frequency - p.network.frequency) <= 1e-12 * p.network.frequency;
  const lu = factorise(p, omega);
  const rhs = rightHandSide(p, { emf: true, order: atFundamental ? 1 : null });
  const x = complexSolve(lu, rhs.re, rhs.im);
  return readSolution(p, x, omega, atFundamental ? 1 : null);
}

/** The impedance seen from `node` to the reference at `frequency`, with sources shorted and injections open. */
export function drivingPointImpedance(p: PreparedNetwork, node: string, frequency: number): Complex {
  const k = p.topology.nodeIndex.get(node);
  if (k === undefined) throw new NetworkError(`the network has no node ${node} to look into`);
  const lu = factorise(p, 2 * Math.PI * frequency);
  const n = p.topology.size;
  const bRe = new Float64Array(n);
  bRe[k] = 1;
  const x = complexSolve(lu, bRe, new Float64Array(n));
  return { re: x.re[k], im: x.im[k] };
}

export interface Resonance {
  /** Parallel: |Z| peaks (the reactance falls through zero); series: |Z| dips (it rises through zero). */
  type: 'parallel' | 'series';
  frequency: number;
  /** frequency / fundamental. */
  order: number;
  impedance: Complex;
}

export interface Scan {
  node: string;
  frequencies: number[];
  impedances: Complex[];
  resonances: Resonance[];
}

/**
 * The driving-point impedance over `frequencies` (ascending), and its resonances: every change of sign of
 * the reactance between two points of the scan, located by bisection to 1e-12 of the frequency (a sign
 * change through a pole, as in a lossless parallel resonance, is located the same way).
 */
export function frequencyScan(p: PreparedNetwork, node: string, frequencies: number[]): Scan {
  /**
   * Ideal branches resonating exactly at f (two tuned L–C branches in parallel, say) leave a circulating
   * current undetermined there, though the impedance seen from the node is not: it is taken a part in 1e9 to
   * either side, where the network has one solution.
   */
  const drivingPoint = (f: number): Complex => {
    try {
      return drivingPointImpedance(p, node, f);
    } catch (err) {
      if (!(err instanceof NetworkError)) throw err;
      const below = drivingPointImpedance(p, node, f * (1 - 1e-9));
      const above = drivingPointImpedance(p, node, f * (1 + 1e-9));
      return { re: (below.re + above.re) / 2, im: (below.im + above.im) / 2 };
    }
  };
  const impedances: Complex[] = [];
  for (let k = 0; k < frequencies.length; k++) impedances.push(drivingPoint(frequencies[k]));
  const resonances: Resonance[] = [];
  const f1 = p.network.frequency;
  const reactive = (z: Complex) => Math.abs(z.im) > 1e-12 * abs(z);
  for (let k = 1; k < frequencies.length; k++) {
    const z0 = impedances[k - 1];
    const z1 = impedances[k];
    if (!reactive(z0) || !reactive(z1) || Math.sign(z0.im) === Math.sign(z1.im)) continue;
    let lo = frequencies[k - 1];
    let hi = frequencies[k];
    const rising = z0.im < 0;
    for (let it = 0; it < 200 && hi - lo > 1e-12 * hi; it++) {
      const mid = Math.sqrt(lo * hi);
      if (mid <= lo || mid >= hi) break;
      const zm = drivingPoint(mid);
      if (zm.im === 0) {
        lo = hi = mid;
        break;
      }
      if (zm.im < 0 === rising) lo = mid;
      else hi = mid;
    }
    const f = Math.sqrt(lo * hi);
    resonances.push({ type: rising ? 'series' : 'parallel', frequency: f, order: f / f1, impedance: drivingPoint(f) });
  }
  return { node, frequencies, impedances, resonances };
}

export interface NodeDistortion {
  /** rms voltage of each order present, by order. */
  voltages: Record<number, Complex>;
  /** The fundamental's rms magnitude. */
  fundamental: number;
  /** |V_h| / |V_1| for each harmonic order (h ≥ 2); null where there is no fundamental. */
  individual: Record<number, number | null>;
  /** √(Σ_{h≥2} |V_h|²) / |V_1| (IEEE Std 519-2014, 3.1, total harmonic distortion); null without a fundamental. */
  thd: number | null;
  /** √(Σ |V_h|²) over all orders. */
  rms: number;
}

export interface ElementDuty {
  currents: Record<number, Complex>;
  voltages: Record<number, Complex>;
  /** √(Σ |I_h|²). */
  rmsCurrent: number;
  /** √(Σ |V_h|²). */
  rmsVoltage: number;
  /** √2 · Σ |V_h|: the highest the voltage can reach when every order peaks together. */
  peakVoltage: number;
  /** Σ Im(V_h·I_h*): the reactive power of all orders. */
  reactivePower: number;
}

export interface HarmonicFlow {
  orders: number[];
  byOrder: Solution[];
  nodes: Record<string, NodeDistortion>;
  elements: Record<string, ElementDuty>;
}

/**
 * The harmonic flow: the network solved at every order any injection gives, and at the fundamental (the
 * sources' EMFs with the injections' fundamentals); sources are their impedances at the harmonics. Per
 * node the distortion of the voltage, per element its rms current and voltage with all orders.
 */
export function harmonicFlow(p: PreparedNetwork): HarmonicFlow {
  const orderSet = new Set<number>([1]);
  for (const el of p.network.elements) if (el.kind === 'injection') for (const line of el.spectrum) orderSet.add(line.order);
  const orders = [...orderSet].sort((a, b) => a - b);
  const f1 = p.network.frequency;
  const byOrder = orders.map((h) => {
    const omega = 2 * Math.PI * h * f1;
    const lu = factorise(p, omega);
    const rhs = rightHandSide(p, { emf: h === 1, order: h });
    return readSolution(p, complexSolve(lu, rhs.re, rhs.im), omega, h);
  });
  const nodes: Record<string, NodeDistortion> = {};
  for (const name of p.topology.nodes) {
    const voltages: Record<number, Complex> = {};
    orders.forEach((h, k) => (voltages[h] = byOrder[k].nodes[name]));
    const fundamental = abs(voltages[1]);
    let sum = 0;
    const individual: Record<number, number | null> = {};
    for (const h of orders) {
      if (h === 1) continue;
      const m = abs(voltages[h]);
      sum += m * m;
      individual[h] = fundamental > 0 ? m / fundamental : null;
    }
    nodes[name] = {
      voltages,
      fundamental,
      individual,
      thd: fundamental > 0 ? Math.sqrt(sum) / fundamental : null,
      rms: Math.sqrt(sum + fundamental * fundamental),
    };
  }
  const elements: Record<string, ElementDuty> = {};
  for (const el of p.network.elements) {
    const currents: Record<number, Complex> = {};
    const voltages: Record<number, Complex> = {};
    let i2 = 0;
    let v2 = 0;
    let vSum = 0;
    let q = 0;
    orders.forEach((h, k) => {
      const s = byOrder[k].elements[el.name];
      currents[h] = s.current;
      voltages[h] = s.voltage;
      i2 += abs(s.current) ** 2;
      const vm = abs(s.voltage);
      v2 += vm * vm;
      vSum += vm;
      q += s.power.im;
    });
    elements[el.name] = { currents, voltages, rmsCurrent: Math.sqrt(i2), rmsVoltage: Math.sqrt(v2), peakVoltage: Math.SQRT2 * vSum, reactivePower: q };
  }
  return { orders, byOrder, nodes, elements };
}
