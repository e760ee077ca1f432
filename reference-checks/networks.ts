/**
 * Networks for the network cell's checks against ngspice: from a single branch to a three-level plant.
 * Their values are invented for the checks (realistic orders of magnitude, common practice); what is
 * checked is that the engine and ngspice solve the same network alike, not the values themselves.
 */
import type { Network, NetworkElement } from '../common/src/network/model';

const w1 = 2 * Math.PI * 50;
let rows = 0;
type Values = NetworkElement extends infer E ? (E extends NetworkElement ? Omit<E, 'row'> : never) : never;
const el = (e: Values): NetworkElement => ({ ...e, row: ++rows }) as NetworkElement;
const net = (elements: NetworkElement[]): Network => {
  rows = 0;
  return { reference: 'gnd', frequency: 50, elements };
};

/** A bank of Q (var, three-phase) at U (V, line to line) as its per-phase capacitance. */
const bank = (Q: number, U: number) => Q / (w1 * U * U);
/** The reactor that tunes a capacitance C to p (0.07 for 7 %) of its reactance at the fundamental. */
const detuning = (p: number, C: number) => p / (w1 * w1 * C);

export const NETWORKS: Record<string, Network> = {
  'single series RLC': net([
    el({ name: 'V1', kind: 'source', a: 'n1', b: 'gnd', E: 230, angle: 0, R: 0, L: 0 }),
    el({ name: 'R1', kind: 'resistor', a: 'n1', b: 'n2', R: 2 }),
    el({ name: 'L1', kind: 'inductor', a: 'n2', b: 'n3', L: 0.02 }),
    el({ name: 'C1', kind: 'capacitor', a: 'n3', b: 'gnd', C: 100e-6 }),
  ]),
  'RC ladder': net([
    el({ name: 'V1', kind: 'source', a: 'n0', b: 'gnd', E: 100, angle: 0, R: 0.5, L: 0 }),
    el({ name: 'R1', kind: 'resistor', a: 'n0', b: 'n1', R: 10 }),
    el({ name: 'C1', kind: 'capacitor', a: 'n1', b: 'gnd', C: 10e-6 }),
    el({ name: 'R2', kind: 'resistor', a: 'n1', b: 'n2', R: 10 }),
    el({ name: 'C2', kind: 'capacitor', a: 'n2', b: 'gnd', C: 10e-6 }),
    el({ name: 'R3', kind: 'resistor', a: 'n2', b: 'n3', R: 10 }),
    el({ name: 'C3', kind: 'capacitor', a: 'n3', b: 'gnd', C: 10e-6 }),
  ]),
  'bank against its supply': net([
    el({ name: 'Grid', kind: 'supply', a: 'B', b: 'gnd', U: 11e3, Ssc: 250e6, xr: 20 }),
    el({ name: 'Bank', kind: 'capacitor', a: 'B', b: 'gnd', C: bank(3e6, 11e3) }),
  ]),
  'supply, transformer, load and bank': net([
    el({ name: 'Grid', kind: 'supply', a: 'S', b: 'gnd', U: 11e3, Ssc: 500e6, xr: 15 }),
    el({ name: 'T1', kind: 'transformer', a: 'S', b: 'B', S: 20e6, z: 0.1, xr: 20, U: 11e3 }),
    el({ name: 'Rload', kind: 'resistor', a: 'B', b: 'm', R: 6 }),
    el({ name: 'Lload', kind: 'inductor', a: 'm', b: 'gnd', L: 0.01 }),
    el({ name: 'Bank', kind: 'capacitor', a: 'B', b: 'gnd', C: 60e-6 }),
  ]),
  'detuned bank with a harmonic source': net([
    el({ name: 'Grid', kind: 'supply', a: 'S', b: 'gnd', U: 11e3, Ssc: 500e6, xr: 15 }),
    el({ name: 'T1', kind: 'transformer', a: 'S', b: 'B', S: 20e6, z: 0.1, xr: 20, U: 11e3 }),
    el({ name: 'Rload', kind: 'resistor', a: 'B', b: 'm', R: 6 }),
    el({ name: 'Lload', kind: 'inductor', a: 'm', b: 'gnd', L: 0.01 }),
    el({ name: 'Reactor', kind: 'inductor', a: 'B', b: 'k', L: detuning(0.07, 60e-6) }),
    el({ name: 'Bank', kind: 'capacitor', a: 'k', b: 'gnd', C: 60e-6 }),
    el({
      name: 'Drive',
      kind: 'injection',
      a: 'gnd',
      b: 'B',
      spectrum: [
        { order: 1, current: 50, angle: -0.5 },
        { order: 5, current: 20, angle: 0.3 },
        { order: 7, current: 14, angle: -1.0 },
        { order: 11, current: 8, angle: 2.0 },
        { order: 13, current: 6, angle: 0 },
      ],
    }),
  ]),
  'two feeders in parallel': net([
    el({ name: 'V1', kind: 'source', a: 'A', b: 'gnd', E: 230, angle: 0, R: 0.01, L: 50e-6 }),
    el({ name: 'RF1', kind: 'resistor', a: 'A', b: 'f1', R: 0.05 }),
    el({ name: 'LF1', kind: 'inductor', a: 'f1', b: 'B', L: 0.2e-3 }),
    el({ name: 'RF2', kind: 'resistor', a: 'A', b: 'f2', R: 0.08 }),
    el({ name: 'LF2', kind: 'inductor', a: 'f2', b: 'B', L: 0.15e-3 }),
    el({ name: 'Rload', kind: 'resistor', a: 'B', b: 'gnd', R: 2 }),
    el({ name: 'Cload', kind: 'capacitor', a: 'B', b: 'gnd', C: 200e-6 }),
  ]),
  bridge: net([
    el({ name: 'V1', kind: 'source', a: 'n1', b: 'gnd', E: 10, angle: 0.2, R: 0, L: 0 }),
    el({ name: 'R1', kind: 'resistor', a: 'n1', b: 'n2', R: 100 }),
    el({ name: 'C1', kind: 'capacitor', a: 'n1', b: 'n3', C: 1e-6 }),
    el({ name: 'L1', kind: 'inductor', a: 'n2', b: 'gnd', L: 0.1 }),
    el({ name: 'R2', kind: 'resistor', a: 'n3', b: 'gnd', R: 220 }),
    el({ name: 'R5', kind: 'resistor', a: 'n2', b: 'n3', R: 47 }),
    el({ name: 'C2', kind: 'capacitor', a: 'n2', b: 'n3', C: 0.47e-6 }),
  ]),
  'three-level plant with a transformer, a detuned bank and two harmonic sources': net([
    el({ name: 'Grid', kind: 'supply', a: 'G', b: 'gnd', U: 11e3, Ssc: 1000e6, xr: 12 }),
    el({ name: 'T1', kind: 'transformer', a: 'G', b: 'M', S: 40e6, z: 0.12, xr: 25, U: 11e3 }),
    el({ name: 'BankM', kind: 'capacitor', a: 'M', b: 'gnd', C: 150e-6 }),
    el({ name: 'RloadM', kind: 'resistor', a: 'M', b: 'mm', R: 3 }),
    el({ name: 'LloadM', kind: 'inductor', a: 'mm', b: 'gnd', L: 0.008 }),
    el({ name: 'T2', kind: 'transformer', a: 'M', b: 'L', S: 2e6, z: 0.06, xr: 8, U: 11e3 }),
    el({ name: 'ReactorL', kind: 'inductor', a: 'L', b: 'k1', L: detuning(0.07, 20e-6) }),
    el({ name: 'RbankL', kind: 'resistor', a: 'k1', b: 'k2', R: 0.1 }),
    el({ name: 'BankL', kind: 'capacitor', a: 'k2', b: 'gnd', C: 20e-6 }),
    el({ name: 'RloadL', kind: 'resistor', a: 'L', b: 'gnd', R: 60 }),
    el({
      name: 'Rectifier',
      kind: 'injection',
      a: 'gnd',
      b: 'L',
      spectrum: [
        { order: 5, current: 12, angle: 0.1 },
        { order: 7, current: 8, angle: -0.4 },
        { order: 11, current: 5, angle: 1.1 },
        { order: 13, current: 4, angle: -2.0 },
      ],
    }),
    el({
      name: 'Drive',
      kind: 'injection',
      a: 'gnd',
      b: 'M',
      spectrum: [
        { order: 5, current: 30, angle: 0.7 },
        { order: 7, current: 18, angle: 0.2 },
      ],
    }),
  ]),
  'source with internal impedance and a closed switch': net([
    el({ name: 'V1', kind: 'source', a: 'A', b: 'gnd', E: 1000, angle: 0, R: 0.2, L: 1e-3 }),
    el({ name: 'S1', kind: 'switch', a: 'A', b: 'B', closesAt: 0 }),
    el({ name: 'C1', kind: 'capacitor', a: 'B', b: 'gnd', C: 50e-6 }),
    el({ name: 'R1', kind: 'resistor', a: 'B', b: 'gnd', R: 100 }),
  ]),
  'mesh with two sources': net([
    el({ name: 'V1', kind: 'source', a: 'n1', b: 'gnd', E: 230, angle: 0, R: 0.1, L: 0 }),
    el({ name: 'V2', kind: 'source', a: 'n4', b: 'gnd', E: 225, angle: -0.1, R: 0, L: 1e-3 }),
    el({ name: 'R12', kind: 'resistor', a: 'n1', b: 'n2', R: 1 }),
    el({ name: 'L23', kind: 'inductor', a: 'n2', b: 'n3', L: 5e-3 }),
    el({ name: 'R34', kind: 'resistor', a: 'n3', b: 'n4', R: 2 }),
    el({ name: 'C13', kind: 'capacitor', a: 'n1', b: 'n3', C: 100e-6 }),
    el({ name: 'R2', kind: 'resistor', a: 'n2', b: 'gnd', R: 10 }),
    el({ name: 'C3', kind: 'capacitor', a: 'n3', b: 'gnd', C: 20e-6 }),
    el({ name: 'L24', kind: 'inductor', a: 'n2', b: 'n4', L: 2e-3 }),
  ]),
  'injections only': net([
    el({
      name: 'H',
      kind: 'injection',
      a: 'gnd',
      b: 'X',
      spectrum: [
        { order: 5, current: 10, angle: 0 },
        { order: 11, current: 3, angle: 1 },
      ],
    }),
    el({ name: 'RX', kind: 'resistor', a: 'X', b: 'gnd', R: 5 }),
    el({ name: 'CX', kind: 'capacitor', a: 'X', b: 'gnd', C: 50e-6 }),
    el({ name: 'LXY', kind: 'inductor', a: 'X', b: 'Y', L: 0.03 }),
    el({ name: 'RY', kind: 'resistor', a: 'Y', b: 'gnd', R: 2 }),
  ]),
  'capacitor between two live nodes, source at an angle': net([
    el({ name: 'V1', kind: 'source', a: 'n1', b: 'gnd', E: 100, angle: 1.0, R: 1, L: 0 }),
    el({ name: 'C12', kind: 'capacitor', a: 'n1', b: 'n2', C: 47e-6 }),
    el({ name: 'R2', kind: 'resistor', a: 'n2', b: 'gnd', R: 15 }),
    el({ name: 'L23', kind: 'inductor', a: 'n2', b: 'n3', L: 3e-3 }),
    el({ name: 'C3', kind: 'capacitor', a: 'n3', b: 'gnd', C: 10e-6 }),
    el({ name: 'R13', kind: 'resistor', a: 'n1', b: 'n3', R: 33 }),
  ]),
  'twenty-node ladder': ladder(20, 7),
};

