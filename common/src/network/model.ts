/**
 * A network cell's network, in SI values: its elements between named nodes, one of them the reference
 * (ground). Per phase, positive sequence, single-phase equivalent. The conventions, stated on the cell and
 * in the package:
 * - Every element's voltage is V(a) − V(b) and its current flows from a to b through the element (the
 *   passive sign convention), so its complex power S = V·I* is what it absorbs: a source delivering power
 *   shows a negative S. rms phasors throughout.
 * - A source's EMF raises a over b: V(a) − V(b) = E + Z·I. An injection drives its current from a through
 *   itself into b (a load drawing harmonic current from bus X is an injection from the reference to X).
 * - A supply is a source of U/√3 behind Z = U²/S_sc; a transformer a series impedance Z = z·U²/S, both split
 *   into R and X by X/R at the fundamental and referred to U. Resistances do not change with frequency;
 *   reactances are ωL and 1/(ωC).
 * - Switches are closed in the steady state, the scans and the harmonic flows (the network after
 *   switching); a switching transient starts from the steady state with them open.
 */

export type ElementKind = 'resistor' | 'inductor' | 'capacitor' | 'source' | 'supply' | 'transformer' | 'injection' | 'switch';

export const ELEMENT_KINDS: readonly ElementKind[] = ['resistor', 'inductor', 'capacitor', 'source', 'supply', 'transformer', 'injection', 'switch'];

/** One line of an injection's spectrum: the harmonic order, the rms current and its angle (rad). */
export interface HarmonicLine {
  order: number;
  current: number;
  angle: number;
}

export type ElementValues =
  | { kind: 'resistor'; R: number }
  | { kind: 'inductor'; L: number }
  | { kind: 'capacitor'; C: number }
  /** E: rms EMF at the fundamental, angle in rad; R and L in series inside. */
  | { kind: 'source'; E: number; angle: number; R: number; L: number }
  /** U: line-to-line rms voltage; Ssc: three-phase short-circuit power; xr: X/R. */
  | { kind: 'supply'; U: number; Ssc: number; xr: number }
  /** S: rating; z: impedance as a fraction (0.06 for 6 %); xr: X/R; U: the line-to-line voltage it is referred to. */
  | { kind: 'transformer'; S: number; z: number; xr: number; U: number }
  | { kind: 'injection'; spectrum: HarmonicLine[] }
  /** closesAt: the time the switch closes in a transient. */
  | { kind: 'switch'; closesAt: number };

export type NetworkElement = ElementValues & {
  /** Its name (unique in the cell). */
  name: string;
  /** Its row in the cell's table, from 1, for messages. */
  row: number;
  a: string;
  b: string;
};

export interface Network {
  elements: NetworkElement[];
  /** The name of the reference node (ground). */
  reference: string;
  /** The fundamental frequency, Hz. */
  frequency: number;
}

/** A sentence about the network that names the row it is about. */
export class NetworkError extends Error {
  constructor(
    message: string,
    readonly row?: number,
  ) {
    super(message);
  }
}

/** An element's series R and L and its EMF (rms phasor at the fundamental), for those that carry a branch current. */
export interface SeriesBranch {
  R: number;
  L: number;
  E: { re: number; im: number };
}

/** R and L from |Z| and X/R, with X taken at the fundamental. */
function splitByXr(z: number, xr: number, omega1: number): { R: number; L: number } {
  const R = z / Math.sqrt(1 + xr * xr);
  return { R, L: (R * xr) / omega1 };
}

/** The series model of a branch element; null for those stamped as admittances (R, C) or as currents (injections). */
export function seriesBranch(el: NetworkElement, frequency: number): SeriesBranch | null {
  const omega1 = 2 * Math.PI * frequency;
  const none = { re: 0, im: 0 };
  switch (el.kind) {
    case 'inductor':
      return { R: 0, L: el.L, E: none };
    case 'switch':
      return { R: 0, L: 0, E: none };
    case 'source':
      return { R: el.R, L: el.L, E: { re: el.E * Math.cos(el.angle), im: el.E * Math.sin(el.angle) } };
    case 'supply':
      return { ...splitByXr((el.U * el.U) / el.Ssc, el.xr, omega1), E: { re: el.U / Math.sqrt(3), im: 0 } };
    case 'transformer':
      return { ...splitByXr((el.z * el.U * el.U) / el.S, el.xr, omega1), E: none };
    default:
      return null;
  }
}

const positive = (x: number) => Number.isFinite(x) && x > 0;
const nonNegative = (x: number) => Number.isFinite(x) && x >= 0;

/** The highest harmonic order an injection may give: IEEE Std 519-2014 (3.1) sums distortion to the 50th. */
export const MAX_ORDER = 50;
/** Elements in one network cell. */
export const MAX_ELEMENTS = 2000;
/** Unknowns (node voltages and branch currents) one network may have: a dense matrix of 1000² complex numbers is 16 MB. */
export const MAX_UNKNOWNS = 1000;

