import { describe, expect, it } from 'vitest';
import { evaluateSheet } from './evaluate-sheet';
import type { SweepResult, TransientResult } from './types';

const rlc = 'R = 10 ohm\nL = 50 mH\nC = 100 uF\nE0 = 100 V';

describe('sweep cells', () => {
  it('sweeps a frequency linearly and gives the complex current at each point', () => {
    const r = evaluateSheet({
      cells: [
        { kind: 'calc', source: rlc },
        {
          kind: 'sweep',
          variable: 'f',
          from: '10 Hz',
          to: '100 Hz',
          points: 10,
          outputs: ['E0 / (R + j (2 pi f L - 1 / (2 pi f C)))', 'abs(E0 / (R + j (2 pi f L - 1 / (2 pi f C))))'],
        },
      ],
    }).cells[1] as SweepResult;
    expect(r.status).toBe('ok');
    expect(r.variable?.values).toHaveLength(10);
    expect(r.variable?.values[9]).toBeCloseTo(100, 12);
    const [complexOut, magnitude] = r.outputs;
    expect(complexOut.complex).toBe(true);
    expect(complexOut.unit).toBe('A');
    r.variable!.values.forEach((f, k) => {
      const S = 2 * Math.PI * f * 0.05 - 1 / (2 * Math.PI * f * 100e-6);
      expect(magnitude.values[k]).toBeCloseTo(100 / Math.hypot(10, S), 10);
      expect(Math.hypot(complexOut.values[k], complexOut.im![k])).toBeCloseTo(100 / Math.hypot(10, S), 10);
    });
  });

  it('falls back from the fast paths where real arithmetic cannot follow (square root of a negative)', () => {
    const r = evaluateSheet({ cells: [{ kind: 'sweep', variable: 'x', from: '-4', to: '4', points: 3, outputs: ['sqrt(x)', 'x^2 - 1'] }] })
      .cells[0] as SweepResult;
    expect(r.status).toBe('ok');
    expect(r.outputs[0]).toMatchObject({ complex: true, values: [0, 0, 2], im: [2, 0, 0] });
    expect(r.outputs[1].values).toEqual([15, -1, 15]);
  });

  it('uses the circuit functions in a sweep', () => {
    const r = evaluateSheet({
      cells: [
        { kind: 'calc', source: rlc },
        { kind: 'sweep', variable: 'f', from: '10 Hz', to: '100 Hz', points: 5, outputs: ['rlc_amplitude(E0, R, L, C, 2 pi f)'] },
      ],
    }).cells[1] as SweepResult;
    expect(r.outputs[0].unit).toBe('A');
    r.variable!.values.forEach((f, k) => {
      const S = 2 * Math.PI * f * 0.05 - 1 / (2 * Math.PI * f * 100e-6);
      expect(r.outputs[0].values[k]).toBeCloseTo(100 / Math.hypot(10, S), 10);
    });
  });

  it('spaces a logarithmic sweep by equal ratios', () => {
    const r = evaluateSheet({ cells: [{ kind: 'sweep', variable: 'f', from: '1 Hz', to: '1 kHz', points: 4, spacing: 'log', outputs: ['2 f'] }] })
      .cells[0] as SweepResult;
    expect(r.variable?.values.map((v) => Math.round(v * 1e9) / 1e9)).toEqual([1, 10, 100, 1000]);
  });

  it('checks units once and reports a mismatch in an output', () => {
    const r = evaluateSheet({
      cells: [
        { kind: 'calc', source: rlc },
        { kind: 'sweep', variable: 'f', from: '1 Hz', to: '2 Hz', points: 3, outputs: ['R + f'] },
      ],
    }).cells[1] as SweepResult;
    expect(r.status).toBe('error');
    expect(r.errors[0].message).toMatch(/cannot add an? resistance or impedance and a frequency/);
  });

  it('refuses a start and end of different kinds', () => {
    const r = evaluateSheet({ cells: [{ kind: 'sweep', variable: 'f', from: '1 Hz', to: '2 V', points: 3, outputs: ['f'] }] }).cells[0] as SweepResult;
    expect(r.errors[0].message).toMatch(/one kind/);
  });
});

