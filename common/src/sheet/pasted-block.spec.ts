import { describe, expect, it } from 'vitest';
import { gridValue, readPastedBlock } from './pasted-block';

// What spreadsheets put on the clipboard as text: tab-separated values, one row a line, CRLF or LF (common practice).
describe('readPastedBlock', () => {
  it('reads rows and tabs, CRLF or LF, without a trailing empty row', () => {
    expect(readPastedBlock('1\t100\r\n5\t18.5\r\n')).toEqual({
      values: [
        [1, 100],
        [5, 18.5],
      ],
      rows: 2,
      columns: 2,
      decimalMark: '.',
    });
    expect(readPastedBlock('7\n').values).toEqual([[7]]);
  });

  it('reads a block with decimal commas as such', () => {
    expect(readPastedBlock('1\t10,5\n5\t2,25\n')).toMatchObject({
      values: [
        [1, 10.5],
        [5, 2.25],
      ],
      decimalMark: ',',
    });
  });

  it('keeps a point as the mark when the block has both, and leaves the other values as text', () => {
    expect(readPastedBlock('1.5\t1,234\n')).toMatchObject({ values: [[1.5, '1,234']], decimalMark: '.' });
  });

  it('keeps empty values as empty and text as text; ragged rows as they came', () => {
    expect(readPastedBlock('a\t\n3').values).toEqual([['a', null], [3]]);
    expect(readPastedBlock('a\t\n3').columns).toBe(2);
  });
});

describe('gridValue', () => {
  it('reads a typed number with either mark, and nothing else as a number', () => {
    expect(gridValue(' 12.5 ')).toBe(12.5);
    expect(gridValue('12,5')).toBe(12.5);
    expect(gridValue('-1e-3')).toBe(-0.001);
    expect(gridValue('')).toBeNull();
    for (const t of ['0x10', 'Infinity', '1.234,5', '12 A']) expect(gridValue(t)).toBe(t);
  });
});
