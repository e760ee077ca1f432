/**
 * ngspice (Debian's ngspice 39, a general-purpose circuit simulator) as an oracle for the network cell:
 * a network of the engine's model is written as a deck for ngspice itself, ngspice is run in batch mode,
 * and its answers are read back with 17 digits. Used by the reference checks only; nothing of ngspice's
 * syntax appears in the product.
 *
 * The deck is written from the element values by the textbook formulas, independently of the engine's own
 * conversion: a supply is U/√3 behind Z = U²/S_sc, a transformer Z = z·U²/S, each split by X/R into R and
 * X = ωL at the fundamental (common practice; for example IEEE Std 399, short-circuit and harmonic
 * chapters; from memory).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Complex } from '../common/src/network/ac';
import type { Network, NetworkElement } from '../common/src/network/model';

const node = (network: Network, name: string) => (name === network.reference ? '0' : `n_${name}`);

/** R and L of an impedance magnitude split by X/R at the fundamental. */
function split(z: number, xr: number, f1: number) {
  const R = z / Math.sqrt(1 + xr * xr);
  return { R, L: (R * xr) / (2 * Math.PI * f1) };
}

export type Excitation =
  /** The sources' EMFs and the injections' lines of `order` (1 with the EMFs). */
  | { kind: 'order'; order: number }
  /** 1 A into `node`, every source shorted and every injection open. */
  | { kind: 'probe'; node: string };

/** The deck's element lines (AC magnitudes and phases in degrees) for one excitation, and the names of its current probes. */
function elementLines(
  network: Network,
  excitation: Excitation,
  options: { transient?: boolean; open?: boolean; ic?: Record<string, number>; shift?: number } = {},
): string[] {
  const lines: string[] = [];
  const f1 = network.frequency;
  const emf = excitation.kind === 'order' && excitation.order === 1;
  /** Degrees by which a sinusoid of `order` has advanced at the start of the run (`shift` seconds in). */
  const advance = (order: number) => (order * 2 * Math.PI * f1 * (options.shift ?? 0) * 180) / Math.PI;
  const ic = (name: string) => (options.ic && name in options.ic ? ` IC=${options.ic[name]}` : '');
  const series = (el: NetworkElement, R: number, L: number, E: number, deg: number) => {
    // V(a) − V(x) = E, then R and L from x to b: V(a) − V(b) = E + (R + jωL)·I with I from a to b.
    const a = node(network, el.a);
    const b = node(network, el.b);
    const x1 = `x1_${el.name}`;
    const x2 = `x2_${el.name}`;
    const ac = emf ? `AC ${E} ${deg}` : 'AC 0';
    const tr = options.transient && E ? ` SIN(0 ${E * Math.SQRT2} ${f1} 0 0 ${deg + 90 + advance(1)})` : '';
    lines.push(`V${el.name} ${a} ${x1} DC 0 ${ac}${tr}`);
    if (R > 0 && L > 0) lines.push(`RS${el.name} ${x1} ${x2} ${R}`, `LS${el.name} ${x2} ${b} ${L}${ic(el.name)}`);
    else if (R > 0) lines.push(`RS${el.name} ${x1} ${b} ${R}`);
    else if (L > 0) lines.push(`LS${el.name} ${x1} ${b} ${L}${ic(el.name)}`);
    else lines.push(`VS${el.name} ${x1} ${b} DC 0`);
  };
  for (const el of network.elements) {
    const a = node(network, el.a);
    const b = node(network, el.b);
    switch (el.kind) {
      case 'resistor':
        lines.push(`R${el.name} ${a} ${b} ${el.R}`);
        break;
      case 'capacitor':
        lines.push(`C${el.name} ${a} ${b} ${el.C}${ic(el.name)}`);
        break;
      case 'inductor':
        series(el, 0, el.L, 0, 0);
        break;
      case 'switch':
        if (!options.open) series(el, 0, 0, 0, 0);
        break;
      case 'source':
        series(el, el.R, el.L, el.E, (el.angle * 180) / Math.PI);
        break;
      case 'supply': {
        const { R, L } = split((el.U * el.U) / el.Ssc, el.xr, f1);
        series(el, R, L, el.U / Math.sqrt(3), 0);
        break;
      }
      case 'transformer': {
        const { R, L } = split((el.z * el.U * el.U) / el.S, el.xr, f1);
        series(el, R, L, 0, 0);
        break;
      }
      case 'injection': {
        const line = excitation.kind === 'order' ? el.spectrum.find((l) => l.order === excitation.order) : undefined;
        if (options.transient) {
          const sines = el.spectrum.map((l) => `SIN(0 ${l.current * Math.SQRT2} ${l.order * f1} 0 0 ${(l.angle * 180) / Math.PI + 90 + advance(l.order)})`);
          // One source per line of the spectrum, in parallel.
          sines.forEach((s, k) => lines.push(`I${el.name}_${k} ${a} ${b} DC 0 ${s}`));
        } else lines.push(`I${el.name} ${a} ${b} DC 0 ${line ? `AC ${line.current} ${(line.angle * 180) / Math.PI}` : 'AC 0'}`);
        break;
      }
    }
  }
  if (excitation.kind === 'probe') lines.push(`IPROBE 0 ${node(network, excitation.node)} DC 0 AC 1`);
  return lines;
}