describe('transient cells', () => {
  const transient = (R: string, source: string, extra: Record<string, string> = {}) =>
    evaluateSheet({
      cells: [
        { kind: 'calc', source: `R = ${R}\nL = 50 mH\nC = 100 uF` },
        { kind: 'transient', R: 'R', L: 'L', C: 'C', source, span: '100 ms', points: 2001, ...extra },
      ],
    }).cells[1] as TransientResult;

  it.each([
    ['5 ohm', 'underdamped'],
    [`${2 * Math.sqrt(0.05 / 100e-6)} ohm`, 'critically damped'],
    ['100 ohm', 'overdamped'],
  ])('agrees with the analytic solution for a step source, R = %s (%s)', (R, damping) => {
    const r = transient(R, '100 V');
    expect(r.status).toBe('ok');
    expect(r.dampingCase).toBe(damping);
    expect(r.analytic?.available).toBe(true);
    expect(r.maxRelativeDeviation).toBeLessThan(1e-6);
    expect(r.current?.values[0]).toBe(0);
  });

  it('agrees with the analytic solution for a sinusoidal source and splits steady and transient parts', () => {
    const r = transient('5 ohm', '100 V * sin(2 pi 50 Hz * t + 30 deg)', { q0: '1 mC', i0: '0.5 A' });
    expect(r.analytic?.sourceForm).toBe('sinusoid');
    expect(r.maxRelativeDeviation).toBeLessThan(1e-6);
    expect(r.charge?.values[0]).toBeCloseTo(1e-3, 12);
    expect(r.current?.values[0]).toBeCloseTo(0.5, 9);
    const i = r.current!.values;
    r.currentSteady!.values.forEach((s, k) => expect(s + r.currentTransient!.values[k]).toBeCloseTo(i[k], 12));
  });

  it('solves any source numerically and says that no analytic solution is given', () => {
    const r = transient('5 ohm', '100 V * t / (1 ms + t)');
    expect(r.status).toBe('ok');
    expect(r.analytic?.available).toBe(false);
    expect(r.peakCurrent?.si).not.toBe(0);
  });

  it('refuses a source that is not a voltage', () => {
    const r = transient('5 ohm', '3 A');
    expect(r.errors[0].message).toMatch(/must be a voltage/);
  });
});

describe('incremental evaluation', () => {
  const sheet = (r: string) => ({
    cells: [
      { kind: 'calc' as const, source: `R = ${r}` },
      { kind: 'calc' as const, source: 'x = 2' },
      { kind: 'calc' as const, source: 'P = R * 1 A^2' },
    ],
  });

  it('evaluates only the changed cell and the cells below that read what changed', () => {
    const first = evaluateSheet(sheet('10 ohm'));
    expect(first.evaluated).toEqual([0, 1, 2]);
    const second = evaluateSheet(sheet('12 ohm'), first.cache);
    expect(second.evaluated).toEqual([0, 2]);
    expect((second.cells[2] as { values: Record<string, { si: unknown }> }).values.P.si).toBe(12);
    const third = evaluateSheet(sheet('12 ohm'), second.cache);
    expect(third.evaluated).toEqual([]);
  });

  it('re-evaluates a cell when a name it read as a unit becomes a variable above', () => {
    const a = evaluateSheet({
      cells: [
        { kind: 'calc', source: 'y = 1' },
        { kind: 'calc', source: 'q = 5 C' },
      ],
    });
    const b = evaluateSheet(
      {
        cells: [
          { kind: 'calc', source: 'C = 2' },
          { kind: 'calc', source: 'q = 5 C' },
        ],
      },
      a.cache,
    );
    expect(b.evaluated).toEqual([0, 1]);
    expect((b.cells[1] as { values: Record<string, { si: unknown }> }).values.q.si).toBe(10);
  });
});
