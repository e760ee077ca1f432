/**
 * The network cell: a table of elements between named nodes, with values as expressions of the sheet,
 * solved by the network engine (network/) with the analysis chosen on the cell. Every result becomes a
 * name for the cells below (LANGUAGE.md, "Network cells", gives the scheme):
 *   steady state   V_<node>, I_<element>, S_<element>                       (complex phasors, rms)
 *   scan           f_par_<k>, h_par_<k>, Z_par_<k>; f_ser_<k>, h_ser_<k>, Z_ser_<k>
 *   harmonic flow  THD_<node>, V_<node>_rms, V_<node>_<h>; I_<element>_rms, V_<element>_rms,
 *                  V_<element>_pk, Q_<element>
 *   transient      V_<node>_max, V_<node>_min, V_<node>_pk; the same for I_<element>
 */
import type { NetworkCell, NetworkElementRow } from '../sheet/sheet-format';
import { DeadlineExceeded } from '../language/deadline';
import { EngineError } from '../language/errors';
import { checkNames, evaluateNode, parseExpression, valueNames } from '../language/expression';
import { math } from '../language/math';
import { angleValue } from '../circuits/functions';
import { formatValue, type DisplayOptions } from '../units/display';
import { frequencyKind, quantity, real, si, type Dimension } from '../units/quantities';
import { frequencyScan, harmonicFlow, prepare, steadyState, type Complex } from '../network/ac';
import { NetworkError, type HarmonicLine, type Network, type NetworkElement } from '../network/model';
import { networkTransient, type Peaks } from '../network/transient';
import type { SheetScope } from './scope';
import type { NetworkResult } from './types';
import { ELEMENT_VALUES } from './network-labels';

/** Node and element names: letters and digits, starting with a letter (they become parts of names: V_B2, I_C1). */
const PART = /^[A-Za-z][A-Za-z0-9]*$/;

/**
 * The IEEE Std 519-2014 voltage distortion limits at the point of common coupling, by bus voltage
 * (Table 1: individual harmonic and THD, in percent; from memory).
 */
export function ieee519Limits(busVoltage: number): { individual: number; thd: number; basis: string } {
  if (busVoltage <= 1e3) return { individual: 5, thd: 8, basis: 'IEEE Std 519-2014, Table 1, bus of 1 kV or less' };
  if (busVoltage <= 69e3) return { individual: 3, thd: 5, basis: 'IEEE Std 519-2014, Table 1, bus over 1 kV up to 69 kV' };
  if (busVoltage <= 161e3) return { individual: 1.5, thd: 2.5, basis: 'IEEE Std 519-2014, Table 1, bus over 69 kV up to 161 kV' };
  return { individual: 1, thd: 1.5, basis: 'IEEE Std 519-2014, Table 1, bus over 161 kV' };
}

const abs = (z: Complex) => Math.hypot(z.re, z.im);

