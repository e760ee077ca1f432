import { describe, expect, it } from 'vitest';
import { evaluateSheet } from '../cells/evaluate-sheet';
import { math } from './math';
import { LANGUAGE_FUNCTIONS, LANGUAGE_UNITS, namesDefinedIn } from './vocabulary';

describe('the completion vocabulary', () => {
  it('offers only functions the engine has (common practice: the list is checked, not trusted)', () => {
    const missing = LANGUAGE_FUNCTIONS.filter((f) => typeof (math as unknown as Record<string, unknown>)[f.label] !== 'function').map((f) => f.label);
    expect(missing).toEqual([]);
  });

  it('offers only units the engine parses', () => {
    const bad = LANGUAGE_UNITS.filter((u) => {
      const out = evaluateSheet({ cells: [{ kind: 'calc', source: `x = 1 ${u.label}` }] }).cells[0];
      return out.status !== 'ok';
    }).map((u) => u.label);
    expect(bad).toEqual([]);
  });

  it('finds the names a source defines, not comparisons', () => {
    expect(namesDefinedIn('R = 1 ohm\n  X_L = w L # note\nR == 2\n# c = 3')).toEqual(['R', 'X_L']);
  });
});
