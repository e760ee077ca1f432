import { describe, expect, it, vi } from 'vitest';

// language/math.ts sets up the one mathjs instance and imports modules that import it back; each of them must
// work whichever is loaded first (a module that used the instance while loading would break one of these orders).
const FIRST = ['./math', '../units/quantities', '../circuits/functions', '../units/display', '../cells/evaluate-sheet'] as const;

describe('the instance of the language, whichever module is loaded first', () => {
  it.each(FIRST)(
    'evaluates a sheet that needs the units, the 2π rule and the trade’s functions after loading %s first',
    async (first) => {
      vi.resetModules();
      await import(/* @vite-ignore */ first);
      const { evaluateSheet } = await import('../cells/evaluate-sheet');
      const { cells } = evaluateSheet({
        cells: [{ kind: 'calc', source: 'f = 50 Hz\nw = 2 pi f\nX = reactance_L(10 mH, f)\nS = 3 kVA' }],
      });
      const values = cells[0].kind === 'calc' ? cells[0].values : {};
      expect(cells[0].errors).toEqual([]);
      expect(values.w.display).toMatch(/rad\/s$/);
      // X_L = 2π · 50 Hz · 10 mH = 3.14159… Ω (the definition of inductive reactance, common practice).
      expect(values.X.si).toBeCloseTo(Math.PI, 12);
      expect(values.S.display).toMatch(/kVA$/);
    },
    30_000,
  );
});