/** A ladder of `n` sections with values from a fixed seed: series R–L, shunt C and R, an injection halfway. */
export function ladder(n: number, seed: number): Network {
  let s = seed;
  const random = () => ((s = (s * 1103515245 + 12345) % 2147483648) / 2147483648) * 0.9 + 0.1;
  const elements: NetworkElement[] = [];
  const add = (e: Values) => elements.push({ ...e, row: elements.length + 1 } as NetworkElement);
  add({ name: 'Grid', kind: 'supply', a: 'b0', b: 'gnd', U: 11e3, Ssc: 300e6, xr: 10 });
  for (let k = 1; k <= n; k++) {
    add({ name: `R${k}`, kind: 'resistor', a: `b${k - 1}`, b: `m${k}`, R: 0.05 + random() });
    add({ name: `L${k}`, kind: 'inductor', a: `m${k}`, b: `b${k}`, L: 1e-3 * random() });
    add({ name: `C${k}`, kind: 'capacitor', a: `b${k}`, b: 'gnd', C: 20e-6 * random() });
    add({ name: `G${k}`, kind: 'resistor', a: `b${k}`, b: 'gnd', R: 50 + 200 * random() });
  }
  add({
    name: 'H',
    kind: 'injection',
    a: 'gnd',
    b: `b${Math.floor(n / 2)}`,
    spectrum: [
      { order: 1, current: 20, angle: -0.3 },
      { order: 5, current: 6, angle: 0.5 },
      { order: 7, current: 4, angle: -0.2 },
    ],
  });
  return { reference: 'gnd', frequency: 50, elements };
}
