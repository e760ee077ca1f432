/** Sheets the load test and the benchmarks work on. */

/** 100 cells: 50 calcs of a branch's impedance and current (R_c, X_c, Z_c, I_c), each followed by a check of its current. */
export function sheetOf100(k) {
  const cells = [];
  for (let c = 0; c < 50; c++) {
    cells.push({ kind: 'calc', source: `R_${c} = ${c + 1} ohm\nX_${c} = ${2 * c + 1} ohm\nZ_${c} = sqrt(R_${c}^2 + X_${c}^2)\nI_${c} = 230 V / Z_${c} to A` });
    cells.push({ kind: 'check', condition: `I_${c} <= 300 A`, basis: 'load test' });
  }
  return { format: 'ampwright.sheet/1', title: `Load sheet ${k}`, cells };
}

/**
 * 100 cells in which the first feeds every other: a supply voltage, then 49 branches whose currents are
 * drawn from it (each checked), and a note. An edit of the voltage re-evaluates the whole sheet.
 */
export function rippleSheetOf100(k) {
  const cells = [{ kind: 'calc', source: 'V_s = 230 V' }];
  for (let c = 0; c < 49; c++) {
    cells.push({ kind: 'calc', source: `R_${c} = ${c + 1} ohm\nX_${c} = ${2 * c + 1} ohm\nZ_${c} = sqrt(R_${c}^2 + X_${c}^2)\nI_${c} = V_s / Z_${c} to A` });
    cells.push({ kind: 'check', condition: `I_${c} <= 300 A`, basis: 'benchmark' });
  }
  cells.push({ kind: 'note', text: 'Every branch above is fed from V_s.' });
  return { format: 'ampwright.sheet/1', title: `Benchmark sheet ${k}`, cells };
}