export function evaluateNetworkCell(cell: NetworkCell, cellIndex: number, scope: SheetScope, display: DisplayOptions): NetworkResult {
  const result: NetworkResult = { kind: 'network', status: 'ok', errors: [], warnings: [], values: {}, tables: [], analysis: cell.analysis };
  const place = { cell: cellIndex, line: 1 };
  const mathScope = scope.asMathScope();
  /** An expression of the sheet; errors name the row (as the line) and what it is. */
  const read = (text: string | undefined, what: string, row = 1): unknown => {
    if (text === undefined || text.trim() === '') throw new EngineError(`${what} is missing`, row, 1);
    try {
      const node = parseExpression(text, row, 0, valueNames(scope));
      checkNames(node, text, scope, { ...place, line: row });
      return evaluateNode(node, node.compile(), mathScope, text, row);
    } catch (err) {
      if (err instanceof DeadlineExceeded) throw err;
      throw new EngineError(`${what}: ${(err as Error).message}`, row, 1);
    }
  };
  /** A conversion of a value, its failure placed on the row; its message already names what it is (`row 2 (C1), C must be a capacitance`). */
  const onRow = <T>(row: number, convert: () => T): T => {
    try {
      return convert();
    } catch (err) {
      throw new EngineError((err as Error).message, row, 1);
    }
  };
  const realOf = (text: string | undefined, dim: Dimension, what: string, row = 1) => {
    const v = read(text, what, row);
    return onRow(row, () => real(v, dim, what));
  };
  const define = (name: string, value: unknown) => {
    scope.define(name, value, place);
    result.values[name] = formatValue(value, display);
  };
  const show = (value: unknown, target?: string) => formatValue(value, display, target).display;

  try {
    const fText = cell.frequency?.trim() ? cell.frequency : '50 Hz';
    const fValue = read(fText, 'the fundamental frequency');
    if (frequencyKind(fValue) === 'angular') throw new EngineError('the fundamental frequency must be in Hz, not rad/s (divide by 2 pi)', 1, 1);
    const frequency = onRow(1, () => real(fValue, 'frequency', 'the fundamental frequency'));
    const omega1 = 2 * Math.PI * frequency;
    const reference = cell.reference?.trim() || 'gnd';
    if (!PART.test(reference)) throw new EngineError(`the reference node "${reference}" must be letters and digits, starting with a letter`, 1, 1);

    const elements = cell.elements.map((row, k): NetworkElement => {
      const r = k + 1;
      const at = `row ${r}${row.name ? ` (${row.name})` : ''}`;
      const name = row.name.trim();
      if (!PART.test(name))
        throw new NetworkError(
          `${at}: the element's name must be letters and digits, starting with a letter (it becomes part of names such as I_${name || 'C1'})`,
          r,
        );
      for (const node of [row.a.trim(), row.b.trim()])
        if (!PART.test(node))
          throw new NetworkError(
            `${at}: node "${node}" must be letters and digits, starting with a letter (it becomes part of names such as V_${node || 'B2'})`,
            r,
          );
      const values = row.values ?? [];
      const label = ELEMENT_VALUES[row.kind];
      const v = (i: number) => values[i];
      const what = (i: number) => `${at}, ${label[i]}`;
      const base = { name, row: r, a: row.a.trim(), b: row.b.trim() };
      switch (row.kind) {
        case 'resistor':
          return { ...base, kind: 'resistor', R: realOf(v(0), 'impedance', what(0), r) };
        case 'inductor':
          return { ...base, kind: 'inductor', L: realOf(v(0), 'inductance', what(0), r) };
        case 'capacitor':
          return { ...base, kind: 'capacitor', C: realOf(v(0), 'capacitance', what(0), r) };
        case 'source': {
          const E = onRow(r, () => si(read(v(0), what(0), r), 'voltage', what(0)));
          const Z = v(1)?.trim() ? onRow(r, () => si(read(v(1), what(1), r), 'impedance', what(1))) : 0;
          const e = typeof E === 'number' ? { re: E, im: 0 } : E;
          const z = typeof Z === 'number' ? { re: Z, im: 0 } : Z;
          if (z.im < 0) throw new NetworkError(`${what(1)}: the internal impedance must be resistive or inductive (its reactance is negative here)`, r);
          return { ...base, kind: 'source', E: abs(e), angle: Math.atan2(e.im, e.re), R: z.re, L: z.im / omega1 };
        }
        case 'supply':
          return {
            ...base,
            kind: 'supply',
            U: realOf(v(0), 'voltage', what(0), r),
            Ssc: realOf(v(1), 'power', what(1), r),
            xr: realOf(v(2), 'none', what(2), r),
          };
        case 'transformer':
          return {
            ...base,
            kind: 'transformer',
            S: realOf(v(0), 'power', what(0), r),
            z: realOf(v(1), 'none', what(1), r),
            xr: realOf(v(2), 'none', what(2), r),
            U: realOf(v(3), 'voltage', what(3), r),
          };
        case 'injection':
          return { ...base, kind: 'injection', spectrum: spectrumOf(row, r, what, read, onRow) };
        case 'switch':
          return { ...base, kind: 'switch', closesAt: realOf(v(0), 'time', what(0), r) };
      }
    });
    const nodeNames = new Set(elements.flatMap((e) => [e.a, e.b]));
    for (const e of elements)
      if (nodeNames.has(e.name))
        throw new NetworkError(
          `row ${e.row}: ${e.name} names both an element and a node; they must differ, as both become parts of names (I_${e.name}, V_${e.name})`,
          e.row,
        );
    const network: Network = { elements, reference, frequency };

    if (cell.analysis === 'steady') {
      const s = steadyState(prepare(network));
      for (const [node, v] of Object.entries(s.nodes)) define(`V_${node}`, quantity(v, 'V'));
      for (const e of elements) {
        define(`I_${e.name}`, quantity(s.elements[e.name].current, 'A'));
        define(`S_${e.name}`, quantity(s.elements[e.name].power, 'VA'));
      }
      result.tables.push(
        {
          title: `Node voltages at ${show(math.unit(frequency, 'Hz'))} (rms, to ${reference})`,
          columns: ['node', 'V'],
          rows: Object.keys(s.nodes).map((n) => [n, result.values[`V_${n}`].display]),
        },
        {
          title: 'Element currents (from the first node to the second) and the complex power each absorbs',
          columns: ['element', 'kind', 'I', 'S = V·I*'],
          rows: elements.map((e) => [e.name, e.kind, result.values[`I_${e.name}`].display, result.values[`S_${e.name}`].display]),
        },
      );
    } else if (cell.analysis === 'scan') {
      const node = cell.node?.trim() ?? '';
      if (!node) throw new EngineError('the scan needs the node it looks into', 1, 1);
      const from = realOf(cell.from, 'frequency', 'the start of the scan');
      const to = realOf(cell.to, 'frequency', 'the end of the scan');
      if (!(from > 0) || !(to > from)) throw new EngineError('the scan must run from a frequency above 0 Hz to a higher one', 1, 1);
      const points = cell.points ?? 500;
      const frequencies = Array.from({ length: points }, (_, k) => from * Math.pow(to / from, k / (points - 1)));
      const p = prepare(network);
      if (!p.topology.nodeIndex.has(node)) throw new EngineError(`the network has no node ${node} to look into (the reference cannot be chosen)`, 1, 1);
      const scan = frequencyScan(p, node, frequencies);
      const count = { parallel: 0, series: 0 };
      const rows: string[][] = [];
      for (const r of scan.resonances) {
        const k = ++count[r.type];
        const tag = r.type === 'parallel' ? 'par' : 'ser';
        define(`f_${tag}_${k}`, math.unit(r.frequency, 'Hz'));
        define(`h_${tag}_${k}`, r.order);
        define(`Z_${tag}_${k}`, quantity(r.impedance, 'ohm'));
        rows.push([r.type, result.values[`f_${tag}_${k}`].display, result.values[`h_${tag}_${k}`].display, show(math.unit(abs(r.impedance), 'ohm'))]);
      }
      result.tables.push({
        title: `Resonances seen from node ${node}, ${show(math.unit(from, 'Hz'))} to ${show(math.unit(to, 'Hz'))}, ${points} points`,
        columns: ['resonance', 'f', 'h = f / f₁', '|Z|'],
        rows,
      });
      if (!rows.length) result.warnings.push({ line: 1, column: 1, message: 'no resonance in the range scanned' });
      result.scan = {
        frequency: { name: 'f', unit: 'Hz', values: frequencies },
        impedance: { name: `Z(${node})`, unit: 'ohm', values: scan.impedances.map((z) => z.re), im: scan.impedances.map((z) => z.im), complex: true },
        resonances: scan.resonances.map((r) => ({ type: r.type, frequency: r.frequency, order: r.order })),
      };
    } else if (cell.analysis === 'harmonics') {
      const flow = harmonicFlow(prepare(network));
      const supply = elements.find((e) => e.kind === 'supply') as Extract<NetworkElement, { kind: 'supply' }> | undefined;
      const busVoltage = cell.limitsVoltage?.trim() ? realOf(cell.limitsVoltage, 'voltage', 'the voltage for the distortion limits') : supply?.U;
      const limit = busVoltage !== undefined ? ieee519Limits(busVoltage) : null;
      const harmonics = flow.orders.filter((h) => h > 1);
      const nodeRows: string[][] = [];
      for (const [node, d] of Object.entries(flow.nodes)) {
        if (d.thd !== null) define(`THD_${node}`, d.thd);
        define(`V_${node}_rms`, math.unit(d.rms, 'V'));
        for (const h of flow.orders) define(`V_${node}_${h}`, quantity(d.voltages[h], 'V'));
        const worst = harmonics.reduce<{ h: number; x: number } | null>((w, h) => {
          const x = d.individual[h];
          return x !== null && x !== undefined && (!w || x > w.x) ? { h, x } : w;
        }, null);
        const within = limit && d.thd !== null ? d.thd * 100 <= limit.thd && (!worst || worst.x * 100 <= limit.individual) : null;
        nodeRows.push([
          node,
          show(math.unit(d.fundamental, 'V')),
          d.thd === null ? 'no fundamental' : `${(d.thd * 100).toPrecision(display.significantDigits)} %`,
          worst ? `${(worst.x * 100).toPrecision(display.significantDigits)} % (h = ${worst.h})` : '—',
          within === null ? '—' : within ? 'within' : 'OVER',
        ]);
      }
      const dutyRows = elements.map((e) => {
        const d = flow.elements[e.name];
        define(`I_${e.name}_rms`, math.unit(d.rmsCurrent, 'A'));
        define(`V_${e.name}_rms`, math.unit(d.rmsVoltage, 'V'));
        define(`V_${e.name}_pk`, math.unit(d.peakVoltage, 'V'));
        define(`Q_${e.name}`, math.unit(d.reactivePower, 'var'));
        return [
          e.name,
          e.kind,
          result.values[`I_${e.name}_rms`].display,
          result.values[`V_${e.name}_rms`].display,
          result.values[`V_${e.name}_pk`].display,
          result.values[`Q_${e.name}`].display,
        ];
      });
      result.tables.push(
        {
          title: `Voltage distortion at each node, orders ${flow.orders.join(', ')} (IEEE Std 519-2014, 3.1)${limit ? `; limits ${limit.individual} % individual, ${limit.thd} % THD (${limit.basis})` : ''}`,
          columns: ['node', '|V₁|', 'THD', 'largest individual', 'limits'],
          rows: nodeRows,
        },
        {
          title: 'Element duty with all orders: rms current and voltage, the voltage peak when every order peaks together (√2·Σ|V_h|), reactive power',
          columns: ['element', 'kind', 'I rms', 'V rms', 'V peak', 'Q'],
          rows: dutyRows,
        },
      );
      result.harmonics = {
        orders: harmonics,
        nodes: Object.entries(flow.nodes).map(([node, d]) => ({ node, individual: harmonics.map((h) => (d.individual[h] ?? NaN) * 100) })),
        limit,
      };
    } else {
      const span = realOf(cell.span, 'time', 'the time span');
      const points = cell.points ?? 1000;
      const run = networkTransient(network, { span, points, tolerance: 1e-12 });
      const rows: string[][] = [];
      const report = (symbol: 'V' | 'I', subject: string, peaks: Peaks, unit: string) => {
        const at = (p: { t: number; value: number }) => `${show(math.unit(p.value, unit))} at ${show(math.unit(p.t, 's'))}`;
        define(`${symbol}_${subject}_max`, math.unit(peaks.max.value, unit));
        define(`${symbol}_${subject}_min`, math.unit(peaks.min.value, unit));
        define(`${symbol}_${subject}_pk`, math.unit(peaks.peak.value, unit));
        rows.push([`${symbol === 'V' ? 'voltage of node' : 'current of'} ${subject}`, at(peaks.max), at(peaks.min), at(peaks.peak)]);
      };
      for (const node of Object.keys(run.nodes)) report('V', node, run.nodePeaks[node], 'V');
      for (const e of elements) report('I', e.name, run.currentPeaks[e.name], 'A');
      result.tables.push({
        title: `Extremes over ${show(math.unit(span, 's'))}, located from the solution${run.switchings.length ? `; switching at ${run.switchings.map((t) => show(math.unit(t, 's'))).join(', ')}` : ''}`,
        columns: ['quantity', 'highest', 'lowest', 'largest magnitude'],
        rows,
      });
      // The series the chart draws: the switches' currents first, then the largest peaks.
      const size = (p: Peaks) => Math.abs(p.peak.value);
      const currents = elements
        .filter((e) => e.kind !== 'injection')
        .sort((x, y) => Number(y.kind === 'switch') - Number(x.kind === 'switch') || size(run.currentPeaks[y.name]) - size(run.currentPeaks[x.name]));
      const voltages = Object.keys(run.nodes).sort((x, y) => size(run.nodePeaks[y]) - size(run.nodePeaks[x]));
      result.transient = {
        time: { name: 't', unit: 's', values: run.t },
        // Only what the chart draws is kept with the result: four currents and four voltages.
        series: [
          ...currents.slice(0, 4).map((e) => ({ name: `i(${e.name})`, unit: 'A', values: run.currents[e.name] })),
          ...voltages.slice(0, 4).map((n) => ({ name: `v(${n})`, unit: 'V', values: run.nodes[n] })),
        ],
      };
    }
  } catch (err) {
    if (err instanceof DeadlineExceeded) throw err;
    result.status = 'error';
    if (err instanceof NetworkError) result.errors.push({ line: err.row ?? 1, column: 1, message: err.message });
    else if (err instanceof EngineError) result.errors.push(err.toDiagnostic());
    else result.errors.push({ line: 1, column: 1, message: (err as Error).message });
  }
  return result;
}

