/**
 * Incremental evaluation must be invisible: after any edit, a sheet evaluated with the cache of its
 * previous state gives exactly what a fresh evaluation gives. A property test over generated sheets
 * and edits (fast-check, fixed seed), since a stale reused result would show a wrong number.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { Cell } from '../sheet/sheet-format';
import { evaluateSheet } from './evaluate-sheet';

// Lines that define, read, redefine and fail names in different orders, so that edits move where a
// name is defined, make it fail, or make a later definition appear.
const LINES = [
  'R = 10 ohm',
  'R = 12 ohm',
  'X = 5 ohm',
  'X = 2 * pi * 50 Hz * 20 mH',
  'Z = R + j * X',
  'Z = sqrt(R^2 + X^2)',
  'I = 230 V / Z',
  'I = 230 V / abs(Z) to mA',
  'P = abs(I)^2 * R to W',
  'Q = P / 0',
  'R = unknown_name * 2',
  'X = 3 V',
  'Z = R +',
  'k = 2',
  'I = k * 1 A',
  'P = k * R',
];
const line = fc.constantFrom(...LINES);
const calc = fc.array(line, { minLength: 1, maxLength: 3 }).map((ls): Cell => ({ kind: 'calc', source: ls.join('\n') }));
const check = fc.constantFrom('abs(I) <= 30 A', 'P <= 1 kW', 'R >= 1 ohm').map((condition): Cell => ({ kind: 'check', condition, basis: 'property test' }));
const cell = fc.oneof({ weight: 4, arbitrary: calc }, { weight: 1, arbitrary: check });

// `npm run fuzz` runs more cases with a new seed (FUZZ_RUNS, FUZZ_SEED=random), like the language fuzzing.
const RUNS = Number(process.env.FUZZ_RUNS ?? 1500);
const SEED = process.env.FUZZ_SEED === 'random' ? Date.now() % 2 ** 31 : Number(process.env.FUZZ_SEED ?? 20261202);

type Edit = { type: 'replace' | 'insert' | 'delete' | 'swap'; at: number; cell: Cell };
const edit = fc.record({ type: fc.constantFrom<Edit['type']>('replace', 'insert', 'delete', 'swap'), at: fc.nat(), cell });

function applyEdit(cells: Cell[], e: Edit): Cell[] {
  const out = [...cells];
  const at = e.at % (out.length + (e.type === 'insert' ? 1 : 0));
  if (e.type === 'replace') out[at] = e.cell;
  if (e.type === 'insert') out.splice(at, 0, e.cell);
  if (e.type === 'delete' && out.length > 1) out.splice(at, 1);
  if (e.type === 'swap' && at + 1 < out.length) [out[at], out[at + 1]] = [out[at + 1], out[at]];
  return out;
}

describe('incremental evaluation', () => {
  it(`gives after any sequence of edits exactly what a fresh evaluation gives (${RUNS} cases, seed ${SEED})`, () => {
    fc.assert(
      fc.property(fc.array(cell, { minLength: 1, maxLength: 6 }), fc.array(edit, { minLength: 1, maxLength: 4 }), (start, edits) => {
        let cells = start;
        let cache = evaluateSheet({ cells }).cache;
        for (const e of edits) {
          cells = applyEdit(cells, e);
          const incremental = evaluateSheet({ cells }, cache);
          expect(JSON.stringify(incremental.cells)).toBe(JSON.stringify(evaluateSheet({ cells }).cells));
          cache = incremental.cache;
        }
      }),
      { numRuns: RUNS, seed: SEED },
    );
  }, 600_000);

  it('reuses the cells an edit cannot affect', () => {
    const cells: Cell[] = [
      { kind: 'calc', source: 'R = 10 ohm' },
      { kind: 'calc', source: 'k = 2' },
      { kind: 'calc', source: 'P = k * R' },
    ];
    const first = evaluateSheet({ cells });
    const again = evaluateSheet({ cells: [cells[0], { kind: 'calc', source: 'k = 3' }, cells[2]] }, first.cache);
    expect(again.evaluated).toEqual([1, 2]);
    expect(again.cells[2]).toMatchObject({ values: { P: { si: 30 } } });
  });
});
