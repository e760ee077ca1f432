import { describe, expect, it } from 'vitest';
import { evaluateSheet } from '../cells/evaluate-sheet';
import type { Cell } from '../sheet/sheet-format';
import { diffCells, type SnapshotCell } from './diff';
import { canonicalJson, revisionCode } from './revision-code';

const snapshot = (cells: Cell[], ids: string[]): SnapshotCell[] => {
  const ev = evaluateSheet({ cells });
  return cells.map((c, i) => {
    const { kind, ...fields } = c as Cell & Record<string, unknown>;
    return { id: ids[i], kind, fields, results: ev.cells[i] };
  });
};

describe('revision codes', () => {
  it('letters revisions A to Z, then AA, AB (common practice)', () => {
    expect([1, 2, 26, 27, 28, 52, 53, 702, 703].map(revisionCode)).toEqual(['A', 'B', 'Z', 'AA', 'AB', 'AZ', 'BA', 'ZZ', 'AAA']);
    expect(() => revisionCode(0)).toThrow(RangeError);
  });

  it('writes canonical JSON with sorted keys, so equal snapshots hash alike', () => {
    expect(canonicalJson({ b: 1, a: { d: [2, { f: 1, e: 2 }], c: undefined } })).toBe('{"a":{"d":[2,{"e":2,"f":1}]},"b":1}');
  });
});

describe('diff between two states of a sheet', () => {
  const cells = (R: string): Cell[] => [
    { kind: 'calc', source: `R = ${R}\nX = 4 ohm\nZ = sqrt(R^2 + X^2)` },
    { kind: 'calc', source: 'I = 10 V / Z to A' },
    { kind: 'calc', source: 'k = 2' },
    { kind: 'check', condition: 'I <= 2.5 A' },
  ];

  it('shows a changed input and every result that depends on it, and nothing else', () => {
    const a = snapshot(cells('3 ohm'), ['c1', 'c2', 'c3', 'c4']);
    const b = snapshot(cells('6 ohm'), ['c1', 'c2', 'c3', 'c4']);
    const d = diffCells(a, b);
    expect(d.map((c) => c.status)).toEqual(['changed', 'changed', 'same', 'changed']);
    expect(d[0].inputs).toEqual([{ field: 'source', before: expect.stringContaining('R = 3 ohm'), after: expect.stringContaining('R = 6 ohm') }]);
    // Z = 5 ohm → √52 = 7.211 ohm; I = 2 A → 1.387 A (Pythagoras and Ohm's law).
    expect(d[0].results.map((r) => r.name).sort()).toEqual(['R', 'Z']);
    expect(d[1].inputs).toEqual([]);
    expect(d[1].results).toEqual([{ name: 'I', before: expect.stringMatching(/^2(\.0+)? A$/), after: expect.stringMatching(/^1\.387 A$/) }]);
    expect(d[3].results.find((r) => r.name === 'utilisation')).toBeDefined();
  });

  it('reports added and removed cells', () => {
    const a = snapshot(cells('3 ohm'), ['c1', 'c2', 'c3', 'c4']);
    const b = snapshot([...cells('3 ohm').slice(0, 3), { kind: 'note', text: 'new' }], ['c1', 'c2', 'c3', 'c9']);
    const d = diffCells(a, b);
    expect(d.filter((c) => c.status === 'added').map((c) => c.id)).toEqual(['c9']);
    expect(d.filter((c) => c.status === 'removed').map((c) => c.id)).toEqual(['c4']);
  });
});
