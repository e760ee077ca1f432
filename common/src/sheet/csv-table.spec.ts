import { describe, expect, it } from 'vitest';
import { csvToTableCell, describeDetected } from './csv-table';

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
      detected: { delimiter: ',', decimalMark: '.', rows: 2, columns: 2 },
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

  it('stops at 200 000 values (rows × columns), so that the table can always be saved back', () => {
    const header = Array.from({ length: 20 }, (_, j) => `c${j}`).join(',');
    const line = Array.from({ length: 20 }, (_, j) => String(j)).join(',');
    const wide = [header, ...Array.from({ length: 10_001 }, () => line)].join('\n');
    expect(csvToTableCell(wide)).toEqual({
      ok: false,
      problems: [{ line: 10_002, message: 'a table holds at most 200,000 values (rows × columns): with 20 columns, at most 10,000 rows' }],
    });
    expect(csvToTableCell([header, ...Array.from({ length: 10_000 }, () => line)].join('\n')).ok).toBe(true);
  });

  it('lists the first 20 problems and counts the rest', () => {
    const r = csvToTableCell(`h\n${'x\n'.repeat(500)}`);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems).toHaveLength(21);
    expect(r.problems[20].message).toBe('and 480 more problems like these');
  });
});

describe('csvToTableCell detects the delimiter and the decimal mark', () => {
  // Spreadsheets in locales with a decimal comma export CSV with semicolons between values (common practice).
  it('reads semicolons and decimal commas, and says so', () => {
    const r = csvToTableCell('h;I_h [A]\n1;10,5\n5;2,25\n7;1\n');
    expect(r).toEqual({
      ok: true,
      cell: {
        kind: 'table',
        columns: [{ name: 'h' }, { name: 'I_h', unit: 'A' }],
        rows: [
          [1, 10.5],
          [5, 2.25],
          [7, 1],
        ],
      },
      detected: { delimiter: ';', decimalMark: ',', rows: 3, columns: 2 },
    });
    if (r.ok) expect(describeDetected(r.detected)).toBe('3 rows × 2 columns, values separated by semicolons, decimal comma');
  });

  it('reads tabs and bars with decimal points, and exponents with either mark', () => {
    expect(csvToTableCell('f [Hz]\tZ [ohm]\n50\t1.5e-3\n250\t0.75\n')).toMatchObject({
      ok: true,
      cell: {
        rows: [
          [50, 0.0015],
          [250, 0.75],
        ],
      },
      detected: { delimiter: '\t', decimalMark: '.' },
    });
    expect(csvToTableCell('a|b\n1,5E2|-,5\n')).toMatchObject({ ok: true, cell: { rows: [[150, -0.5]] }, detected: { delimiter: '|', decimalMark: ',' } });
  });

  it('refuses a second decimal mark in one file, naming the line that set the first', () => {
    expect(csvToTableCell('a;b\n1;2,5\n3;4.5\n')).toEqual({
      ok: false,
      problems: [{ line: 3, message: 'column b: "4.5" has a decimal point, where line 2 has a decimal comma: one file uses one decimal mark' }],
    });
    expect(csvToTableCell('a,b\n1,"2,5"\n')).toEqual({
      ok: false,
      problems: [{ line: 2, message: 'column b: "2,5" has a decimal comma, but the values are separated by commas, so the decimal mark is a point' }],
    });
  });

  it('refuses a value of 60 000 digits and a letter at once (no regular expression that backtracks over it)', () => {
    const started = performance.now();
    const r = csvToTableCell(`a;b\n1;${'9'.repeat(60_000)}x\n`);
    expect(r).toMatchObject({ ok: false, problems: [{ line: 2 }] });
    expect(performance.now() - started).toBeLessThan(1000);
  });

  it('reads no hexadecimal, Infinity or thousands separators as numbers', () => {
    for (const v of ['0x10', 'Infinity', '1.234,5', '1 000', '1e400'])
      expect(csvToTableCell(`a;b\n1;${v}\n`)).toMatchObject({ ok: false, problems: [{ line: 2, message: `column b: "${v}" is not a number` }] });
  });

  it('reads one column of integers with a point as the decimal mark', () => {
    expect(csvToTableCell('n\n1\n2\n')).toMatchObject({ ok: true, detected: { delimiter: ',', decimalMark: '.', rows: 2, columns: 1 } });
    expect(describeDetected({ delimiter: ',', decimalMark: '.', rows: 1, columns: 1 })).toBe('1 row × 1 column, decimal point');
  });
});
