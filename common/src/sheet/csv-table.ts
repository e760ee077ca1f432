/**
 * A CSV of measurements as a table cell: the header row names the columns, each optionally with a
 * unit in brackets (`h, I_h [A]`); every other row holds numbers. The delimiter (comma, semicolon,
 * tab, bar) is detected by papaparse; the decimal mark by the values: where the delimiter is not a
 * comma, a value such as `10,5` means a decimal comma (as spreadsheets in many locales export), and
 * the first value with a decimal mark decides it for the file. Both are reported with the cell, so
 * the screen can say what was read. Parsed with papaparse row by row
 * (its step mode), checking the line length before parsing and the columns and rows as they come,
 * so a hostile file is refused early instead of built up in memory. A bad row is reported by its line
 * number (the first MAX_CSV_PROBLEMS of them), and then no cell is made at all.
 */
import Papa from 'papaparse';
import { readDecimal, type DecimalMark } from './decimal';
import { TABLE_MAX_COLUMNS, TABLE_MAX_ROWS, TABLE_MAX_VALUES, type TableCell } from './sheet-format';

/** What the import detected in the file. */
export interface CsvDetected {
  delimiter: ',' | ';' | '\t' | '|';
  decimalMark: DecimalMark;
  rows: number;
  columns: number;
}

export type CsvTableResult = { ok: true; cell: TableCell; detected: CsvDetected } | { ok: false; problems: { line: number; message: string }[] };

/** A delimiter's name in a sentence. */
const DELIMITER_NAMES: Record<CsvDetected['delimiter'], string> = { ',': 'commas', ';': 'semicolons', '\t': 'tabs', '|': 'vertical bars' };

/** What the import read, as a sentence for the screen. */
export function describeDetected(d: CsvDetected): string {
  const rows = `${d.rows.toLocaleString('en')} row${d.rows === 1 ? '' : 's'} × ${d.columns} column${d.columns === 1 ? '' : 's'}`;
  const separated = d.columns > 1 ? `, values separated by ${DELIMITER_NAMES[d.delimiter]}` : '';
  return `${rows}${separated}, decimal ${d.decimalMark === ',' ? 'comma' : 'point'}`;
}

const HEADER = /^\s*([A-Za-z_][A-Za-z0-9_]*)\s*(?:\[\s*([^\]]*?)\s*\])?\s*$/;
export const MAX_CSV_ROWS = TABLE_MAX_ROWS;
export const MAX_CSV_COLUMNS = TABLE_MAX_COLUMNS;
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
  let delimiter: CsvDetected['delimiter'] = ',';
  // Undecided until a value shows a decimal mark; where the delimiter is a comma it can only be a point.
  let mark: { mark: CsvDetected['decimalMark']; line: number } | undefined;
  Papa.parse<string[]>(text, {
    skipEmptyLines: 'greedy',
    delimitersToGuess: [',', ';', '\t', '|'],
    step: (step, parser) => {
      const row = step.data;
      if (!columns) {
        delimiter = (step.meta.delimiter as CsvDetected['delimiter']) ?? ',';
        if (delimiter === ',') mark = { mark: '.', line: 0 };
      }
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
      if ((rows - 1) * columns.length > TABLE_MAX_VALUES) {
        stopped = {
          line,
          message: `a table holds at most ${TABLE_MAX_VALUES.toLocaleString('en')} values (rows × columns): with ${columns.length} columns, at most ${Math.floor(TABLE_MAX_VALUES / columns.length).toLocaleString('en')} rows`,
        };
        parser.abort();
        return;
      }
      if (row.length !== columns.length) {
        problem({ line, message: `has ${row.length} values where the header names ${columns.length} columns` });
        return;
      }
      const values: number[] = [];
      for (let j = 0; j < row.length; j++) {
        const v = row[j].trim();
        if (!mark) {
          if (readDecimal(v, ',') !== undefined && v.includes(',')) mark = { mark: ',', line };
          else if (readDecimal(v, '.') !== undefined && v.includes('.')) mark = { mark: '.', line };
        }
        const n = readDecimal(v, mark?.mark ?? '.');
        if (n === undefined) {
          const value = `column ${columns[j].name}: "${v.slice(0, 40)}"`;
          problem({
            line,
            message: mark && readDecimal(v, mark.mark === '.' ? ',' : '.') !== undefined ? `${value} ${otherMark(mark)}` : `${value} is not a number`,
          });
          return;
        }
        values.push(n);
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
  return {
    ok: true,
    cell: { kind: 'table', columns, rows: data },
    detected: { delimiter, decimalMark: mark?.mark ?? '.', rows: data.length, columns: columns.length },
  };
}

/** Why a value with the other decimal mark is refused. */
function otherMark(mark: { mark: CsvDetected['decimalMark']; line: number }): string {
  if (mark.line === 0) return 'has a decimal comma, but the values are separated by commas, so the decimal mark is a point';
  return mark.mark === '.'
    ? `has a decimal comma, where line ${mark.line} has a decimal point: one file uses one decimal mark`
    : `has a decimal point, where line ${mark.line} has a decimal comma: one file uses one decimal mark`;
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
