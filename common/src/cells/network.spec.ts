import { describe, expect, it } from 'vitest';
import { evaluateSheet } from './evaluate-sheet';
import type { CheckResult, NetworkResult } from './types';
import type { Cell, NetworkElementRow } from '../sheet/sheet-format';

type Row = [string, NetworkElementRow['kind'], string, string, ...string[]];
const rows = (...r: Row[]): NetworkElementRow[] => r.map(([name, kind, a, b, ...values]) => ({ name, kind, a, b, values }));
const network = (elements: NetworkElementRow[], extra: Record<string, unknown> = {}): Cell =>
  ({ kind: 'network', frequency: '50 Hz', reference: 'gnd', analysis: 'steady', elements, ...extra }) as Cell;
const evaluate = (...cells: Cell[]) => evaluateSheet({ cells }).cells;

const BANK = rows(['Grid', 'supply', 'B', 'gnd', '11 kV', '250 MVA', '20'], ['Bank', 'capacitor', 'B', 'gnd', 'C_b']);
const bankC = 'C_b = 3 Mvar / (2 pi * 50 Hz * (11 kV)^2)';

describe('the network cell', () => {
  it('solves the steady state and gives its names to the cells below (V_<node>, I_<element>, S_<element>)', () => {
    const [, net, calc] = evaluate({ kind: 'calc', source: bankC }, network(BANK), {
      kind: 'calc',
      source: 'Q_bank = -3 im(S_Bank) to Mvar\nU_bus = sqrt(3) abs(V_B) to kV',
    });
    expect(net.status).toBe('ok');
    expect(calc.errors).toEqual([]);
    expect((net as NetworkResult).values.V_B.siUnit).toBe('V');
    // S is per phase: three of them make the bank's 3 Mvar, a little more as the bank raises the bus above the source
    // (a voltage rise of about Q/S_sc = 1.2 %, common practice).
    const rise = (calc as { values: Record<string, { si: number }> }).values.U_bus.si / 11e3 - 1;
    expect(rise).toBeGreaterThan(0.011);
    expect(rise).toBeLessThan(0.013);
    expect((calc as { values: Record<string, { si: number }> }).values.Q_bank.si).toBeCloseTo(3e6 * (1 + rise) ** 2, -3);
  });

  it('locates the parallel resonance of a bank against its supply near h = √(S_sc/Q_c) (names f_par_1, h_par_1)', () => {
    const [, net] = evaluate({ kind: 'calc', source: bankC }, network(BANK, { analysis: 'scan', node: 'B', from: '50 Hz', to: '2.5 kHz', points: 800 }));
    expect(net.status).toBe('ok');
    const h = (net as NetworkResult).values.h_par_1.si as number;
    expect(Math.abs(h - Math.sqrt(250 / 3)) / Math.sqrt(250 / 3)).toBeLessThan(1e-3);
    expect((net as NetworkResult).scan?.impedance.values).toHaveLength(800);
  });

  it('gives the harmonic flow, and a check cell can test THD_<node> against a limit', () => {
    const elements = rows(
      ['Grid', 'supply', 'B', 'gnd', '11 kV', '250 MVA', '20'],
      ['Bank', 'capacitor', 'B', 'gnd', 'C_b'],
      ['Drive', 'injection', 'gnd', 'B', '[1, 5, 7]', '[100 A, 20 A, 14 A]', '[0 deg, 30 deg, 10 deg]'],
    );
    const [, net, check] = evaluate({ kind: 'calc', source: bankC }, network(elements, { analysis: 'harmonics' }), {
      kind: 'check',
      condition: 'THD_B <= 5 %',
    } as Cell);
    expect(net.status).toBe('ok');
    const r = net as NetworkResult;
    expect(r.harmonics?.orders).toEqual([5, 7]);
    expect(r.harmonics?.limit?.thd).toBe(5);
    const thd = r.values.THD_B.si as number;
    expect(thd).toBeGreaterThan(0);
    expect((check as CheckResult).pass).toBe(thd <= 0.05);
    expect(r.values.I_Bank_rms.siUnit).toBe('A');
  });

  it('runs a switching transient and names its extremes (I_<element>_pk)', () => {
    const elements = rows(
      ['Grid', 'supply', 'B', 'gnd', '11 kV', '250 MVA', '20'],
      ['X1', 'inductor', 'B', 'k1', '0.5 mH'],
      ['C1', 'capacitor', 'k1', 'gnd', 'C_b'],
      ['S2', 'switch', 'B', 's2', '10 ms'],
      ['X2', 'inductor', 's2', 'k2', '0.5 mH'],
      ['C2', 'capacitor', 'k2', 'gnd', 'C_b'],
    );
    const [, net] = evaluate({ kind: 'calc', source: bankC }, network(elements, { analysis: 'transient', span: '20 ms', points: 400 }));
    expect(net.errors).toEqual([]);
    const r = net as NetworkResult;
    // Back-to-back energising at the voltage peak: the first bank alone would drive about V_pk·√(C_eq/L_eq) =
    // 8981 V·√(39.5 µF / 1 mH) ≈ 1.8 kA into the second (IEEE Std C37.012, back-to-back inrush; from memory); the
    // supply adds its own share, so the peak lies above that and well under twice it — many times the 222 A rated peak.
    expect(Math.abs(r.values.I_X2_pk.si as number)).toBeGreaterThan(1785);
    expect(Math.abs(r.values.I_X2_pk.si as number)).toBeLessThan(2 * 1785);
    expect(r.transient?.time.values).toHaveLength(400);
  });

  describe('refuses a bad network with a sentence naming the row', () => {
    const refusal = (elements: NetworkElementRow[], extra: Record<string, unknown> = {}) => {
      const [net] = evaluate(network(elements, extra));
      expect(net.status).toBe('error');
      return net.errors[0];
    };
    it('a node joined to nothing else (a misspelt node)', () => {
      const e = refusal(rows(['V1', 'source', 'A', 'gnd', '230 V'], ['R1', 'resistor', 'A', 'gnd', '10 ohm'], ['R2', 'resistor', 'A', 'Bx', '5 ohm']));
      expect(e.message).toMatch(/node Bx is joined only by row 3 \(R2\)/);
      expect(e.line).toBe(3);
    });
    it('a loop of voltage sources', () => {
      const e = refusal(rows(['V1', 'source', 'A', 'gnd', '230 V'], ['V2', 'source', 'A', 'gnd', '225 V'], ['R1', 'resistor', 'A', 'gnd', '10 ohm']));
      expect(e.message).toMatch(/row 1 \(V1\) and row 2 \(V2\) form a loop of ideal sources.*would fight/);
    });
    it('a source shorted by a switch', () => {
      const e = refusal(rows(['V1', 'source', 'A', 'gnd', '230 V'], ['S1', 'switch', 'A', 'gnd', '0 s'], ['R1', 'resistor', 'A', 'gnd', '10 ohm']));
      expect(e.message).toMatch(/source V1 is shorted/);
      expect(e.line).toBe(2);
    });
    it('a singular network (an ideal series LC driven at its resonance)', () => {
      // 1/(2π√(LC)) = 50 Hz exactly for L = 1/(4π²·50²·C).
      const e = refusal(
        rows(
          ['V1', 'source', 'A', 'gnd', '230 V'],
          ['L1', 'inductor', 'A', 'm', '1 / (4 pi^2 * (50 Hz)^2 * 100 uF)'],
          ['C1', 'capacitor', 'm', 'gnd', '100 uF'],
        ),
      );
      expect(e.message).toMatch(/no unique solution at 50\.0000 Hz/);
    });
    it('a unit that does not fit the element', () => {
      const e = refusal(rows(['V1', 'source', 'A', 'gnd', '230 V'], ['C1', 'capacitor', 'A', 'gnd', '10 mH']));
      expect(e.message).toBe('row 2 (C1), C must be a capacitance');
      expect(e.line).toBe(2);
    });
    it('a node with no path to the reference but through an injection', () => {
      const e = refusal(
        rows(
          ['V1', 'source', 'A', 'gnd', '230 V'],
          ['R1', 'resistor', 'A', 'gnd', '1 ohm'],
          ['H', 'injection', 'A', 'X', '5', '1 A'],
          ['R2', 'resistor', 'X', 'Y', '1 ohm'],
          ['R3', 'resistor', 'Y', 'X', '2 ohm'],
        ),
      );
      expect(e.message).toMatch(/node X has no path to the reference node gnd/);
    });
    it('a name used for both an element and a node', () => {
      const e = refusal(rows(['V1', 'source', 'A', 'gnd', '230 V'], ['A', 'resistor', 'A', 'gnd', '1 ohm']));
      expect(e.message).toMatch(/A names both an element and a node/);
    });
    it('a harmonic order above the 50th', () => {
      const e = refusal(
        rows(['R1', 'resistor', 'A', 'gnd', '1 ohm'], ['H', 'injection', 'gnd', 'A', '[5, 51]', '[1 A, 1 A]'], ['R2', 'resistor', 'A', 'gnd', '2 ohm']),
        {
          analysis: 'harmonics',
        },
      );
      expect(e.message).toMatch(/row 2 \(H\): harmonic order 51 is not a whole number from 1 to 50/);
    });
    it('a transient whose capacitors meet with no impedance between them', () => {
      const e = refusal(
        rows(
          ['V1', 'source', 'A', 'gnd', '230 V', '1 ohm'],
          ['C1', 'capacitor', 'A', 'gnd', '10 uF'],
          ['S1', 'switch', 'A', 'k', '1 ms'],
          ['C2', 'capacitor', 'k', 'gnd', '10 uF'],
        ),
        { analysis: 'transient', span: '5 ms' },
      );
      expect(e.message).toMatch(/row 2 \(C1\), row 3 \(S1\) and row 4 \(C2\) form a loop of capacitors.*once the switches close at 0\.001 s/);
    });
    it('a network too large to solve in a sheet (more than 1000 unknowns), before any matrix is made', () => {
      const chain: Row[] = [['V1', 'source', 'n0', 'gnd', '230 V']];
      for (let k = 1; k <= 1001; k++) chain.push([`R${k}`, 'resistor', `n${k - 1}`, `n${k}`, '1 ohm']);
      chain.push(['G', 'resistor', 'n1001', 'gnd', '1 kohm']);
      const e = refusal(rows(...chain));
      expect(e.message).toMatch(/1002 nodes and 1 branch currents to solve for; at most 1000/);
    });
    it('a transient that would keep more values than allowed (quantities × points)', () => {
      const ladder: Row[] = [['V1', 'source', 'n0', 'gnd', '230 V', '1 ohm']];
      for (let k = 1; k <= 100; k++) ladder.push([`L${k}`, 'inductor', `n${k - 1}`, `n${k}`, '1 mH'], [`C${k}`, 'capacitor', `n${k}`, 'gnd', '10 uF']);
      const e = refusal(rows(...ladder), { analysis: 'transient', span: '5 ms', points: 20000 });
      expect(e.message).toMatch(/302 quantities at 20000 points, more than 4,000,000 values: ask for fewer points/);
    });
  });
});
