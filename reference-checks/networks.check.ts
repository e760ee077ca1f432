/**
 * The network cell's nodal analysis against ngspice 39 (Debian's ngspice, a general-purpose circuit
 * simulator): each network of networks.ts is written as a deck for ngspice and solved by its AC analysis
 * at every harmonic order the network has (several frequencies), and probed with 1 A at a node for its
 * driving-point impedance. Node voltages and branch currents agree within 1e-6 relative (with a floor of
 * 1e-9 of the largest value of the solution, for values that are zero in one and rounding in the other).
 */
import { describe, expect, it } from 'vitest';
import { evaluateSheet } from '../common/src/index';
import { drivingPointImpedance, frequencyScan, harmonicFlow, prepare, steadyState, type Complex } from '../common/src/network/ac';
import { ngspiceAc } from './ngspice';
import { NETWORKS } from './networks';

const abs = (z: Complex) => Math.hypot(z.re, z.im);

function expectClose(engine: Record<string, Complex>, oracle: Record<string, Complex>, what: string) {
  const names = Object.keys(oracle);
  expect(names.length).toBeGreaterThan(0);
  const largest = Math.max(...names.map((n) => abs(oracle[n])));
  for (const name of names) {
    const a = engine[name];
    const b = oracle[name];
    const error = Math.hypot(a.re - b.re, a.im - b.im);
    const allowed = 1e-6 * abs(b) + 1e-9 * largest;
    if (!(error <= allowed)) throw new Error(`${what} ${name}: engine ${a.re} + j${a.im}, ngspice ${b.re} + j${b.im} (error ${error}, allowed ${allowed})`);
  }
}

describe('the network cell against ngspice 39 (AC analysis)', () => {
  const names = Object.keys(NETWORKS);
  it('has at least twelve networks, from a single branch to a three-level plant', () => {
    expect(names.length).toBeGreaterThanOrEqual(12);
  });

  for (const [name, network] of Object.entries(NETWORKS)) {
    it(`${name}: node voltages and branch currents at every order, within 1e-6`, () => {
      const p = prepare(network);
      const flow = harmonicFlow(p);
      for (const [k, order] of flow.orders.entries()) {
        const oracle = ngspiceAc(network, order * network.frequency, { kind: 'order', order });
        const solution = flow.byOrder[k];
        expectClose(solution.nodes, oracle.nodes, `order ${order}, node`);
        const currents = Object.fromEntries(Object.keys(oracle.currents).map((n) => [n, solution.elements[n].current]));
        expectClose(currents, oracle.currents, `order ${order}, current of`);
      }
    });

    it(`${name}: driving-point impedance at 3 frequencies, within 1e-6`, () => {
      const p = prepare(network);
      const probe = p.topology.nodes[p.topology.nodes.length - 1];
      for (const f of [37, 50 * 5.3, 2900]) {
        const z = drivingPointImpedance(p, probe, f);
        const oracle = ngspiceAc(network, f, { kind: 'probe', node: probe });
        expectClose({ z }, { z: oracle.nodes[probe] }, `${f} Hz, impedance at`);
      }
    });
  }
});

describe('the network cell against hand formulas', () => {
  it('a series RLC written as a network gives the current E/Z of the series-RLC impedance to 1e-12 (Z = R + j(ωL − 1/(ωC)), any circuit-theory text; from memory)', () => {
    const network = NETWORKS['single series RLC'];
    for (const f of [20, 50, 112.54, 400]) {
      const s = steadyState(prepare(network), f);
      const w = 2 * Math.PI * f;
      const z = { re: 2, im: w * 0.02 - 1 / (w * 100e-6) };
      const d = z.re * z.re + z.im * z.im;
      const expected = { re: (230 * z.re) / d, im: (-230 * z.im) / d };
      const i = s.elements.R1.current;
      expect(Math.hypot(i.re - expected.re, i.im - expected.im) / abs(expected)).toBeLessThan(1e-12);
    }
  });

  it('a series RLC written as a network has the impedance of the engine’s impedance_RLC to 1e-12 (E over the current it draws)', () => {
    const network = NETWORKS['single series RLC'];
    for (const f of [20, 50, 112.54, 400]) {
      const calc = evaluateSheet({ cells: [{ kind: 'calc', source: `Z = impedance_RLC(2 ohm, 20 mH, 100 uF, ${f} Hz)` }] }).cells[0] as {
        values: Record<string, { si: { re: number; im: number } }>;
      };
      const zCell = calc.values.Z.si;
      const i = steadyState(prepare(network), f).elements.R1.current;
      const d = i.re * i.re + i.im * i.im;
      const z = { re: (230 * i.re) / d, im: (-230 * i.im) / d };
      expect(Math.hypot(z.re - zCell.re, z.im - zCell.im) / Math.hypot(zCell.re, zCell.im)).toBeLessThan(1e-12);
    }
  });

  it('a bank against its supply resonates at h = √(S_sc / Q_c) within the scan step (IEEE Std 1036, the estimate of the parallel resonance; from memory)', () => {
    const network = NETWORKS['bank against its supply'];
    const points = 2000;
    const frequencies = Array.from({ length: points }, (_, k) => 50 * Math.pow(50, k / (points - 1)));
    const step = Math.pow(50, 1 / (points - 1)) - 1;
    const scan = frequencyScan(prepare(network), 'B', frequencies);
    const parallel = scan.resonances.filter((r) => r.type === 'parallel');
    expect(parallel).toHaveLength(1);
    const h = Math.sqrt(250e6 / 3e6);
    expect(Math.abs(parallel[0].order - h) / h).toBeLessThan(step);
    // At the resonance the impedance is real and largest: no point of the scan is higher.
    expect(Math.abs(parallel[0].impedance.im) / abs(parallel[0].impedance)).toBeLessThan(1e-6);
    expect(Math.max(...scan.impedances.map(abs))).toBeLessThanOrEqual(abs(parallel[0].impedance) * (1 + 1e-9));
  });

  it('a detuned bank makes a series resonance at the bus at its tuning order 1/√p (p = 7 %: h = 3.78; common practice for detuned banks)', () => {
    const network = NETWORKS['detuned bank with a harmonic source'];
    const frequencies = Array.from({ length: 500 }, (_, k) => 60 * Math.pow(20, k / 499));
    const bus = frequencyScan(prepare(network), 'B', frequencies).resonances.filter((r) => r.type === 'series');
    expect(bus).toHaveLength(1);
    expect(Math.abs(bus[0].order - 1 / Math.sqrt(0.07)) * Math.sqrt(0.07)).toBeLessThan(1e-9);
    expect(abs(bus[0].impedance)).toBeLessThan(1e-6);
  });
});
