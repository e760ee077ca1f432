import { describe, expect, it } from 'vitest';
import type { PlotData } from '@ampwright/common';
import { plotCsv } from './chart-figure';

describe('a chart exported as CSV', () => {
  it('writes one column a quantity, named with its unit, and every digit of every point', () => {
    const plot: PlotData = {
      x: { name: 'f', unit: 'Hz', values: [50, 250.00000000000003] },
      series: [
        { name: '|I_"b"|', unit: 'A', values: [12.5, 0.1 + 0.2] },
        { name: 'ratio', unit: '', values: [1, 2] },
      ],
      frame: { left: 64, width: 556, svgWidth: 640 },
      domain: [50, 250],
      log: false,
    };
    expect(plotCsv(plot)).toBe('"f [Hz]","|I_""b""| [A]","ratio"\n50,12.5,1\n250.00000000000003,0.30000000000000004,2\n');
  });
});
