import { describe, expect, it } from 'vitest';
import { evaluateSheet } from './evaluate-sheet';
import type { CalcResult } from './types';

const run = (source: string) => evaluateSheet({ cells: [{ kind: 'calc', source }] }).cells[0] as CalcResult;
const line = (r: CalcResult, name: string) => r.lines.find((l) => l.name === name)!;

describe('the conventions of the trade functions, said beside their results', () => {
  it('says whether a power factor leads or lags, from the sign of Q (S = V·I*)', () => {
    const r = run(
      'S_ind = complex_power(230 V, phasor(10 A, -30 deg))\npf_ind = power_factor(S_ind)\npf_cap = power_factor(complex_power(230 V, phasor(10 A, 30 deg)))\npf_z = power_factor(3 ohm + 4j ohm)\npf_ps = power_factor(2 kW, 2.5 kVA)',
    );
    expect(r.errors).toEqual([]);
    expect(line(r, 'pf_ind').convention).toMatch(/^lagging/);
    expect(line(r, 'pf_cap').convention).toMatch(/^leading/);
    expect(line(r, 'pf_z').convention).toMatch(/^lagging/);
    expect(line(r, 'pf_ps').convention).toMatch(/sense .* unknown/);
    expect(r.values.pf_ind.si).toBeCloseTo(Math.cos(Math.PI / 6), 14);
  });

  it('says the power functions take rms values, and warns when a peak-named value reaches them', () => {
    const r = run('E_pk = 325 V\nI = 10 A\nS = apparent_power(phasor(E_pk, 0), I)\nS_ok = apparent_power(rms(E_pk), I)');
    expect(line(r, 'S').convention).toMatch(/rms values/);
    expect(r.warnings.map((w) => w.message)).toEqual(['apparent_power takes rms values, and E_pk is named as a peak value: if it is one, pass rms(E_pk)']);
    expect(r.warnings[0].line).toBe(3);
  });

  it('states the basis of the bank functions', () => {
    const r = run('Q = bank_reactive_power(100 uF, 230 V, 50 Hz)\nC = bank_capacitance(50 kvar, 400 V, 50 Hz)');
    expect(line(r, 'Q').convention).toMatch(/one capacitor, with V the rms voltage across it/);
    expect(line(r, 'C').convention).toMatch(/star bank give Q\/3 and V_LL\/√3/);
  });
});

describe('angular frequency and frequency in expressions', () => {
  it('reads 2 f pi as 2 pi f, and (2 pi f)² L C as a plain number', () => {
    const r = run('f = 50 Hz\nw = 2 f pi\nx = 1 - (2 pi f)^2 * 10 mH * 100 uF\ny = (2 pi f)^2 * 10 mH * 100 uF');
    expect(r.errors).toEqual([]);
    expect(r.values.w.display).toBe('314.2 rad/s');
    expect(r.values.x.si).toBeCloseTo(1 - (2 * Math.PI * 50) ** 2 * 1e-6, 14);
    expect(r.values.y.display).toBe('0.09870');
  });

  it('keeps a frequency in Hz bound to an angular name in Hz, with a warning', () => {
    const r = run('w = 50 Hz');
    expect(r.values.w.display).toBe('50.00 Hz');
    expect(r.warnings[0].message).toMatch(/named like an angular frequency but holds a frequency in Hz/);
  });
});
