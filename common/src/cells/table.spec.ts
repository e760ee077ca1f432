import { create, all } from 'mathjs';
import { describe, expect, it } from 'vitest';
import type { Cell } from '../sheet/sheet-format';
import { evaluateSheet } from './evaluate-sheet';
import type { TableResult } from './types';

// The reference: a plain mathjs instance (mathjs 15.2.0, the engine's own library, without the engine's set-up).
const reference = create(all);
const table = (unit: string | undefined, rows: (number | string | null)[]): Cell => ({
  kind: 'table',
  columns: [{ name: 'x', ...(unit === undefined ? {} : { unit }) }],
  rows: rows.map((v) => [v]),
});
const evaluate = (cell: Cell) => evaluateSheet({ cells: [cell] }).cells[0] as TableResult;

describe('the table cell', () => {
  it('makes each column a vector of its unit, in SI as mathjs gives it', () => {
    for (const unit of ['kV', 'mA', 'kohm', 'uF', 'degC', 'kW h', 'm/s^2', 'deg']) {
      const values = [11, 0.4, -2.5, '0.125'];
      const result = evaluate(table(unit, values));
      expect(result.errors, unit).toEqual([]);
      const si = result.values.x.si as number[];
      values.forEach((v, k) => expect(si[k], `${v} ${unit}`).toBeCloseTo(reference.unit(Number(v), unit).toSI().toNumber(), 12));
    }
    expect(evaluate(table(undefined, [1, '2.5'])).values.x.si).toEqual([1, 2.5]);
  });

  it('says which value is not a number, and refuses a unit that holds a number', () => {
    expect(evaluate(table('A', [1, 'abc'])).errors).toEqual([{ line: 1, column: 1, message: 'row 2, column x: "abc" is not a number' }]);
    // mathjs reads "5 A" as five amperes; as a column's unit the 5 was silently dropped.
    expect(evaluate(table('5 A', [1])).errors[0].message).toBe('column x: the unit "5 A" holds a number; write the unit alone, for example kA');
  });
});
