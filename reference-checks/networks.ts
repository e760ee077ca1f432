/**
 * Networks for the network cell's checks against ngspice: from a single branch to a three-level plant.
 * Their values are invented for the checks (realistic orders of magnitude, common practice); what is
 * checked is that the engine and ngspice solve the same network alike, not the values themselves.
 */
import type { Network, NetworkElement } from '../common/src/network/model';

const w1 = 2 * Math.PI * 50;
/** An element without its row: the rows are numbered in the order given. */
export type Values = NetworkElement extends infer E ? (E extends NetworkElement ? Omit<E, 'row'> : never) : never;
/** A 50 Hz network to `gnd` of these elements. */
export const network = (elements: Values[]): Network => ({
  reference: 'gnd',
  frequency: 50,
  elements: elements.map((e, k) => ({ ...e, row: k + 1 }) as NetworkElement),
});

/** A bank of Q (var, three-phase) at U (V, line to line) as its per-phase capacitance. */
const bank = (Q: number, U: number) => Q / (w1 * U * U);
/** The reactor that tunes a capacitance C to p (0.07 for 7 %) of its reactance at the fundamental. */
const detuning = (p: number, C: number) => p / (w1 * w1 * C);

/** A plant fed from its supply through a transformer, with an R–L load at its bus B. */
const FEED: Values[] = [
  { name: 'Grid', kind: 'supply', a: 'S', b: 'gnd', U: 11e3, Ssc: 500e6, xr: 15 },
  { name: 'T1', kind: 'transformer', a: 'S', b: 'B', S: 20e6, z: 0.1, xr: 20, U: 11e3 },
  { name: 'Rload', kind: 'resistor', a: 'B', b: 'm', R: 6 },
  { name: 'Lload', kind: 'inductor', a: 'm', b: 'gnd', L: 0.01 },
];

