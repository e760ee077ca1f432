import { describe, expect, it } from 'vitest';
import { csvToTableCell } from './csv-table';

describe('csvToTableCell', () => {
  it('reads a header with units and rows of numbers', () => {
    expect(csvToTableCell('h, I_h [A]\n1, 100\n5, 12.5\n')).toEqual({
      ok: true,
      cell: { kind: 'table', columns: [{ name: 'h' }, { name: 'I_h', unit: 'A' }], rows: [[1, 100], [5, 12.5]] },
    });
  });

  it('names the line of a bad row and makes no cell', () => {
    const r = csvToTableCell('h,V_h [V]\n1,230\n5,eleven\n7,8');
    expect(r).toEqual({ ok: false, problems: [{ line: 3, message: 'column V_h: "eleven" is not a number' }] });
  });

  it('reports rows of the wrong length and headers that are not names', () => {
    const r = csvToTableCell('h,2nd col\n1,2,3');
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems.map((p) => p.line)).toEqual([1, 2]);
  });

  it('refuses an empty file and a header without rows', () => {
    expect(csvToTableCell('').ok).toBe(false);
    expect(csvToTableCell('h,V_h [V]\n')).toMatchObject({ ok: false, problems: [{ line: 2 }] });
  });
});
