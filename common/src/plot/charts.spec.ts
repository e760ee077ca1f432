import { describe, expect, it } from 'vitest';
import { evaluateSheet } from '../cells/evaluate-sheet';
import type { CalcResult, SweepResult, TransientResult } from '../cells/types';
import { calcFigures, impedanceTriangle, sweepChart, sweepPlot, transientChart, transientPlot } from './charts';

const lines = (svg: string) => [...svg.matchAll(/<line x1="([-\d.]+)" y1="([-\d.]+)" x2="([-\d.]+)" y2="([-\d.]+)"/g)].map((m) => m.slice(1).map(Number));

describe('impedance triangle', () => {
  it('draws R, X and Z in proportion: a 3–4–5 triangle (Pythagoras, common practice)', () => {
    const svg = impedanceTriangle('Z', 3, 4, { R: '3 Ω', X: '4 Ω', Z: '5 Ω', phi: '53.13°' });
    const [r, x, z] = lines(svg);
    const len = ([x1, y1, x2, y2]: number[]) => Math.hypot(x2 - x1, y2 - y1);
    expect(len(x) / len(r)).toBeCloseTo(4 / 3, 2);
    expect(len(z) / len(r)).toBeCloseTo(5 / 3, 2);
    expect(svg).toContain('|Z| = 5 Ω');
    expect(svg).toContain('φ = 53.13°');
  });

  it('puts a capacitive reactance below the base', () => {
    const [r, x] = lines(impedanceTriangle('Z', 3, -4, { R: '', X: '', Z: '', phi: '' }));
    expect(x[3]).toBeGreaterThan(r[1]);
  });

  it('escapes names so no markup can be injected', () => {
    expect(impedanceTriangle('<script>', 1, 1, { R: '', X: '', Z: '', phi: '' })).not.toContain('<script>');
  });
});

describe('charts from evaluated cells', () => {
  const sheet = evaluateSheet({
    cells: [
      { kind: 'calc', source: 'R = 10 ohm\nL = 10 mH\nC = 10 uF\nZ_c = R + j 2 pi 50 Hz L\nI_c = 230 V / Z_c' },
      { kind: 'sweep', variable: 'f', from: '10 Hz', to: '10 kHz', points: 61, spacing: 'log', outputs: ['1 / (1 + j 2 pi f R C)'] },
      { kind: 'transient', R: '10 ohm', L: '10 mH', C: '10 uF', source: '100 V', span: '5 ms' },
    ],
  });

  it('draws an impedance triangle for a complex impedance and a phasor diagram for the current', () => {
    const figures = calcFigures(sheet.cells[0] as CalcResult);
    expect(figures.map((f) => f.kind)).toEqual(['impedance-triangle', 'phasors']);
    expect(figures[1].svg).toContain('I_c');
  });

  it('draws a sweep on a log axis labelled with its unit, with magnitude and phase panels', () => {
    const svg = sweepChart(sheet.cells[1] as SweepResult, { logX: true })!;
    expect(svg).toContain('f [Hz]');
    expect(svg).toContain('phase [deg]');
    // Decade ticks only on a three-decade log axis with 1, 2, 5 kept.
    for (const tick of ['10', '100', '1k', '10k']) expect(svg).toContain(`>${tick}</text>`);
    const paths = [...svg.matchAll(/<path d="M([^"]+)"/g)];
    expect(paths).toHaveLength(2);
    expect(paths[0][1].split('L')).toHaveLength(61);
  });

  it('draws a transient against time in seconds with the steady part when a solution is known', () => {
    const svg = transientChart(sheet.cells[2] as TransientResult)!;
    expect(svg).toContain('t [s]');
    expect(svg).toContain('i [A]');
    expect(svg).toContain('steady periodic part');
  });

  it('says what it plots, with units, and zooms to a range of the variable with that range as its axis', () => {
    const whole = sweepPlot(sheet.cells[1] as SweepResult, { logX: true })!;
    expect(whole.data.x).toMatchObject({ name: 'f', unit: 'Hz' });
    expect(whole.data.x.values).toHaveLength(61);
    expect(whole.data.series.map((s) => s.unit)).toEqual(['', 'deg']); // a dimensionless ratio, and its phase
    expect(whole.data.series.every((s) => s.values.length === 61)).toBe(true);
    expect(whole.data).toMatchObject({ log: true, frame: { left: 64, svgWidth: 640 } });
    const zoomed = sweepPlot(sheet.cells[1] as SweepResult, { logX: true, xRange: [200, 50] })!;
    // The range as asked (either order), exactly, and only the points inside it.
    expect(zoomed.data.domain).toEqual([50, 200]);
    expect(zoomed.data.x.values.every((f) => f >= 50 && f <= 200)).toBe(true);
    expect(zoomed.data.x.values.length).toBeLessThan(61);
    expect(zoomed.data.series[0].values).toHaveLength(zoomed.data.x.values.length);
    expect(zoomed.svg).not.toBe(whole.svg);
    // A transient zoomed to its first millisecond.
    const t = transientPlot(sheet.cells[2] as TransientResult, { xRange: [0, 1e-3] })!;
    expect(t.data.domain).toEqual([0, 1e-3]);
    expect(t.data.series.map((s) => s.name)).toContain('steady periodic part');
    expect(t.data.x.values.every((v) => v <= 1e-3)).toBe(true);
  });
});
