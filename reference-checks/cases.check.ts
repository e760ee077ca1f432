/**
 * Sheet files with expected values from outside sources (cases/*.json). Each case names its source
 * and whether it is a standard, a handbook value, common practice, or from memory; `expectErrors` lists
 * lines the engine must refuse, with the sentence it gives.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateSheet, parseSheetFile, type CalcResult, type CheckResult, type TableResult } from '../common/src/index';

interface Case {
  id: string;
  source: string;
  basis: 'standard' | 'handbook' | 'common practice' | 'from memory' | 'oracle';
  sheet: unknown;
  expect: { cell: number; name: string; si: number | [number, number]; relTol: number }[];
  expectChecks?: { cell: number; pass: boolean; utilization: number; relTol: number }[];
  /** Lines the engine must refuse, with a pattern of the sentence it gives. */
  expectErrors?: { cell: number; line: number; match: string }[];
}

const dir = join(__dirname, 'cases');
export const CASES: Case[] = readdirSync(dir)
  .filter((f) => f.endsWith('.json'))
  .sort()
  .map((f) => JSON.parse(readFileSync(join(dir, f), 'utf8')) as Case);

const close = (actual: number, expected: number, relTol: number) => Math.abs(actual - expected) <= relTol * Math.max(Math.abs(expected), 1e-300);

describe('reference cases', () => {
  it('has at least 40 cases, each naming its source and basis', () => {
    expect(CASES.length).toBeGreaterThanOrEqual(40);
    for (const c of CASES) {
      expect(c.source.length, c.id).toBeGreaterThan(10);
      expect(['standard', 'handbook', 'common practice', 'from memory', 'oracle'], c.id).toContain(c.basis);
    }
  });

  it.each(CASES.map((c) => [c.id, c] as const))('%s', (_id, c) => {
    const parsed = parseSheetFile(c.sheet);
    if (!parsed.ok) throw new Error(`case sheet invalid: ${JSON.stringify(parsed.problems)}`);
    const result = evaluateSheet(parsed.sheet);
    result.cells.forEach((cell, k) => {
      const wanted = (c.expectErrors ?? []).filter((e) => e.cell === k);
      expect(
        cell.errors.map((e) => e.line),
        `${c.id}: ${JSON.stringify(cell.errors)}`,
      ).toEqual(wanted.map((e) => e.line));
      wanted.forEach((e, n) => expect(cell.errors[n].message).toMatch(new RegExp(e.match)));
    });
    for (const e of c.expect) {
      const cell = result.cells[e.cell] as CalcResult | TableResult;
      const value = cell.values[e.name];
      expect(value, `${e.name} in ${c.id}`).toBeDefined();
      if (Array.isArray(e.si)) {
        const si = value.si as { re: number; im: number };
        expect(close(si.re, e.si[0], e.relTol) && close(si.im, e.si[1], e.relTol), `${e.name}: ${JSON.stringify(si)} vs ${e.si} (${c.source})`).toBe(true);
      } else {
        expect(close(value.si as number, e.si, e.relTol), `${e.name}: ${value.si} vs ${e.si} (${c.source})`).toBe(true);
      }
    }
    for (const e of c.expectChecks ?? []) {
      const cell = result.cells[e.cell] as CheckResult;
      expect(cell.pass, `${c.id}: ${c.source}`).toBe(e.pass);
      expect(close(cell.utilization!, e.utilization, e.relTol), `utilisation ${cell.utilization} vs ${e.utilization}`).toBe(true);
    }
  });
});
