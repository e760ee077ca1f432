/**
 * Independent general-purpose libraries as oracles (neither is used by mathjs or by the engine):
 * js-quantities 1.8.0 for unit conversions, numeric 1.2.6 (numeric.dopri, Dormand–Prince RK45) for
 * the RLC transient, which the engine solves with odex 2.0.4 and in closed form. js-quantities also keeps
 * absolute temperatures apart from temperature differences, the reference for the °C and °F scales.
 */
import Qty from 'js-quantities';
import numeric from 'numeric';
import { describe, expect, it } from 'vitest';
import { evaluateSheet, type CalcResult, type CheckResult, type SweepResult, type TransientResult } from '../common/src/index';

const valueOf = (source: string) => {
  const r = evaluateSheet({ cells: [{ kind: 'calc', source }] }).cells[0] as CalcResult;
  expect(r.errors).toEqual([]);
  return Object.values(r.values)[0].si as number;
};

describe('unit conversions against js-quantities 1.8.0', () => {
  // [value, engine unit, js-quantities unit, relative tolerance]; hp and BTU are rounded in js-quantities.
  const cases: [number, string, string, string, number][] = [
    [47, 'mH', 'mH', 'H', 1e-12],
    [330, 'uF', 'uF', 'F', 1e-12],
    [2.2, 'kohm', 'kOhm', 'Ohm', 1e-12],
    [50, 'kvar', 'kVAR', 'VAR', 1e-12],
    [1.6, 'MVA', 'MVA', 'VA', 1e-12],
    [11, 'kV', 'kV', 'V', 1e-12],
    [1, 'kWh', 'kWh', 'J', 1e-12],
    [75, 'hp', 'hp', 'W', 1e-6],
    [3, 'BTU', 'BTU', 'J', 1e-6],
    [30, 'deg', 'deg', 'rad', 1e-12],
    [20, 'ms', 'ms', 's', 1e-12],
    [2.5, 'GHz', 'GHz', 'Hz', 1e-12],
    [120, 'mi', 'mi', 'm', 1e-12],
  ];
  it.each(cases)('%d %s in SI', (value, unit, qtyUnit, qtySi, tol) => {
    const ours = valueOf(`x = ${value} ${unit}`);
    const theirs = Qty(value, qtyUnit).to(qtySi).scalar;
    expect(Math.abs(ours - theirs)).toBeLessThanOrEqual(tol * Math.abs(theirs));
  });
});

describe('temperatures against js-quantities 1.8.0 (absolute: tempC, tempF, tempK; differences: degK)', () => {
  // Plain mathjs 15.2.0 compares and subtracts degC and degF by the numbers on their own scales (75 degC < 300 K
  // is true there); js-quantities keeps an absolute temperature apart from a difference, as the SI does.
  const sheet = (source: string) => {
    const r = evaluateSheet({ cells: [{ kind: 'calc', source }] }).cells[0] as CalcResult;
    expect(r.errors).toEqual([]);
    return r.values;
  };
  const close = (ours: unknown, theirs: number) => expect(Math.abs((ours as number) - theirs)).toBeLessThanOrEqual(1e-12 * Math.abs(theirs));

  it('gives a temperature on the °C or °F scale in kelvin, and shows it on its own scale', () => {
    const v = sheet('T = 75 degC\nT_F = 100 degF\nT_2 = T + 10 K\nT_F2 = T_F to degC');
    close(v.T.si, Qty('75 tempC').to('tempK').scalar);
    close(v.T_F.si, Qty('100 tempF').to('tempK').scalar);
    close(v.T_2.si, Qty('75 tempC').add(Qty('10 degK')).to('tempK').scalar);
    close(v.T_F2.si, Qty('100 tempF').to('tempK').scalar);
    expect([v.T.display, v.T_F.display, v.T_2.display, v.T_F2.display]).toEqual(['75.00 °C', '100.0 °F', '85.00 °C', '37.78 °C']);
    expect(v.T.siUnit).toBe('K');
  });

  it('takes one temperature from another as a difference in K', () => {
    const v = sheet('d = 75 degC - 20 degC\nd_2 = 100 degF - 0 degC\nd_3 = 75 degC - 20 K');
    close(v.d.si, Qty('75 tempC').sub(Qty('20 tempC')).to('degK').scalar);
    close(v.d_2.si, Qty('100 tempF').sub(Qty('0 tempC')).to('degK').scalar);
    expect([v.d.display, v.d.unit]).toEqual(['55.00 K', 'K']);
    // A temperature less a difference is a temperature.
    close(v.d_3.si, Qty('75 tempC').sub(Qty('20 degK')).to('tempK').scalar);
  });

  it.each([
    ['75 degC', '<', '300 K', '75 tempC', '300 tempK'],
    ['75 degC', '>', '300 K', '75 tempC', '300 tempK'],
    ['100 degF', '>', '37 degC', '100 tempF', '37 tempC'],
    ['100 degF', '<=', '311 K', '100 tempF', '311 tempK'],
    ['75 degC', '<=', '90 degC', '75 tempC', '90 tempC'],
    ['348.15 K', '==', '75 degC', '348.15 tempK', '75 tempC'],
  ])('compares %s %s %s in kelvin', (a, op, b, qa, qb) => {
    const c = Qty(qa).compareTo(Qty(qb));
    const expected = { '<': c < 0, '>': c > 0, '<=': c <= 0, '==': c === 0 }[op];
    expect(sheet(`b = ${a} ${op} ${b}`).b.si).toBe(expected);
    const check = evaluateSheet({ cells: [{ kind: 'check', condition: `${a} ${op} ${b}`, basis: 'oracle' }] }).cells[0] as CheckResult;
    expect(check.pass).toBe(expected);
  });

  it("does the same element by element in a table's column", () => {
    const [, calc] = evaluateSheet({
      cells: [
        { kind: 'table', columns: [{ name: 'T_a', unit: 'degC' }], rows: [[25], [40]] },
        { kind: 'calc', source: 'd = T_a - 20 degC\nhot = T_a > 300 K' },
      ],
    }).cells as [unknown, CalcResult];
    expect(calc.errors).toEqual([]);
    const d = calc.values.d.si as number[];
    [25, 40].forEach((t, k) => close(d[k], Qty(`${t} tempC`).sub(Qty('20 tempC')).to('degK').scalar));
    expect(calc.values.d.display).toBe('[5.000 K, 20.00 K]');
    expect(calc.values.hot.si).toEqual([25, 40].map((t) => Qty(`${t} tempC`).compareTo(Qty('300 tempK')) > 0));
  });

  it('sweeps a temperature on its own scale, its differences in K', () => {
    const cell = {
      kind: 'sweep' as const,
      variable: 'T',
      from: '20 degC',
      to: '90 degC',
      points: 3,
      spacing: 'linear' as const,
      outputs: ['1 ohm * (1 + 0.00393 / K * (T - 20 degC))', 'T + 10 K'],
    };
    const r = evaluateSheet({ cells: [cell] }).cells[0] as SweepResult;
    expect(r.errors).toEqual([]);
    expect(r.variable).toEqual({ name: 'T', unit: 'degC', values: [20, 55, 90] });
    [20, 55, 90].forEach((t, k) => close(r.outputs[0].values[k], 1 + 0.00393 * Qty(`${t} tempC`).sub(Qty('20 tempC')).to('degK').scalar));
    expect(r.outputs[1]).toMatchObject({ unit: 'degC', values: [30, 65, 100] });
  });

  it('gives no utilisation for a temperature limit on the °C scale (its ratio depends on the zero), and says so', () => {
    const check = evaluateSheet({ cells: [{ kind: 'check', condition: '75 degC <= 90 degC', basis: 'oracle' }] }).cells[0] as CheckResult;
    expect([check.pass, check.utilization, check.margin]).toEqual([true, null, null]);
    expect(check.warnings[0].message).toMatch(/no utilisation is given for a temperature on the °C or °F scale/);
  });
});