function checkValues(el: NetworkElement): void {
  const at = `row ${el.row} (${el.name})`;
  const need = (ok: boolean, what: string) => {
    if (!ok) throw new NetworkError(`${at}: ${what}`, el.row);
  };
  switch (el.kind) {
    case 'resistor':
      return need(positive(el.R), 'R must be more than 0 Ω (for a connection with no impedance, use a switch)');
    case 'inductor':
      return need(positive(el.L), 'L must be more than 0 H');
    case 'capacitor':
      return need(positive(el.C), 'C must be more than 0 F');
    case 'source':
      need(Number.isFinite(el.E) && Number.isFinite(el.angle), 'the EMF must be a finite voltage');
      need(nonNegative(el.R), 'its internal R must be 0 Ω or more');
      return need(nonNegative(el.L), 'its internal L must be 0 H or more');
    case 'supply':
      need(positive(el.U), 'the voltage U must be more than 0 V');
      need(positive(el.Ssc), 'the short-circuit level must be more than 0 VA');
      return need(nonNegative(el.xr), 'X/R must be 0 or more');
    case 'transformer':
      need(positive(el.S), 'the rating must be more than 0 VA');
      need(positive(el.z) && el.z < 1, 'the impedance must be more than 0 % and less than 100 %');
      need(nonNegative(el.xr), 'X/R must be 0 or more');
      return need(positive(el.U), 'the voltage it is referred to must be more than 0 V');
    case 'injection': {
      need(el.spectrum.length > 0, 'the spectrum is empty');
      const seen = new Set<number>();
      for (const line of el.spectrum) {
        need(
          Number.isInteger(line.order) && line.order >= 1 && line.order <= MAX_ORDER,
          `harmonic order ${line.order} is not a whole number from 1 to ${MAX_ORDER}`,
        );
        need(!seen.has(line.order), `harmonic order ${line.order} is given twice`);
        seen.add(line.order);
        need(nonNegative(line.current), `the current of order ${line.order} must be 0 A or more`);
        need(Number.isFinite(line.angle), `the angle of order ${line.order} must be finite`);
      }
      return;
    }
    case 'switch':
      return need(nonNegative(el.closesAt), 'the closing time must be 0 s or more');
  }
}

/** Union–find over node indices. */
export class Groups {
  private parent: number[];
  constructor(n: number) {
    this.parent = Array.from({ length: n }, (_, k) => k);
  }
  find(x: number): number {
    while (this.parent[x] !== x) x = this.parent[x] = this.parent[this.parent[x]];
    return x;
  }
  /** Joins the groups of x and y; false when they were one already. */
  join(x: number, y: number): boolean {
    const a = this.find(x);
    const b = this.find(y);
    if (a === b) return false;
    this.parent[a] = b;
    return true;
  }
}

/** The network's nodes and its unknowns: node voltages first (the reference has none), then branch currents. */
export interface Topology {
  /** Node name → index of its voltage among the unknowns; the reference is absent. */
  nodeIndex: Map<string, number>;
  nodes: string[];
  /** Element index → index of its branch current among the unknowns (branch elements only). */
  branchIndex: Map<number, number>;
  /** The name of each unknown, for messages: "node B2" or "the current of L1". */
  unknownNames: string[];
  size: number;
}

/** Zero-impedance branches (ideal sources, switches): a loop of them has no solution. */
function zeroImpedance(el: NetworkElement): boolean {
  return el.kind === 'switch' || (el.kind === 'source' && el.R === 0 && el.L === 0);
}

/** The elements on a path from one node to another (breadth first), among elements that form a forest. */
function pathBetween(edges: NetworkElement[], from: string, to: string): NetworkElement[] {
  const via = new Map<string, NetworkElement | null>([[from, null]]);
  const queue = [from];
  while (queue.length) {
    const node = queue.shift()!;
    if (node === to) break;
    for (const e of edges) {
      const other = e.a === node ? e.b : e.b === node ? e.a : null;
      if (other !== null && !via.has(other)) {
        via.set(other, e);
        queue.push(other);
      }
    }
  }
  const path: NetworkElement[] = [];
  for (let node = to, e = via.get(node); e; e = via.get(node)) {
    path.push(e);
    node = e.a === node ? e.b : e.a;
  }
  return path.reverse();
}

/**
 * The first loop closed by the elements `picked` (in the table's order): its elements in row order, or null.
 * A loop of ideal sources, switches (and in a transient capacitors) has no solution; the refusal lists it.
 */
