/**
 * A CSV of measurements as a table cell: the header row names the columns, each optionally with a
 * unit in brackets (`h, I_h [A]`); every other row holds numbers. Parsed with papaparse. A bad row is
 * reported by its line number, and then no cell is made at all.
 */
import Papa from 'papaparse';
import type { TableCell } from './sheet-format';

export type CsvTableResult = { ok: true; cell: TableCell } | { ok: false; problems: { line: number; message: string }[] };

const HEADER = /^\s*([A-Za-z_][A-Za-z0-9_]*)\s*(?:\[\s*([^\]]*?)\s*\])?\s*$/;
export const MAX_CSV_ROWS = 20_000;

export function csvToTableCell(text: string): CsvTableResult {
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy' });
  const problems: { line: number; message: string }[] = parsed.errors.map((e) => ({ line: (e.row ?? 0) + 1, message: e.message }));
  const rows = parsed.data;
  if (rows.length === 0) return { ok: false, problems: [{ line: 1, message: 'the file is empty: the first row must name the columns, for example h, I_h [A]' }] };
  if (rows.length - 1 > MAX_CSV_ROWS) return { ok: false, problems: [{ line: MAX_CSV_ROWS + 2, message: `a table holds at most ${MAX_CSV_ROWS} rows` }] };
  const columns = rows[0].map((h, i) => {
    const m = HEADER.exec(h);
    if (!m) {
      problems.push({ line: 1, message: `column ${i + 1}: "${h.trim()}" is not a name with an optional [unit] (for example I_h [A])` });
      return { name: `col${i + 1}` };
    }
    return m[2] ? { name: m[1], unit: m[2] } : { name: m[1] };
  });
  const names = new Set<string>();
  for (const c of columns) {
    if (names.has(c.name)) problems.push({ line: 1, message: `the column name ${c.name} appears twice` });
    names.add(c.name);
  }
  const data: number[][] = [];
  rows.slice(1).forEach((row, r) => {
    const line = r + 2;
    if (row.length !== columns.length) {
      problems.push({ line, message: `has ${row.length} values where the header names ${columns.length} columns` });
      return;
    }
    const values = row.map((v) => Number(v.trim()));
    const bad = row.findIndex((v, i) => v.trim() === '' || !Number.isFinite(values[i]));
    if (bad >= 0) {
      problems.push({ line, message: `column ${columns[bad].name}: "${row[bad].trim()}" is not a number` });
      return;
    }
    data.push(values);
  });
  if (rows.length === 1 && problems.length === 0) problems.push({ line: 2, message: 'the file has a header but no rows of values' });
  if (problems.length) return { ok: false, problems: problems.sort((a, b) => a.line - b.line) };
  return { ok: true, cell: { kind: 'table', columns, rows: data } };
}
