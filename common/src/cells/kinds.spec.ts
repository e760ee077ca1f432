import { describe, expect, it } from 'vitest';
import { CELL_KINDS, cellSchema, type Cell } from '../sheet/sheet-format';
import { evaluateSheet, unevaluatedResults } from './evaluate-sheet';
import { CELL_KIND_REGISTRY, cellInputs, newCellFields, presentCell, resultFigures } from './kinds';

describe('the registry of cell kinds', () => {
  it('has an entry for every kind, whose new cell passes its own schema and the file format', () => {
    expect(Object.keys(CELL_KIND_REGISTRY).sort()).toEqual([...CELL_KINDS].sort());
    for (const kind of CELL_KINDS) {
      const cell = { kind, ...newCellFields(kind) };
      expect(CELL_KIND_REGISTRY[kind].schema.safeParse(cell).success, kind).toBe(true);
      expect(cellSchema.safeParse(cell).success, kind).toBe(true);
    }
  });

  it('gives a fresh copy of the defaults each time (editing one new cell does not change the next)', () => {
    const a = newCellFields('table');
    a.rows.push([1]);
    expect(newCellFields('table').rows).toEqual([[null]]);
  });

  it('presents each kind from its fields and result: the blocks the screen and the package both draw', () => {
    const cells: Cell[] = [
      { kind: 'note', text: 'A note with $X_L$' },
      { kind: 'calc', source: 'R = 3 ohm\nX = 4 ohm\nZ = R + 1i * X' },
      { kind: 'check', condition: 'abs(Z) <= 6 ohm', basis: 'Our limit', severity: 'mandatory' },
      { kind: 'sweep', variable: 'f', from: '10 Hz', to: '1 kHz', points: 20, spacing: 'log', outputs: ['2 * pi * f * 1 mH'] },
      { kind: 'transient', R: '1 ohm', L: '1 mH', C: '100 uF', source: '10 V', span: '5 ms' },
      { kind: 'table', columns: [{ name: 'h' }, { name: 'I', unit: 'A' }], rows: [[5, 1.5]] },
      { kind: 'figure', caption: 'One-line diagram' },
    ];
    const { cells: results } = evaluateSheet({ cells });
    const types = cells.map((c, i) => presentCell(c.kind, c, results[i]).map((b) => b.type));
    expect(types).toEqual([['note'], ['lines', 'figure'], ['outcome', 'sentence'], ['sentence', 'figure'], ['rows', 'figure'], ['table'], ['sentence']]);
    const outcome = presentCell('check', cells[2], results[2])[0];
    expect(outcome).toMatchObject({ type: 'outcome', check: { outcome: 'Pass', tone: 'pass' } });
    expect(presentCell('table', cells[5], results[5])[0]).toEqual({
      type: 'table',
      columns: [{ name: 'h' }, { name: 'I', unit: 'A' }],
      rows: [['5', '1.5']],
    });
  });

  it('draws no results that are not the cell’s own (a sheet stopped before it was evaluated)', () => {
    const cell = { kind: 'check' as const, condition: '1 < 2', basis: 'B' };
    const [stopped] = unevaluatedResults(1, 'this sheet needs more memory than a sheet may use');
    expect(presentCell('check', cell, stopped)).toEqual([{ type: 'sentence', text: 'Basis: B', style: 'muted' }]);
    expect(resultFigures('check', stopped)).toEqual({ errors: stopped.errors.map((e) => e.message).join('; ') });
  });

  it('lists the figures a comparison of revisions shows, by kind', () => {
    const { cells: results } = evaluateSheet({
      cells: [
        { kind: 'calc', source: 'a = 2 m' },
        { kind: 'check', condition: 'a <= 4 m' },
      ],
    });
    expect(resultFigures('calc', results[0])).toEqual({ a: '2.000 m' });
    expect(resultFigures('check', results[1])).toEqual({ outcome: 'pass', utilisation: '50.0 %' });
  });

  it('reads the inputs of the kinds whose inputs are text, and nothing for those whose content is the presentation', () => {
    expect(cellInputs('calc', { source: 'a = 1' })).toBe('a = 1');
    expect(cellInputs('sweep', { variable: 'f', from: '1 Hz', to: '2 Hz', points: 3, outputs: ['f', '2 f'] })).toBe(
      'f from 1 Hz to 2 Hz, 3 points (linear)\nf\n2 f',
    );
    expect(cellInputs('note', { text: '# Heading' })).toBe('');
    expect(cellInputs('no-such-kind', {})).toBe('');
  });
});