export function firstLoop(elements: NetworkElement[], picked: (el: NetworkElement, k: number) => boolean): NetworkElement[] | null {
  const index = new Map<string, number>();
  const id = (node: string) => index.get(node) ?? index.set(node, index.size).get(node)!;
  const groups = new Groups(2 * elements.length);
  const soFar: NetworkElement[] = [];
  for (const [k, el] of elements.entries()) {
    if (!picked(el, k)) continue;
    if (!groups.join(id(el.a), id(el.b))) return [...pathBetween(soFar, el.a, el.b), el].sort((x, y) => x.row - y.row);
    soFar.push(el);
  }
  return null;
}

export const describe = (el: NetworkElement) => `row ${el.row} (${el.name})`;
export const list = (items: string[]) => (items.length <= 1 ? items.join('') : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`);

/**
 * Checks the network and numbers its unknowns. Every refusal is a sentence naming the row: a misspelt or
 * dangling node, a node with no path to the reference, a loop of ideal sources and switches (a source
 * shorted, or two fighting), values out of range.
 */
export function topologyOf(network: Network, { switchesClosed = true }: { switchesClosed?: boolean } = {}): Topology {
  const { elements, reference } = network;
  if (!positive(network.frequency)) throw new NetworkError('the fundamental frequency must be more than 0 Hz');
  if (!elements.length) throw new NetworkError('the network has no elements');
  if (elements.length > MAX_ELEMENTS) throw new NetworkError(`the network has ${elements.length} elements; at most ${MAX_ELEMENTS} are allowed`);
  const names = new Map<string, NetworkElement>();
  const terminals = new Map<string, NetworkElement[]>();
  for (const el of elements) {
    if (!el.name) throw new NetworkError(`row ${el.row}: the element has no name`, el.row);
    const twin = names.get(el.name);
    if (twin) throw new NetworkError(`row ${el.row}: the name ${el.name} is already used in row ${twin.row}`, el.row);
    names.set(el.name, el);
    if (!el.a || !el.b) throw new NetworkError(`${describe(el)}: both nodes must be named`, el.row);
    if (el.a === el.b) throw new NetworkError(`${describe(el)} joins node ${el.a} to itself`, el.row);
    checkValues(el);
    for (const node of [el.a, el.b]) terminals.set(node, [...(terminals.get(node) ?? []), el]);
  }
  if (!terminals.has(reference)) throw new NetworkError(`no element is joined to the reference node ${reference}`);
  const nodes = [...terminals.keys()].filter((n) => n !== reference);
  for (const node of nodes) {
    const joined = terminals.get(node)!;
    if (joined.length === 1)
      throw new NetworkError(
        `node ${node} is joined only by ${describe(joined[0])}: a node needs two elements at least (is its name misspelt?)`,
        joined[0].row,
      );
  }
  const nodeIndex = new Map(nodes.map((n, k) => [n, k]));
  const at = (node: string) => (node === reference ? nodes.length : nodeIndex.get(node)!);
  const conducts = (el: NetworkElement) => el.kind !== 'injection' && (el.kind !== 'switch' || switchesClosed);

  // A path to the reference through elements that conduct (not injections, not open switches).
  const paths = new Groups(nodes.length + 1);
  for (const el of elements) if (conducts(el)) paths.join(at(el.a), at(el.b));
  for (const node of nodes) {
    if (paths.find(at(node)) !== paths.find(nodes.length)) {
      const joined = terminals.get(node)!;
      throw new NetworkError(
        `node ${node} has no path to the reference node ${reference} except through current injections or open switches (${list(joined.map(describe))})`,
        joined[0].row,
      );
    }
  }

  // Loops of ideal sources and switches.
  const loop = firstLoop(elements, (el) => conducts(el) && zeroImpedance(el));
  if (loop) {
    const sources = loop.filter((o) => o.kind === 'source');
    const why =
      sources.length === 1
        ? `source ${sources[0].name} is shorted`
        : sources.length > 1
          ? 'the sources would fight with nothing between them'
          : 'the switches close a loop with no impedance in it';
    throw new NetworkError(
      `${list(loop.map(describe))} form a loop of ideal sources and closed switches: ${why}. Give a source its internal impedance, or remove a switch.`,
      loop[loop.length - 1].row,
    );
  }

  const branchIndex = new Map<number, number>();
  const unknownNames = nodes.map((n) => `node ${n}`);
  elements.forEach((el, k) => {
    const branch = el.kind === 'switch' ? switchesClosed : seriesBranch(el, network.frequency) !== null;
    if (!branch) return;
    branchIndex.set(k, unknownNames.length);
    unknownNames.push(`the current of ${el.name}`);
  });
  if (unknownNames.length > MAX_UNKNOWNS)
    throw new NetworkError(
      `the network has ${nodes.length} nodes and ${branchIndex.size} branch currents to solve for; at most ${MAX_UNKNOWNS} together are solved in a sheet`,
    );
  return { nodeIndex, nodes, branchIndex, unknownNames, size: unknownNames.length };
}
