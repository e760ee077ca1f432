import { describe, expect, it } from 'vitest';
import { evaluateSheet } from '../cells/evaluate-sheet';
import type { CalcResult, SweepResult, TransientResult } from '../cells/types';
import { calcFigures, impedanceTriangle, sweepChart, transientChart } from './charts';

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
});
