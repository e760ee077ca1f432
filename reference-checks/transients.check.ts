/**
 * The transient cell's extrema, steady state and resonant growth against closed forms and against an
 * ODE solver that is not the engine's: numeric 1.2.6 (numeric.dopri, Dormand–Prince RK45 with event
 * location; the engine uses odex 2.0.4 and its own closed forms).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import numeric from 'numeric';
import { describe, expect, it } from 'vitest';
import { evaluateSheet, parseSheetFile, type TransientResult } from '../common/src/index';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

function transient(R: string, source: string, extra: Record<string, string | number> = {}, L = '20 mH', C = '50 uF'): TransientResult {
  const r = evaluateSheet({
    cells: [{ kind: 'calc', source: `L = ${L}\nC = ${C}` }, { kind: 'transient', R, L: 'L', C: 'C', source, span: '60 ms', points: 601, ...extra } as never],
  }).cells[1] as TransientResult;
  expect(r.errors).toEqual([]);
  return r;
}

/** The first maximum of i(t) located by numeric.dopri's event function (-di/dt crossing zero upwards). */
function dopriFirstMaximum(R: number, L: number, C: number, E: (t: number) => number, y0: [number, number], span: number) {
  const f = (t: number, y: number[]) => [y[1], (E(t) - R * y[1] - y[0] / C) / L];
  const sol = numeric.dopri(0, span, y0, f, 1e-12, 1e6, (t: number, y: number[]) => [-f(t, y)[1]]);
  const n = sol.x.length;
  return { t: sol.x[n - 1] as number, i: sol.y[n - 1][1] as number };
}

