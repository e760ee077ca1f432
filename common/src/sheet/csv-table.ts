/**
 * A CSV of measurements as a table cell: the header row names the columns, each optionally with a
 * unit in brackets (`h, I_h [A]`); every other row holds numbers. Parsed with papaparse row by row
 * (its step mode), checking the line length before parsing and the columns and rows as they come,
 * so a hostile file is refused early instead of built up in memory. A bad row is reported by its line
 * number (the first MAX_CSV_PROBLEMS of them), and then no cell is made at all.
 */
import Papa from 'papaparse';
import type { TableCell } from './sheet-format';

export type CsvTableResult = { ok: true; cell: TableCell } | { ok: false; problems: { line: number; message: string }[] };

const HEADER = /^\s*([A-Za-z_][A-Za-z0-9_]*)\s*(?:\[\s*([^\]]*?)\s*\])?\s*$/;
export const MAX_CSV_ROWS = 20_000;
export const MAX_CSV_COLUMNS = 200;
/** The longest line, in characters: 200 columns of long numbers fit many times over. */
export const MAX_CSV_LINE = 64 * 1024;
/** Problems listed before the rest are summed up in one line. */
export const MAX_CSV_PROBLEMS = 20;

type Problem = { line: number; message: string };

/** The first line longer than the limit, found without splitting the text. */
function overlongLine(text: string): Problem | undefined {
  let start = 0;
  for (let line = 1; start <= text.length; line++) {
    let end = text.indexOf('\n', start);
    if (end < 0) end = text.length;
    if (end - start > MAX_CSV_LINE)
      return { line, message: `is ${(end - start).toLocaleString('en')} characters long; a line may hold at most ${MAX_CSV_LINE.toLocaleString('en')}` };
    start = end + 1;
  }
  return undefined;
}

export function csvToTableCell(input: string): CsvTableResult {
  const text = input.replace(/^\uFEFF/, '');
  const long = overlongLine(text);
  if (long) return { ok: false, problems: [long] };
  const problems: Problem[] = [];
  let more = 0;
  const problem = (p: Problem) => {
    if (problems.length < MAX_CSV_PROBLEMS) problems.push(p);
    else more++;
  };
  let columns: TableCell['columns'] | undefined;
  const data: number[][] = [];
  let rows = 0;
  let stopped: Problem | undefined;
  Papa.parse<string[]>(text, {
    skipEmptyLines: 'greedy',
    step: (step, parser) => {
      const row = step.data;
      // papaparse counts rows from 0 and gives no line numbers in step mode: header is line 1.
      const line = rows + 1;
      rows++;
      // A one-column file has no delimiter to detect: that is not a problem.
      for (const e of step.errors) if (e.code !== 'UndetectableDelimiter') problem({ line, message: e.message });
      if (row.length > MAX_CSV_COLUMNS) {
        stopped = { line, message: `has ${row.length.toLocaleString('en')} columns; a table may have at most ${MAX_CSV_COLUMNS}` };
        parser.abort();
        return;
      }
      if (!columns) {
        columns = header(row, problem);
        return;
      }
      if (rows - 1 > MAX_CSV_ROWS) {
        stopped = { line, message: `a table holds at most ${MAX_CSV_ROWS.toLocaleString('en')} rows` };
        parser.abort();
        return;
      }
      if (row.length !== columns.length) {
        problem({ line, message: `has ${row.length} values where the header names ${columns.length} columns` });
        return;
      }
      const values = row.map((v) => Number(v.trim()));
      const bad = row.findIndex((v, i) => v.trim() === '' || !Number.isFinite(values[i]));
      if (bad >= 0) {
        problem({ line, message: `column ${columns[bad].name}: "${row[bad].trim().slice(0, 40)}" is not a number` });
        return;
      }
      data.push(values);
    },
  });
  if (stopped) return { ok: false, problems: [stopped] };
  if (!columns) return { ok: false, problems: [{ line: 1, message: 'the file is empty: the first row must name the columns, for example h, I_h [A]' }] };
  if (rows === 1 && problems.length === 0) problem({ line: 2, message: 'the file has a header but no rows of values' });
  if (problems.length) {
    const listed = problems.sort((a, b) => a.line - b.line);
    if (more) listed.push({ line: listed[listed.length - 1].line, message: `and ${more.toLocaleString('en')} more problems like these` });
    return { ok: false, problems: listed };
  }
  return { ok: true, cell: { kind: 'table', columns, rows: data } };
}

function header(row: string[], problem: (p: Problem) => void): TableCell['columns'] {
  const columns = row.map((h, i) => {
    const m = HEADER.exec(h);
    if (!m) {
      problem({ line: 1, message: `column ${i + 1}: "${h.trim().slice(0, 40)}" is not a name with an optional [unit] (for example I_h [A])` });
      return { name: `col${i + 1}` };
    }
    return m[2] ? { name: m[1], unit: m[2] } : { name: m[1] };
  });
  const names = new Set<string>();
  for (const c of columns) {
    if (names.has(c.name)) problem({ line: 1, message: `the column name ${c.name} appears twice` });
    names.add(c.name);
  }
  return columns;
}
