import { describe, expect, it } from 'vitest';
import { parseSheetFile, parseSheetJson, SHEET_FORMAT } from './sheet-format';

const example = {
  format: SHEET_FORMAT,
  title: 'Branch current at 50 Hz',
  settings: { significantDigits: 4 },
  cells: [
    { kind: 'note', text: 'Markdown, with $inline$ maths.' },
    { kind: 'calc', source: 'R = 12 ohm\nL = 40 mH' },
    { kind: 'check', condition: 'I_rms <= 1.35 * I_rated', basis: 'IEEE Std 18' },
  ],
};

describe('parseSheetFile', () => {
  it('accepts the example of the format contract', () => {
    const result = parseSheetFile(example);
    expect(result.ok).toBe(true);
  });

  it('keeps fields it does not know, at the top and in cells', () => {
    const input = { ...example, reviewedBy: 'x', cells: [{ kind: 'note', text: 'a', colour: 'teal' }] };
    const result = parseSheetFile(input);
    if (!result.ok) throw new Error(JSON.stringify(result.problems));
    expect(result.sheet).toMatchObject({ reviewedBy: 'x' });
    expect(result.sheet.cells[0]).toMatchObject({ colour: 'teal' });
  });

  it('rejects a wrong format tag with a message naming the expected one', () => {
    const result = parseSheetFile({ ...example, format: 'something/2' });
    expect(result).toEqual({ ok: false, problems: [{ path: 'format', message: `format must be "${SHEET_FORMAT}"` }] });
  });

  it('holds a table to 20 000 rows and 200 columns, saying so', () => {
    const table = (rows: number, columns: number) => ({
      kind: 'table',
      columns: Array.from({ length: columns }, (_, k) => ({ name: `c${k}` })),
      rows: Array.from({ length: rows }, () => Array<number>(columns).fill(1)),
    });
    expect(parseSheetFile({ ...example, cells: [table(20_000, 1)] }).ok).toBe(true);
    expect(parseSheetFile({ ...example, cells: [table(20_001, 1)] })).toEqual({
      ok: false,
      problems: [{ path: 'cells[0].rows', message: 'a table has at most 20,000 rows' }],
    });
    expect(parseSheetFile({ ...example, cells: [table(1, 201)] })).toMatchObject({
      ok: false,
      problems: [{ path: 'cells[0].columns', message: 'a table has at most 200 columns' }, { path: 'cells[0].rows[0]' }],
    });
  });

  it('holds a table to 200 000 values and a typed value to 32 characters, and a cell text to a million characters', () => {
    const table = (rows: number, columns: number, value: number | string = 1) => ({
      kind: 'table',
      columns: Array.from({ length: columns }, (_, k) => ({ name: `c${k}` })),
      rows: Array.from({ length: rows }, () => Array<number | string>(columns).fill(value)),
    });
    expect(parseSheetFile({ ...example, cells: [table(20_000, 10)] }).ok).toBe(true);
    expect(parseSheetFile({ ...example, cells: [table(20_000, 11)] })).toEqual({
      ok: false,
      problems: [{ path: 'cells[0].rows', message: 'a table holds at most 200,000 values (rows × columns)' }],
    });
    expect(parseSheetFile({ ...example, cells: [table(1, 1, '1'.repeat(33))] })).toMatchObject({
      ok: false,
      problems: [{ path: 'cells[0].rows[0][0]', message: 'a table value is at most 32 characters' }],
    });
    expect(parseSheetFile({ ...example, cells: [{ kind: 'calc', source: 'x'.repeat(1_000_001) }] })).toEqual({
      ok: false,
      problems: [{ path: 'cells[0].source', message: "A calc cell's source is longer than 1,000,000 characters" }],
    });
  });

  it('reports the place of a bad cell', () => {
    const result = parseSheetFile({ ...example, cells: [example.cells[0], { kind: 'calc', source: 7 }] });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.problems[0].path).toBe('cells[1].source');
    expect(result.problems[0].message).toMatch(/source must be text/);
  });

  it('rejects an unknown cell kind by listing the known ones', () => {
    const result = parseSheetFile({ ...example, cells: [{ kind: 'chart' }] });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.problems[0].message).toMatch(/kind must be one of note, calc, check/);
  });

  it('rejects out-of-range significant digits', () => {
    const result = parseSheetFile({ ...example, settings: { significantDigits: 0 } });
    expect(result.ok).toBe(false);
  });

  it('reports JSON syntax errors instead of throwing', () => {
    const result = parseSheetJson('{"format": ');
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.problems[0].message).toMatch(/not valid JSON/);
  });
});