export const NETWORKS: Record<string, Network> = {
  'single series RLC': network([
    { name: 'V1', kind: 'source', a: 'n1', b: 'gnd', E: 230, angle: 0, R: 0, L: 0 },
    { name: 'R1', kind: 'resistor', a: 'n1', b: 'n2', R: 2 },
    { name: 'L1', kind: 'inductor', a: 'n2', b: 'n3', L: 0.02 },
    { name: 'C1', kind: 'capacitor', a: 'n3', b: 'gnd', C: 100e-6 },
  ]),
  'RC ladder': network([
    { name: 'V1', kind: 'source', a: 'n0', b: 'gnd', E: 100, angle: 0, R: 0.5, L: 0 },
    { name: 'R1', kind: 'resistor', a: 'n0', b: 'n1', R: 10 },
    { name: 'C1', kind: 'capacitor', a: 'n1', b: 'gnd', C: 10e-6 },
    { name: 'R2', kind: 'resistor', a: 'n1', b: 'n2', R: 10 },
    { name: 'C2', kind: 'capacitor', a: 'n2', b: 'gnd', C: 10e-6 },
    { name: 'R3', kind: 'resistor', a: 'n2', b: 'n3', R: 10 },
    { name: 'C3', kind: 'capacitor', a: 'n3', b: 'gnd', C: 10e-6 },
  ]),
  'bank against its supply': network([
    { name: 'Grid', kind: 'supply', a: 'B', b: 'gnd', U: 11e3, Ssc: 250e6, xr: 20 },
    { name: 'Bank', kind: 'capacitor', a: 'B', b: 'gnd', C: bank(3e6, 11e3) },
  ]),
  'supply, transformer, load and bank': network([...FEED, { name: 'Bank', kind: 'capacitor', a: 'B', b: 'gnd', C: 60e-6 }]),
  'detuned bank with a harmonic source': network([
    ...FEED,
    { name: 'Reactor', kind: 'inductor', a: 'B', b: 'k', L: detuning(0.07, 60e-6) },
    { name: 'Bank', kind: 'capacitor', a: 'k', b: 'gnd', C: 60e-6 },
    {
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
    },
  ]),
  'two feeders in parallel': network([
    { name: 'V1', kind: 'source', a: 'A', b: 'gnd', E: 230, angle: 0, R: 0.01, L: 50e-6 },
    { name: 'RF1', kind: 'resistor', a: 'A', b: 'f1', R: 0.05 },
    { name: 'LF1', kind: 'inductor', a: 'f1', b: 'B', L: 0.2e-3 },
    { name: 'RF2', kind: 'resistor', a: 'A', b: 'f2', R: 0.08 },
    { name: 'LF2', kind: 'inductor', a: 'f2', b: 'B', L: 0.15e-3 },
    { name: 'Rload', kind: 'resistor', a: 'B', b: 'gnd', R: 2 },
    { name: 'Cload', kind: 'capacitor', a: 'B', b: 'gnd', C: 200e-6 },
  ]),
  bridge: network([
    { name: 'V1', kind: 'source', a: 'n1', b: 'gnd', E: 10, angle: 0.2, R: 0, L: 0 },
    { name: 'R1', kind: 'resistor', a: 'n1', b: 'n2', R: 100 },
    { name: 'C1', kind: 'capacitor', a: 'n1', b: 'n3', C: 1e-6 },
    { name: 'L1', kind: 'inductor', a: 'n2', b: 'gnd', L: 0.1 },
    { name: 'R2', kind: 'resistor', a: 'n3', b: 'gnd', R: 220 },
    { name: 'R5', kind: 'resistor', a: 'n2', b: 'n3', R: 47 },
    { name: 'C2', kind: 'capacitor', a: 'n2', b: 'n3', C: 0.47e-6 },
  ]),
  'three-level plant with a transformer, a detuned bank and two harmonic sources': network([
    { name: 'Grid', kind: 'supply', a: 'G', b: 'gnd', U: 11e3, Ssc: 1000e6, xr: 12 },
    { name: 'T1', kind: 'transformer', a: 'G', b: 'M', S: 40e6, z: 0.12, xr: 25, U: 11e3 },
    { name: 'BankM', kind: 'capacitor', a: 'M', b: 'gnd', C: 150e-6 },
    { name: 'RloadM', kind: 'resistor', a: 'M', b: 'mm', R: 3 },
    { name: 'LloadM', kind: 'inductor', a: 'mm', b: 'gnd', L: 0.008 },
    { name: 'T2', kind: 'transformer', a: 'M', b: 'L', S: 2e6, z: 0.06, xr: 8, U: 11e3 },
    { name: 'ReactorL', kind: 'inductor', a: 'L', b: 'k1', L: detuning(0.07, 20e-6) },
    { name: 'RbankL', kind: 'resistor', a: 'k1', b: 'k2', R: 0.1 },
    { name: 'BankL', kind: 'capacitor', a: 'k2', b: 'gnd', C: 20e-6 },
    { name: 'RloadL', kind: 'resistor', a: 'L', b: 'gnd', R: 60 },
    {
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
    },
    {
      name: 'Drive',
      kind: 'injection',
      a: 'gnd',
      b: 'M',
      spectrum: [
        { order: 5, current: 30, angle: 0.7 },
        { order: 7, current: 18, angle: 0.2 },
      ],
    },
  ]),
  'source with internal impedance and a closed switch': network([
    { name: 'V1', kind: 'source', a: 'A', b: 'gnd', E: 1000, angle: 0, R: 0.2, L: 1e-3 },
    { name: 'S1', kind: 'switch', a: 'A', b: 'B', closesAt: 0 },
    { name: 'C1', kind: 'capacitor', a: 'B', b: 'gnd', C: 50e-6 },
    { name: 'R1', kind: 'resistor', a: 'B', b: 'gnd', R: 100 },
  ]),
  'mesh with two sources': network([
    { name: 'V1', kind: 'source', a: 'n1', b: 'gnd', E: 230, angle: 0, R: 0.1, L: 0 },
    { name: 'V2', kind: 'source', a: 'n4', b: 'gnd', E: 225, angle: -0.1, R: 0, L: 1e-3 },
    { name: 'R12', kind: 'resistor', a: 'n1', b: 'n2', R: 1 },
    { name: 'L23', kind: 'inductor', a: 'n2', b: 'n3', L: 5e-3 },
    { name: 'R34', kind: 'resistor', a: 'n3', b: 'n4', R: 2 },
    { name: 'C13', kind: 'capacitor', a: 'n1', b: 'n3', C: 100e-6 },
    { name: 'R2', kind: 'resistor', a: 'n2', b: 'gnd', R: 10 },
    { name: 'C3', kind: 'capacitor', a: 'n3', b: 'gnd', C: 20e-6 },
    { name: 'L24', kind: 'inductor', a: 'n2', b: 'n4', L: 2e-3 },
  ]),
  'injections only': network([
    {
      name: 'H',
      kind: 'injection',
      a: 'gnd',
      b: 'X',
      spectrum: [
        { order: 5, current: 10, angle: 0 },
        { order: 11, current: 3, angle: 1 },
      ],
    },
    { name: 'RX', kind: 'resistor', a: 'X', b: 'gnd', R: 5 },
    { name: 'CX', kind: 'capacitor', a: 'X', b: 'gnd', C: 50e-6 },
    { name: 'LXY', kind: 'inductor', a: 'X', b: 'Y', L: 0.03 },
    { name: 'RY', kind: 'resistor', a: 'Y', b: 'gnd', R: 2 },
  ]),
  'capacitor between two live nodes, source at an angle': network([
    { name: 'V1', kind: 'source', a: 'n1', b: 'gnd', E: 100, angle: 1.0, R: 1, L: 0 },
    { name: 'C12', kind: 'capacitor', a: 'n1', b: 'n2', C: 47e-6 },
    { name: 'R2', kind: 'resistor', a: 'n2', b: 'gnd', R: 15 },
    { name: 'L23', kind: 'inductor', a: 'n2', b: 'n3', L: 3e-3 },
    { name: 'C3', kind: 'capacitor', a: 'n3', b: 'gnd', C: 10e-6 },
    { name: 'R13', kind: 'resistor', a: 'n1', b: 'n3', R: 33 },
  ]),
  'twenty-node ladder': ladder(20, 7),
};

/** A ladder of `n` sections with values from a fixed seed: series R–L, shunt C and R, an injection halfway. */
function ladder(n: number, seed: number): Network {
  let s = seed;
  const random = () => ((s = (s * 1103515245 + 12345) % 2147483648) / 2147483648) * 0.9 + 0.1;
  const elements: Values[] = [];
  elements.push({ name: 'Grid', kind: 'supply', a: 'b0', b: 'gnd', U: 11e3, Ssc: 300e6, xr: 10 });
  for (let k = 1; k <= n; k++) {
    elements.push({ name: `R${k}`, kind: 'resistor', a: `b${k - 1}`, b: `m${k}`, R: 0.05 + random() });
    elements.push({ name: `L${k}`, kind: 'inductor', a: `m${k}`, b: `b${k}`, L: 1e-3 * random() });
    elements.push({ name: `C${k}`, kind: 'capacitor', a: `b${k}`, b: 'gnd', C: 20e-6 * random() });
    elements.push({ name: `G${k}`, kind: 'resistor', a: `b${k}`, b: 'gnd', R: 50 + 200 * random() });
  }
  elements.push({
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
  return network(elements);
}
