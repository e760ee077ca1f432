import { describe, expect, it } from 'vitest';
import { evaluateSheet } from '../cells/evaluate-sheet';
import { runWithDeadline } from './deadline';

const RUNAWAY = 'M = ones(200, 200)\nP = M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M\nx = 1';

describe('the soft deadline of an evaluation', () => {
  it('stops a runaway sheet soon after its deadline, and says so', () => {
    const started = Date.now();
    const outcome = runWithDeadline(Date.now() + 200, () =>
      evaluateSheet({
        cells: [
          { kind: 'calc', source: RUNAWAY },
          { kind: 'check', condition: '1 < 2' },
        ],
      }),
    );
    expect(outcome.passed).toBe(true);
    // One matrix product past the deadline at most (common practice: a cooperative deadline checked between operations).
    expect(Date.now() - started).toBeLessThan(1500);
  });

  it('changes nothing for a sheet inside its deadline, and leaves no deadline behind', () => {
    const inside = runWithDeadline(Date.now() + 5000, () => evaluateSheet({ cells: [{ kind: 'calc', source: 'x = 2 V / 4 ohm' }] }));
    expect(inside.passed).toBe(false);
    expect(!inside.passed && inside.value.cells[0].errors).toEqual([]);
    runWithDeadline(Date.now() - 1, () => null);
    expect(evaluateSheet({ cells: [{ kind: 'calc', source: 'y = ones(3) * 2' }] }).cells[0].errors).toEqual([]);
  });
});
