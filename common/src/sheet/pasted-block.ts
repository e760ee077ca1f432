/**
 * A block of values pasted into a table: what a spreadsheet puts on the clipboard when cells are
 * copied — rows on lines, values separated by tabs (common practice of spreadsheet programs and of the
 * HTML clipboard's text/plain flavour). The decimal mark is decided for the whole block: a comma where
 * values read as numbers with a decimal comma and none with a decimal point, else a point. Values that
 * are not numbers are kept as text, so the table reports them by row and column rather than losing them.
 */
import { readDecimal, type DecimalMark } from './decimal';

export type GridValue = number | string | null;

export interface PastedBlock {
  values: GridValue[][];
  rows: number;
  columns: number;
  decimalMark: DecimalMark;
}

/** A typed or pasted value as stored in a table cell: empty as null, a number as a number, anything else as text. */
export function gridValue(text: string, mark?: DecimalMark): GridValue {
  const t = text.trim();
  if (t === '') return null;
  const n = mark ? readDecimal(t, mark) : (readDecimal(t, '.') ?? readDecimal(t, ','));
  return n ?? t;
}

export function readPastedBlock(text: string): PastedBlock {
  const lines = text.replace(/\r\n?/g, '\n').split('\n');
  if (lines.length > 1 && lines[lines.length - 1] === '') lines.pop();
  const cells = lines.map((line) => line.split('\t'));
  let points = 0;
  let commas = 0;
  for (const row of cells)
    for (const v of row) {
      const t = v.trim();
      if (t.includes('.') && readDecimal(t, '.') !== undefined) points++;
      else if (t.includes(',') && readDecimal(t, ',') !== undefined) commas++;
    }
  const decimalMark = commas > 0 && points === 0 ? ',' : '.';
  const values = cells.map((row) => row.map((v) => gridValue(v, decimalMark)));
  return { values, rows: values.length, columns: Math.max(0, ...values.map((r) => r.length)), decimalMark };
}