/** An injection's spectrum from its three values: orders, currents and angles (each a number or a vector of the same length). */
function spectrumOf(
  row: NetworkElementRow,
  r: number,
  what: (i: number) => string,
  read: (text: string | undefined, what: string, row: number) => unknown,
  onRow: <T>(row: number, convert: () => T) => T,
): HarmonicLine[] {
  const list = (x: unknown): unknown[] =>
    x && typeof (x as { toArray?: unknown }).toArray === 'function' ? ((x as { toArray(): unknown[] }).toArray().flat(2) as unknown[]) : [x];
  const orders = list(read(row.values[0], what(0), r));
  const currents = list(read(row.values[1], what(1), r));
  const angles = row.values[2]?.trim() ? list(read(row.values[2], what(2), r)) : orders.map(() => 0);
  if (currents.length !== orders.length || angles.length !== orders.length)
    throw new NetworkError(
      `${what(0)}: ${orders.length} orders, ${currents.length} currents and ${angles.length} angles; each order needs its current and angle`,
      r,
    );
  return orders.map((h, k) => ({
    order: onRow(r, () => real(h, 'none', `${what(0)} (number ${k + 1})`)),
    current: onRow(r, () => real(currents[k], 'current', `${what(1)} (number ${k + 1})`)),
    angle: onRow(r, () => angleValue(angles[k], `${what(2)} (number ${k + 1})`)),
  }));
}

/** The names a network cell defines, from its table alone (before it is evaluated), for "defined later" messages. */
export function networkNames(cell: NetworkCell): string[] {
  const nodes = [...new Set(cell.elements.flatMap((e) => [e.a.trim(), e.b.trim()]))].filter((n) => n && n !== (cell.reference?.trim() || 'gnd'));
  const names = cell.elements.map((e) => e.name.trim()).filter(Boolean);
  if (cell.analysis === 'steady') return [...nodes.map((n) => `V_${n}`), ...names.flatMap((n) => [`I_${n}`, `S_${n}`])];
  if (cell.analysis === 'harmonics')
    return [...nodes.flatMap((n) => [`THD_${n}`, `V_${n}_rms`]), ...names.flatMap((n) => [`I_${n}_rms`, `V_${n}_rms`, `V_${n}_pk`, `Q_${n}`])];
  if (cell.analysis === 'transient') return [...nodes.map((n) => `V_${n}`), ...names.map((n) => `I_${n}`)].flatMap((x) => [`${x}_max`, `${x}_min`, `${x}_pk`]);
  return [];
}