/**
 * Runs ngspice on the deck's elements with one analysis and returns, per output row, the scale (frequency
 * or time) and the vectors' values. wrdata takes a limited line, so the vectors are written in groups.
 */
function simulate(elements: string[], analysis: string, vectors: string[]): number[][] {
  const dir = mkdtempSync(join(tmpdir(), 'ampwright-ngspice-'));
  try {
    const groups = chunk(vectors, 30);
    const deck = [
      'ampwright network check',
      ...elements,
      '.control',
      'option numdgt=17',
      'set wr_singlescale',
      'set wr_vecnames',
      analysis,
      ...groups.map((group, k) => `wrdata ${join(dir, `out${k}`)} ${group.join(' ')}`),
      'quit',
      '.endc',
      '.end',
    ].join('\n');
    const file = join(dir, 'network.cir');
    writeFileSync(file, deck);
    const r = spawnSync('ngspice', ['-b', file], { encoding: 'utf8', timeout: 120000 });
    if (r.status !== 0) throw new Error(`ngspice failed:\n${r.stdout}\n${r.stderr}`);
    const tables = groups.map((_g, k) =>
      readFileSync(join(dir, `out${k}`), 'utf8')
        .trim()
        .split('\n')
        .slice(1)
        .map((line) => line.trim().split(/\s+/).map(Number)),
    );
    return tables[0].map((row, i) => [row[0], ...tables.flatMap((t) => t[i].slice(1))]);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** Nodes other than the reference, in order of appearance. */
const nodesOf = (network: Network) => [...new Set(network.elements.flatMap((el) => [el.a, el.b]))].filter((n) => n !== network.reference);
/** Elements whose current ngspice reports through their own voltage source (all but R, C and injections). */
const branchesOf = (network: Network) => network.elements.filter((el) => !['resistor', 'capacitor', 'injection'].includes(el.kind));

/**
 * The AC solution at `frequency`: every node's voltage and the current (from a to b) of every element with
 * a branch of its own, by ngspice's AC analysis of the deck.
 */
export function ngspiceAc(
  network: Network,
  frequency: number,
  excitation: Excitation,
  { open = false }: { open?: boolean } = {},
): { nodes: Record<string, Complex>; currents: Record<string, Complex> } {
  const nodes = nodesOf(network);
  const branch = branchesOf(network).filter((el) => !(open && el.kind === 'switch'));
  const vectors = [
    ...nodes.flatMap((n) => [`real(v(${node(network, n)}))`, `imag(v(${node(network, n)}))`]),
    ...branch.flatMap((el) => [`real(i(V${el.name}))`, `imag(i(V${el.name}))`]),
  ];
  const [row] = simulate(elementLines(network, excitation, { open }), `ac lin 1 ${frequency} ${frequency}`, vectors);
  const values = row.slice(1);
  const result = { nodes: {} as Record<string, Complex>, currents: {} as Record<string, Complex> };
  nodes.forEach((n, k) => (result.nodes[n] = { re: values[2 * k], im: values[2 * k + 1] }));
  const offset = 2 * nodes.length;
  branch.forEach((el, k) => (result.currents[el.name] = { re: values[offset + 2 * k], im: values[offset + 2 * k + 1] }));
  return result;
}

function chunk<T>(xs: T[], size: number): T[][] {
  const out: T[][] = [];
  for (let k = 0; k < xs.length; k += size) out.push(xs.slice(k, k + size));
  return out;
}

export interface TransientRun {
  t: number[];
  nodes: Record<string, number[]>;
  currents: Record<string, number[]>;
}

/**
 * The switching transient by ngspice: before the switches close, the steady state of the network with them
 * open (ngspice's AC analysis at every order, Re(√2·Σ X_h·e^(jhω1t)) on a 1 µs grid); after, ngspice's
 * transient analysis (Gear's second-order method, steps of at most `maxStep`) of the network with them
 * closed, from each capacitor's voltage and each inductance's current at the closing instant, taken from that
 * same steady state. All switches must close at one instant (ngspice's own switch element aborts on a
 * switch in series with an inductance: "timestep too small").
 */
export function ngspiceTransient(network: Network, span: number, maxStep: number): TransientRun {
  const closing = [...new Set(network.elements.flatMap((el) => (el.kind === 'switch' ? [el.closesAt] : [])))];
  if (closing.length !== 1) throw new Error('the ngspice oracle takes networks whose switches close at one instant');
  const ts = closing[0];
  const w1 = 2 * Math.PI * network.frequency;
  const orders = [...new Set([1, ...network.elements.flatMap((el) => (el.kind === 'injection' ? el.spectrum.map((l) => l.order) : []))])];
  const steady = orders.map((order) => ({ order, ac: ngspiceAc(network, order * network.frequency, { kind: 'order', order }, { open: true }) }));
  const nodes = nodesOf(network);
  const branch = branchesOf(network);
  const zero = { re: 0, im: 0 };
  /** Re(√2·Σ X_h·e^(jhω1t)) of a quantity of the open network's steady state. */
  const wave = (pick: (ac: { nodes: Record<string, Complex>; currents: Record<string, Complex> }) => Complex | undefined, t: number) =>
    steady.reduce((acc, { order, ac }) => {
      const x = pick(ac) ?? zero;
      const phase = order * w1 * t;
      return acc + Math.SQRT2 * (x.re * Math.cos(phase) - x.im * Math.sin(phase));
    }, 0);
  const v = (ac: { nodes: Record<string, Complex> }, name: string) => (name === network.reference ? zero : ac.nodes[name]);
  const ic: Record<string, number> = {};
  for (const el of network.elements) {
    if (el.kind === 'capacitor') ic[el.name] = wave((ac) => ({ re: v(ac, el.a).re - v(ac, el.b).re, im: v(ac, el.a).im - v(ac, el.b).im }), ts);
    else if (el.kind !== 'switch' && branch.includes(el)) ic[el.name] = wave((ac) => ac.currents[el.name], ts);
  }
  const run: TransientRun = { t: [], nodes: Object.fromEntries(nodes.map((n) => [n, []])), currents: Object.fromEntries(branch.map((el) => [el.name, []])) };
  for (let k = 0; k * 1e-6 < ts; k++) {
    const t = k * 1e-6;
    run.t.push(t);
    for (const n of nodes) run.nodes[n].push(wave((ac) => ac.nodes[n], t));
    for (const el of branch) run.currents[el.name].push(el.kind === 'switch' ? 0 : wave((ac) => ac.currents[el.name], t));
  }
  const vectors = [...nodes.map((n) => `v(${node(network, n)})`), ...branch.map((el) => `i(V${el.name})`)];
  const rows = simulate(
    [
      '.options reltol=1e-7 abstol=1e-12 vntol=1e-9 method=gear maxord=2',
      ...elementLines(network, { kind: 'order', order: 1 }, { transient: true, ic, shift: ts }),
    ],
    `tran ${maxStep} ${span - ts} 0 ${maxStep} uic`,
    vectors,
  );
  for (const r of rows) {
    run.t.push(ts + r[0]);
    nodes.forEach((n, k) => run.nodes[n].push(r[1 + k]));
    branch.forEach((el, k) => run.currents[el.name].push(r[1 + nodes.length + k]));
  }
  return run;
}
