/**
 * Identities of the series RLC that must hold for any values (property tests with fast-check 4.10.2):
 * the engine's functions against the hand formulas of circuit theory.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { evaluateSheet, type CalcResult } from '../common/src/index';

const positive = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
const circuit = fc.record({ R: positive(0.01, 1000), L: positive(1e-6, 10), C: positive(1e-9, 1e-2), w: positive(1, 1e5), E0: positive(1, 1e5), t: positive(0, 1) });

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
        const v = run(p, 'i_t = rlc_current(t, E0, R, L, C, w)\nI0 = rlc_amplitude(E0, R, L, C, w)\nphi = delay_angle(R, L, C, w)\nalpha = phi + pi / 2\ni_cos = I0 * cos(w t - alpha)');
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
