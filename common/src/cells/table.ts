/** The table cell: named columns with units; each column becomes a vector the cells below can use. */
import type { TableCell } from '../sheet/sheet-format';
import { math, Unit } from '../language/math';
import type { Unit as MathUnit } from 'mathjs';
import { readDecimal } from '../sheet/decimal';
import { formatValue, type DisplayOptions } from '../units/display';
import type { SheetScope } from './scope';
import type { TableResult } from './types';

const NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

export function tableColumnNames(cell: TableCell): string[] {
  return cell.columns.map((c) => c.name).filter((n) => NAME.test(n));
}

export function evaluateTableCell(cell: TableCell, cellIndex: number, scope: SheetScope, display: DisplayOptions): TableResult {
  const result: TableResult = { kind: 'table', status: 'ok', values: {}, errors: [], warnings: [] };
  cell.columns.forEach((column, c) => {
    try {
      if (!NAME.test(column.name)) throw new Error(`column ${c + 1}: "${column.name}" is not a name (letters, digits and _, not starting with a digit)`);
      const unit = column.unit?.trim() ? column.unit.trim().replace(/[µμ]/g, 'u') : undefined;
      // The unit is read once and each value takes a copy of it (new Unit(value, valuelessUnit) is mathjs's own
      // way; reading the unit again for every value was a third of a 200 000-value table's evaluation).
      const template = unit ? (math.unit(unit) as MathUnit) : undefined;
      if (template && (template as unknown as { value: unknown }).value !== null)
        throw new Error(`column ${column.name}: the unit "${column.unit}" holds a number; write the unit alone, for example kA`);
      const values = cell.rows.map((row, r) => {
        const v = row[c];
        // Text holds a number written with a point; hexadecimal, Infinity and the like are not numbers here.
        const n = typeof v === 'number' ? v : typeof v === 'string' ? (readDecimal(v, '.') ?? NaN) : NaN;
        if (!Number.isFinite(n)) throw new Error(`row ${r + 1}, column ${column.name}: "${v ?? ''}" is not a number`);
        return template ? new Unit(n, template) : n;
      });
      const vector = math.matrix(values as never);
      scope.define(column.name, vector, { cell: cellIndex, line: 1 });
      result.values[column.name] = formatValue(vector, display);
    } catch (err) {
      result.status = 'error';
      result.errors.push({ line: 1, column: c + 1, message: (err as Error).message });
    }
  });
  return result;
}