describe('RLC transient against numeric.dopri (numeric 1.2.6)', () => {
  const cases = [
    { name: 'underdamped step', R: '4 ohm', source: '48 V', q0: '0 mC', i0: '0 A' },
    { name: 'overdamped step', R: '200 ohm', source: '48 V', q0: '0 mC', i0: '0 A' },
    { name: 'critically damped with initial charge', R: `${2 * Math.sqrt(0.02 / 50e-6)} ohm`, source: '0 V', q0: '2 mC', i0: '0 A' },
    { name: 'sinusoid with initial current', R: '6 ohm', source: '100 V * cos(2 pi 60 Hz * t)', q0: '0 mC', i0: '1 A' },
    { name: 'ramp (numeric only)', R: '6 ohm', source: '100 V * t / 10 ms', q0: '0 mC', i0: '0 A' },
  ];
  it.each(cases)('$name', ({ R, source, q0, i0 }) => {
    const r = evaluateSheet({
      cells: [
        { kind: 'calc', source: 'L = 20 mH\nC = 50 uF' },
        { kind: 'transient', R, L: 'L', C: 'C', source, q0, i0, span: '60 ms', points: 601 },
      ],
    }).cells[1] as TransientResult;
    expect(r.errors).toEqual([]);
    const Rv = Number(R.split(' ')[0]);
    const L = 0.02;
    const C = 50e-6;
    const E = (t: number) =>
      source.startsWith('48') ? 48 : source.startsWith('0') ? 0 : source.includes('cos') ? 100 * Math.cos(2 * Math.PI * 60 * t) : (100 * t) / 0.01;
    const y0 = [source === '0 V' ? 2e-3 : 0, i0 === '1 A' ? 1 : 0];
    const sol = numeric.dopri(0, 0.06, y0, (t: number, y: number[]) => [y[1], (E(t) - Rv * y[1] - y[0] / C) / L], 1e-12, 100000);
    const peak = Math.max(...r.current!.values.map(Math.abs));
    r.time!.values.forEach((t, k) => {
      const [q, i] = sol.at(t) as number[];
      expect(Math.abs(r.current!.values[k] - i)).toBeLessThanOrEqual(1e-6 * peak);
      expect(Math.abs(r.charge!.values[k] - q)).toBeLessThanOrEqual(1e-6 * Math.max(...r.charge!.values.map(Math.abs)));
      if (r.currentAnalytic) expect(Math.abs(r.currentAnalytic.values[k] - i)).toBeLessThanOrEqual(1e-6 * peak);
    });
  });
});
