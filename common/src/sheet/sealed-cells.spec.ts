import { describe, expect, it, vi } from 'vitest';
import { evaluateSheet } from '../cells/evaluate-sheet';
import { CELL_KINDS, type Cell } from './sheet-format';
import { cellJson, isSealed, sealCell } from './sealed-cells';

/** One cell of every kind, reading and defining names across cells. */
const sheet = (): Cell[] => [
  { kind: 'note', text: 'Feeder to the pump house' },
  { kind: 'calc', source: 'R = 3 ohm\nX = 4 ohm\nZ = R + 1i * X\nC_b = 3 Mvar / (2 pi * 50 Hz * (11 kV)^2)' },
  { kind: 'check', condition: 'abs(Z) <= 6 ohm', basis: 'our limit', severity: 'mandatory' },
  { kind: 'sweep', variable: 'f', from: '10 Hz', to: '1 kHz', points: 20, spacing: 'log', outputs: ['2 * pi * f * 1 mH'] },
  { kind: 'transient', R: '1 ohm', L: '1 mH', C: '100 uF', source: '10 V', span: '5 ms' },
  {
    kind: 'table',
    columns: [{ name: 'h' }, { name: 'I_h', unit: 'A' }],
    rows: [
      [5, 1.5],
      [7, '0.9'],
    ],
  },
  { kind: 'figure', caption: 'One-line diagram' },
  {
    kind: 'network',
    frequency: '50 Hz',
    reference: 'gnd',
    analysis: 'steady',
    elements: [
      { name: 'Grid', kind: 'supply', a: 'B', b: 'gnd', values: ['11 kV', '250 MVA', '20'] },
      { name: 'Bank', kind: 'capacitor', a: 'B', b: 'gnd', values: ['C_b'] },
    ],
  } as Cell,
  { kind: 'calc', source: 'I_total = sum(I_h)\nV = abs(V_B)' },
];

describe('sealed cells', () => {
  it('freezes a cell and everything in it, so it cannot change under what was read from it', () => {
    const cell = sealCell({ kind: 'table', columns: [{ name: 'I', unit: 'A' }], rows: [[1], [2]] });
    expect(isSealed(cell)).toBe(true);
    expect(
      Object.isFrozen(cell) && cell.kind === 'table' && Object.isFrozen(cell.rows) && Object.isFrozen(cell.rows[1]) && Object.isFrozen(cell.columns[0]),
    ).toBe(true);
    expect(() => (cell as { rows: unknown[][] }).rows[1].push(3)).toThrow(TypeError);
    expect(isSealed({ kind: 'note', text: 'x' })).toBe(false);
  });

  it("writes a sealed cell's JSON once, the same as JSON.stringify, and an unsealed cell's every time", () => {
    const sealed = sealCell({ kind: 'calc', source: 'x = 1 V' });
    const loose: Cell = { kind: 'calc', source: 'x = 1 V' };
    const stringify = vi.spyOn(JSON, 'stringify');
    try {
      for (let k = 0; k < 3; k++) {
        expect(cellJson(sealed)).toBe(JSON.stringify(loose));
        expect(cellJson(loose)).toBe('{"kind":"calc","source":"x = 1 V"}');
      }
      // Three for the loose cell, three for the comparisons, and one for the sealed cell.
      expect(stringify).toHaveBeenCalledTimes(7);
    } finally {
      stringify.mockRestore();
    }
  });

  it('evaluates every kind sealed exactly as unsealed, fresh and after an edit with the kept cache (no evaluator changes a cell)', () => {
    const cells = sheet();
    expect(new Set(cells.map((c) => c.kind))).toEqual(new Set(CELL_KINDS));
    const fresh = evaluateSheet({ cells: sheet() });
    expect(fresh.cells.every((r) => r.status === 'ok')).toBe(true);
    const sealed = evaluateSheet({ cells: cells.map(sealCell) });
    expect(sealed.cells).toEqual(fresh.cells);

    const edit: Cell = { kind: 'calc', source: 'R = 5 ohm\nX = 4 ohm\nZ = R + 1i * X\nC_b = 2 Mvar / (2 pi * 50 Hz * (11 kV)^2)' };
    const edited = evaluateSheet({ cells: [...cells.slice(0, 1), sealCell(edit), ...cells.slice(2)] }, sealed.cache);
    const editedFresh = evaluateSheet({ cells: [...sheet().slice(0, 1), { ...edit }, ...sheet().slice(2)] });
    expect(edited.cells).toEqual(editedFresh.cells);
    // The note, the sweep, the transient, the table and the figure read nothing the edit changed.
    expect(edited.evaluated).toEqual([1, 2, 7, 8]);
  });
});
