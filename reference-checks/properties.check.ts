/**
 * Identities of the series RLC that must hold for any values (property tests with fast-check 4.10.2),
 * and the display of frequencies read back with js-quantities 1.8.0:
 * the engine's functions against the hand formulas of circuit theory.
 */
import fc from 'fast-check';
import Qty from 'js-quantities';
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { evaluateSheet, parseSheetFile, type CalcResult, type TransientResult } from '../common/src/index';

const positive = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
const circuit = fc.record({
  R: positive(0.01, 1000),
  L: positive(1e-6, 10),
  C: positive(1e-9, 1e-2),
  w: positive(1, 1e5),
  E0: positive(1, 1e5),
  t: positive(0, 1),
});

function run(p: { R: number; L: number; C: number; w: number; E0: number; t: number }, source: string) {
  const head = `R = ${p.R} ohm\nL = ${p.L} H\nC = ${p.C} F\nw = ${p.w} rad/s\nE0 = ${p.E0} V\nt = ${p.t} s\n`;
  const r = evaluateSheet({ cells: [{ kind: 'calc', source: head + source }] }).cells[0] as CalcResult;
  expect(r.errors).toEqual([]);
  return (name: string) => r.values[name].si as number;
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

describe('series RLC identities', () => {
  it('rlc_impedance equals √(R² + (ωL − 1/(ωC))²)', () => {
    fc.assert(
      fc.property(circuit, (p) => {
        const v = run(p, 'Z = rlc_impedance(R, L, C, w)');
        expect(rel(v('Z'), Math.hypot(p.R, p.w * p.L - 1 / (p.w * p.C)))).toBeLessThan(1e-12);
      }),
      { numRuns: 200, seed: 20261201 },
    );
  });

  it('time lag × ω equals the delay angle', () => {
    fc.assert(
      fc.property(circuit, (p) => {
        const v = run(p, 'phi = delay_angle(R, L, C, w)\nt_lag = time_lag(R, L, C, w)\nx = t_lag * w');
        expect(Math.abs(v('x') - v('phi'))).toBeLessThan(1e-12 * Math.max(1, Math.abs(v('phi'))));
      }),
      { numRuns: 200, seed: 20261202 },
    );
  });

  it('at resonance the delay angle is 0 and |Z| = R', () => {
    fc.assert(
      fc.property(circuit, (p) => {
        const w0 = 1 / Math.sqrt(p.L * p.C);
        const v = run({ ...p, w: w0 }, 'phi = delay_angle(R, L, C, w)\nZ = rlc_impedance(R, L, C, w)');
        expect(Math.abs(v('phi'))).toBeLessThan(1e-6);
        expect(rel(v('Z'), p.R)).toBeLessThan(1e-6);
      }),
      { numRuns: 200, seed: 20261203 },
    );
  });

  it('the delay angle and the phase of the cosine form differ by π/2', () => {
    fc.assert(
      fc.property(circuit, (p) => {
        const v = run(
          p,
          'i_t = rlc_current(t, E0, R, L, C, w)\nI0 = rlc_amplitude(E0, R, L, C, w)\nphi = delay_angle(R, L, C, w)\nalpha = phi + pi / 2\ni_cos = I0 * cos(w t - alpha)',
        );
        expect(Math.abs(v('i_t') - v('i_cos'))).toBeLessThan(1e-9 * v('I0'));
      }),
      { numRuns: 200, seed: 20261204 },
    );
  });

  it('the phasor current has the magnitude E0/Z and lags by the delay angle', () => {
    fc.assert(
      fc.property(circuit, (p) => {
        const v = run(p, 'I = E0 / (R + j (w L - 1 / (w C)))\nm = abs(I)\na = arg(I)\nphi = delay_angle(R, L, C, w)\nI0 = rlc_amplitude(E0, R, L, C, w)');
        expect(rel(v('m'), v('I0'))).toBeLessThan(1e-12);
        expect(Math.abs(v('a') + v('phi'))).toBeLessThan(1e-12);
      }),
      { numRuns: 200, seed: 20261205 },
    );
  });
});

/**
 * A value shown is read back by an independent units library (js-quantities 1.8.0): the number with
 * its unit must be the SI value to the digits shown, and an angular frequency is never shown in Hz.
 */
describe('angular frequency and frequency, as shown', () => {
  const UNIT_FOR_QTY: Record<string, string> = { 'rad/s': 'rad/s', Hz: 'Hz', kHz: 'kHz', MHz: 'MHz', GHz: 'GHz', mHz: 'mHz', 's⁻¹': '1/s' };
  const readBack = (display: string): { si: number; unit: string } => {
    const m = /^(−?[\d.]+(?:e-?\d+)?) (\S+)$/.exec(display);
    expect(m, display).not.toBeNull();
    const unit = m![2];
    expect(UNIT_FOR_QTY[unit], display).toBeDefined();
    const q = Qty(Number(m![1].replace('−', '-')), UNIT_FOR_QTY[unit]);
    return { si: q.to(unit === 'rad/s' ? 'rad/s' : unit === 's⁻¹' ? '1/s' : 'Hz').scalar, unit };
  };
  // Each form with the kind of value it makes: angular (rad/s), cyclic (Hz) or a rate (s⁻¹).
  const forms: [string, 'angular' | 'cyclic' | 'rate', (p: { f: number; L: number; C: number; R: number }) => number][] = [
    ['x = 2 pi f', 'angular', (p) => 2 * Math.PI * p.f],
    ['x = 2 * pi * f', 'angular', (p) => 2 * Math.PI * p.f],
    ['x = f * 2 * pi', 'angular', (p) => 2 * Math.PI * p.f],
    ['x = tau f', 'angular', (p) => 2 * Math.PI * p.f],
    ['x = 2 pi f / (2 pi)', 'cyclic', (p) => p.f],
    ['x = natural_frequency(L, C)', 'angular', (p) => 1 / Math.sqrt(p.L * p.C)],
    ['x = damped_frequency(0 ohm, L, C)', 'angular', (p) => 1 / Math.sqrt(p.L * p.C)],
    ['x = natural_frequency(L, C) / (2 pi)', 'cyclic', (p) => 1 / (2 * Math.PI * Math.sqrt(p.L * p.C))],
    ['x = resonant_frequency(L, C)', 'cyclic', (p) => 1 / (2 * Math.PI * Math.sqrt(p.L * p.C))],
    ['x = 1 / (2 pi sqrt(L C))', 'cyclic', (p) => 1 / (2 * Math.PI * Math.sqrt(p.L * p.C))],
    ['x = 2 pi / (2 pi sqrt(L C))', 'angular', (p) => 1 / Math.sqrt(p.L * p.C)],
    ['x = attenuation(R, L)', 'rate', (p) => p.R / (2 * p.L)],
    ['x = R / (2 L)', 'rate', (p) => p.R / (2 * p.L)],
    ['x = 1 / sqrt(L C)', 'rate', (p) => 1 / Math.sqrt(p.L * p.C)],
    ['w_x = 1 / sqrt(L C)', 'angular', (p) => 1 / Math.sqrt(p.L * p.C)],
    ['x = f', 'cyclic', (p) => p.f],
    ['x = 3 f', 'cyclic', (p) => 3 * p.f],
  ];
  const SHOWN = { angular: ['rad/s'], cyclic: ['Hz', 'kHz', 'MHz', 'GHz', 'mHz'], rate: ['s⁻¹'] };

  it('converts back to the SI value, in rad/s for angular frequencies and never in Hz', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...forms),
        positive(0.5, 1e6),
        positive(1e-6, 1),
        positive(1e-9, 1e-2),
        positive(0.01, 100),
        fc.integer({ min: 3, max: 8 }),
        ([line, kind, expected], f, L, C, R, digits) => {
          const source = `f = ${f} Hz\nL = ${L} H\nC = ${C} F\nR = ${R} ohm\n${line}`;
          const r = evaluateSheet({ settings: { significantDigits: digits }, cells: [{ kind: 'calc', source }] } as never).cells[0] as CalcResult;
          expect(r.errors).toEqual([]);
          const name = line.split(' =')[0];
          const shown = r.values[name];
          const back = readBack(shown.display);
          expect(SHOWN[kind], `${line}: ${shown.display}`).toContain(back.unit);
          const truth = expected({ f, L, C, R });
          expect(rel(shown.si as number, truth)).toBeLessThan(1e-12);
          // The digits shown are the SI value rounded to `digits` significant digits.
          expect(rel(back.si, truth), `${line}: ${shown.display}`).toBeLessThanOrEqual(0.5 * 10 ** (1 - digits) * 1.0000001);
        },
      ),
      { numRuns: 500, seed: 20261202 },
    );
  });

  it('refuses to show one as the other, and refuses one where the other is meant', () => {
    const errors = (source: string) => (evaluateSheet({ cells: [{ kind: 'calc', source }] }).cells[0] as CalcResult).errors.map((e) => e.message);
    expect(errors('w = 314 rad/s\nf = w to Hz')[0]).toMatch(/angular frequency .* divide by 2 pi/);
    expect(errors('f = 50 Hz\nw = f to rad/s')[0]).toMatch(/multiply by 2 pi/);
    expect(errors('f = 50 Hz\nX = rlc_reactance(1 mH, 1 uF, f)')[0]).toMatch(/angular frequency in rad\/s, but this value is a frequency in Hz/);
    expect(errors('w = 314 rad/s\nX = reactance_L(1 mH, w)')[0]).toMatch(/frequency in Hz, but this value is an angular frequency/);
  });
});

