import { describe, expect, it } from 'vitest';
import { csvToTableCell } from './csv-table';

describe('csvToTableCell', () => {
  it('reads a header with units and rows of numbers', () => {
    expect(csvToTableCell('h, I_h [A]\n1, 100\n5, 12.5\n')).toEqual({
      ok: true,
      cell: {
        kind: 'table',
        columns: [{ name: 'h' }, { name: 'I_h', unit: 'A' }],
        rows: [
          [1, 100],
          [5, 12.5],
        ],
      },
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

describe('csvToTableCell with hostile files', () => {
  it('refuses an over-long line before parsing it (a header of 12 million columns)', () => {
    const started = performance.now();
    const r = csvToTableCell(`${'a,'.repeat(12_000_000)}b\n1\n`);
    expect(r).toEqual({ ok: false, problems: [{ line: 1, message: 'is 24,000,001 characters long; a line may hold at most 65,536' }] });
    expect(performance.now() - started).toBeLessThan(1000);
  });

  it('refuses too many columns while streaming, and too many rows', () => {
    const wide = Array.from({ length: 300 }, (_, k) => `c${k}`).join(',');
    expect(csvToTableCell(`${wide}\n`)).toEqual({ ok: false, problems: [{ line: 1, message: 'has 300 columns; a table may have at most 200' }] });
    const tall = `h\n${'1\n'.repeat(20_001)}`;
    expect(csvToTableCell(tall)).toEqual({ ok: false, problems: [{ line: 20_002, message: 'a table holds at most 20,000 rows' }] });
  });

  it('lists the first 20 problems and counts the rest', () => {
    const r = csvToTableCell(`h\n${'x\n'.repeat(500)}`);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems).toHaveLength(21);
    expect(r.problems[20].message).toBe('and 480 more problems like these');
  });
});
