import { describe, expect, it } from 'vitest';
import { PartialCadence } from './partial-cadence';

describe('PartialCadence', () => {
  it('sends once the first cell evaluated afresh is done, then at most once a frame while there are more', () => {
    const cadence = new PartialCadence(0, 8, 16);
    // Before the first fresh cell: nothing done afresh yet.
    expect(cadence.due(5, 1)).toBe(false);
    // Before the second: the first (the edited cell) is done.
    expect(cadence.due(6, 2)).toBe(true);
    expect(cadence.due(7, 10)).toBe(false);
    expect(cadence.due(8, 17)).toBe(false);
    expect(cadence.due(30, 18)).toBe(true);
    // A frame later with nothing new: nothing to send.
    expect(cadence.due(30, 40)).toBe(false);
    expect(cadence.due(31, 41)).toBe(true);
  });

  it('sends after the first wait even when the first cell evaluated afresh is slow', () => {
    const cadence = new PartialCadence(100, 8, 16);
    expect(cadence.due(0, 100)).toBe(false);
    expect(cadence.due(0, 109)).toBe(true);
  });
});