describe('every template shows its angular frequencies in rad/s', () => {
  const dir = join(__dirname, '..', 'templates');
  it.each(readdirSync(dir).filter((f) => f.endsWith('.json')))('%s', (file) => {
    const parsed = parseSheetFile(JSON.parse(readFileSync(join(dir, file), 'utf8')));
    if (!parsed.ok) throw new Error('template invalid');
    for (const cell of evaluateSheet(parsed.sheet).cells) {
      const calc = cell as CalcResult;
      for (const [name, v] of Object.entries(calc.values ?? {})) {
        if (v.siUnit === 'rad/s' || /^(w|omega)(_|\d|$)/.test(name)) expect(v.display, `${file}: ${name}`).toMatch(/ rad\/s$/);
        if (v.siUnit === 'Hz') expect(/^(w|omega)/.test(name), `${file}: ${name} = ${v.display}`).toBe(false);
      }
      const t = cell as TransientResult;
      if (t.kind === 'transient') {
        expect(t.parameters?.omega_0.display, file).toMatch(/ rad\/s$/);
        if (t.parameters?.omega_d) expect(t.parameters.omega_d.display, file).toMatch(/ rad\/s$/);
        expect(t.parameters?.alpha.display, file).toMatch(/ s⁻¹$/);
      }
    }
  });
});