describe('transient extrema', () => {
  const L = 0.02;
  const C = 50e-6;

  it('finds the first current peak of an underdamped step response where di/dt = 0 (closed form: t* = atan(ωd/α)/ωd; numeric.dopri 1.2.6 event)', () => {
    // i(t) = E/(ωd L)·e^(−αt)·sin(ωd t) for a step E from rest (series RLC step response; Nilsson and Riedel, Electric Circuits, 8.4; from memory).
    const R = 4;
    const E = 48;
    const a = R / (2 * L);
    const wd = Math.sqrt(1 / (L * C) - a * a);
    const tStar = Math.atan(wd / a) / wd;
    const iStar = (E / (wd * L)) * Math.exp(-a * tStar) * Math.sin(wd * tStar);
    const r = transient('4 ohm', '48 V');
    expect(rel(r.peaks!.current.peak.value.si as number, iStar)).toBeLessThan(1e-9);
    expect(rel(r.peaks!.current.peak.time.si as number, tStar)).toBeLessThan(1e-9);
    expect(rel(r.peaks!.current.max.value.si as number, iStar)).toBeLessThan(1e-9);
    const oracle = dopriFirstMaximum(R, L, C, () => E, [0, 0], 0.06);
    expect(rel(r.peaks!.current.peak.value.si as number, oracle.i)).toBeLessThan(1e-9);
    expect(rel(r.peaks!.current.peak.time.si as number, oracle.t)).toBeLessThan(1e-9);
    // The lowest current is the first negative half-cycle, at t* + π/ωd, smaller by e^(−απ/ωd).
    expect(rel(r.peaks!.current.min.value.si as number, -iStar * Math.exp((-a * Math.PI) / wd))).toBeLessThan(1e-9);
    expect(rel(r.peaks!.current.min.time.si as number, tStar + Math.PI / wd)).toBeLessThan(1e-9);
  });

  it('gives the capacitor voltage overshoot of a step: E·(1 + e^(−απ/ωd)) at t = π/ωd (second-order step response, maximum overshoot; Ogata, Modern Control Engineering, 5.3; from memory)', () => {
    const a = 4 / (2 * L);
    const wd = Math.sqrt(1 / (L * C) - a * a);
    const r = transient('4 ohm', '48 V');
    expect(rel(r.peaks!.capacitorVoltage.max.value.si as number, 48 * (1 + Math.exp((-a * Math.PI) / wd)))).toBeLessThan(1e-9);
    expect(rel(r.peaks!.capacitorVoltage.max.time.si as number, Math.PI / wd)).toBeLessThan(1e-9);
  });

  it('finds the peak of a source with no closed form from the dense output, to the event-located peak of numeric.dopri 1.2.6', () => {
    const E = (t: number) => (100 * t) / (1e-3 + t);
    const r = transient('6 ohm', '100 V * t / (1 ms + t)');
    expect(r.analytic?.available).toBe(false);
    expect(r.peaks?.from).toBe('numeric');
    const oracle = dopriFirstMaximum(6, L, C, E, [0, 0], 0.06);
    expect(rel(r.peaks!.current.max.value.si as number, oracle.i)).toBeLessThan(1e-8);
    expect(rel(r.peaks!.current.max.time.si as number, oracle.t)).toBeLessThan(1e-7);
  });

  it('does not depend on the number of points shown: the inrush template from 500 to 20 000 points (to 1e-9)', () => {
    const file = JSON.parse(readFileSync(join(__dirname, '..', 'templates', 'bank-inrush-transient.json'), 'utf8'));
    const peaks = [500, 1000, 4000, 20000].map((points) => {
      file.cells[3].points = points;
      const parsed = parseSheetFile(file);
      if (!parsed.ok) throw new Error('template invalid');
      const t = evaluateSheet(parsed.sheet).cells[3] as TransientResult;
      expect(t.errors).toEqual([]);
      return { i: t.peaks!.current.peak.value.si as number, t: t.peaks!.current.peak.time.si as number, v: t.peaks!.capacitorVoltage.peak.value.si as number };
    });
    for (const p of peaks) {
      expect(rel(p.i, peaks[0].i)).toBeLessThan(1e-9);
      expect(rel(p.t, peaks[0].t)).toBeLessThan(1e-9);
      expect(rel(p.v, peaks[0].v)).toBeLessThan(1e-9);
    }
    // The same circuit in numeric.dopri: E_pk·cos(2π·50·t) into the template's R_d, L_s, C_b.
    const sheet = parseSheetFile(file);
    if (!sheet.ok) throw new Error('template invalid');
    const calc = evaluateSheet(sheet.sheet).cells[2] as unknown as { values: Record<string, { si: number }> };
    const [Rd, Ls, Cb, Epk] = ['R_d', 'L_s', 'C_b', 'E_pk'].map((n) => calc.values[n].si);
    const f = (t: number, y: number[]) => [y[1], (Epk * Math.cos(2 * Math.PI * 50 * t) - Rd * y[1] - y[0] / Cb) / Ls];
    const sol = numeric.dopri(0, 0.02, [0, 0], f, 1e-12, 1e6);
    // The largest |i| of the dopri solution sampled on 200 000 points, refined by its own dense output.
    let best = { t: 0, i: 0 };
    for (let k = 0; k <= 200_000; k++) {
      const t = (0.02 * k) / 200_000;
      const i = (sol.at(t) as number[])[1];
      if (Math.abs(i) > Math.abs(best.i)) best = { t, i };
    }
    expect(rel(peaks[0].i, best.i)).toBeLessThan(1e-7);
    expect(Math.abs(peaks[0].t - best.t)).toBeLessThan(0.02 / 200_000);
  });
});

