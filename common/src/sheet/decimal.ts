/** Numbers as measurement files and spreadsheets write them: a decimal point or a decimal comma. */
export type DecimalMark = '.' | ',';

/**
 * A plain decimal number, with a point or a comma as its decimal mark; no hex, no Infinity, no thousands
 * separators. The digits after the mark are matched only after the mark itself, so a long run of digits that
 * fails at its end is given up in linear time (`\d+\.?\d*` could split the run two ways at every digit).
 */
const DECIMAL: Record<DecimalMark, RegExp> = {
  '.': /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/,
  ',': /^[+-]?(?:\d+(?:,\d*)?|,\d+)(?:[eE][+-]?\d+)?$/,
};

/** A value as a number with the given decimal mark, or undefined when it is not one. */
export function readDecimal(text: string, mark: DecimalMark): number | undefined {
  const t = text.trim();
  if (!DECIMAL[mark].test(t)) return undefined;
  const n = Number(mark === ',' ? t.replace(',', '.') : t);
  return Number.isFinite(n) ? n : undefined;
}