describe('free response, steady state and resonance', () => {
  it('takes a plain 0 as no source and gives the free discharge of a charged capacitor (closed form: |i|max = q0·ω0·e^(−α t*))', () => {
    const L = 0.02;
    const C = 50e-6;
    const a = 4 / (2 * L);
    const w0 = 1 / Math.sqrt(L * C);
    const wd = Math.sqrt(w0 * w0 - a * a);
    const tStar = Math.atan(wd / a) / wd;
    // q = q0·e^(−αt)(cos ωd t + α/ωd sin ωd t), i = −q0·(ω0²/ωd)·e^(−αt)·sin ωd t (from memory; differentiate to confirm).
    const r = transient('4 ohm', '0', { q0: '2 mC' });
    expect(rel(r.peaks!.current.peak.value.si as number, -2e-3 * w0 * Math.exp(-a * tStar))).toBeLessThan(1e-9);
    expect(rel(r.peaks!.current.peak.time.si as number, tStar)).toBeLessThan(1e-9);
    expect(r.steady?.q_ss.si).toBe(0);
  });

  it('reports the steady charge C·E0 and capacitor voltage E0 for a constant source', () => {
    const r = transient('4 ohm', '48 V');
    expect(rel(r.steady!.q_ss.si as number, 50e-6 * 48)).toBeLessThan(1e-15);
    expect(r.steady!.v_C_ss.si).toBe(48);
    expect(r.steady!.i_ss.si).toBe(0);
  });

  it('reports the steady amplitudes E0/Z, E0/(ωZ) and E0/(ωCZ) for a sinusoid (phasor analysis; Alexander and Sadiku, Fundamentals of Electric Circuits, ch. 9; from memory)', () => {
    const w = 2 * Math.PI * 60;
    const S = w * 0.02 - 1 / (w * 50e-6);
    const Z = Math.hypot(6, S);
    const r = transient('6 ohm', '100 V * cos(2 pi 60 Hz * t)');
    expect(rel(r.steady!.I_ss.si as number, 100 / Z)).toBeLessThan(1e-12);
    expect(rel(r.steady!.Q_ss.si as number, 100 / (w * Z))).toBeLessThan(1e-12);
    expect(rel(r.steady!.V_C_ss.si as number, 100 / (w * 50e-6 * Z))).toBeLessThan(1e-12);
    expect(rel(r.steady!.phi.si as number, Math.atan2(S, 6))).toBeLessThan(1e-12);
  });

  it('solves a lossless LC driven at resonance over the span: q = E0/(2Lω0²)(sin ω0t − ω0t cos ω0t) (Boyce and DiPrima, Elementary Differential Equations, 3.8, resonance; from memory), with a warning', () => {
    const L = 0.01;
    const C = 100e-6;
    const w0 = 1 / Math.sqrt(L * C); // 1000 rad/s
    const r = evaluateSheet({
      cells: [
        { kind: 'calc', source: 'L = 10 mH\nC = 100 uF\nw_0 = natural_frequency(L, C)' },
        { kind: 'transient', R: '0 ohm', L: 'L', C: 'C', source: '10 V * sin(w_0 * t)', span: '50 ms', points: 501 },
      ],
    }).cells[1] as TransientResult;
    expect(r.status).toBe('ok');
    expect(r.warnings.map((w) => w.message).join(' ')).toMatch(/grows .* without bound/);
    expect(r.steady).toBeUndefined();
    const q = (t: number) => (10 / (2 * L * w0 * w0)) * (Math.sin(w0 * t) - w0 * t * Math.cos(w0 * t));
    const scale = Math.max(...r.time!.values.map((t) => Math.abs(q(t))));
    r.time!.values.forEach((t, k) => {
      expect(Math.abs(r.chargeAnalytic!.values[k] - q(t))).toBeLessThan(1e-12 * scale);
      expect(Math.abs(r.charge!.values[k] - q(t))).toBeLessThan(1e-8 * scale);
    });
    // numeric.dopri 1.2.6 agrees with the same growth at the end of the span.
    const sol = numeric.dopri(0, 0.05, [0, 0], (t: number, y: number[]) => [y[1], (10 * Math.sin(w0 * t) - y[0] / C) / L], 1e-12, 1e6);
    expect(rel((sol.at(0.05) as number[])[0], q(0.05))).toBeLessThan(1e-8);
  });
});
