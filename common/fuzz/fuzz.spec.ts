/**
 * Fuzzing the language: generated and hostile sheets thrown at the engine. Every outcome must be
 * results or clear located messages — no exception out of the engine, no stack trace in a message,
 * nothing past the server's 2 s deadline. `npm test` runs 10 000 sheets with a fixed seed;
 * `npm run fuzz` runs more with a new seed (FUZZ_RUNS, FUZZ_SEED) and prints the seed to replay.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { evaluateSheet } from '../src/cells/evaluate-sheet';
import type { CellResult } from '../src/cells/types';
import { runWithDeadline } from '../src/language/deadline';
import { doublingSheet, hostileNetworkSheet, hostileSheet } from './hostile-expressions';

const RUNS = Number(process.env.FUZZ_RUNS ?? 10_000);
const SEED = process.env.FUZZ_SEED === 'random' ? Date.now() % 2 ** 31 : Number(process.env.FUZZ_SEED ?? 20261202);
/** The server stops an evaluation after 2 s (EvaluationService); the engine must finish well inside it. */
const DEADLINE_MS = 2000;

function problems(cells: CellResult[]): string[] {
  const out: string[] = [];
  for (const cell of cells) {
    if (cell.status === 'error' && cell.errors.length === 0) out.push(`${cell.kind}: an error with no message`);
    for (const d of [...cell.errors, ...cell.warnings]) {
      if (!(Number.isInteger(d.line) && d.line >= 1 && Number.isInteger(d.column) && d.column >= 1)) out.push(`bad position ${d.line}:${d.column}`);
      if (d.message.length < 4) out.push(`too short: ${d.message}`);
      if (/\n\s+at |\.js:\d+|TypeError|ReferenceError|undefined is not|\[object Object\]/.test(d.message))
        out.push(`not a sentence: ${d.message.slice(0, 200)}`);
    }
  }
  return out;
}

describe('fuzzing the language', () => {
  it(`evaluates ${RUNS} generated hostile sheets with clear messages, inside the deadline (seed ${SEED})`, () => {
    let slowest = 0;
    fc.assert(
      fc.property(hostileSheet, (sheet) => {
        const started = performance.now();
        let result;
        try {
          result = evaluateSheet(sheet);
        } catch (err) {
          throw new Error(`the engine threw: ${(err as Error).message}`, { cause: err });
        }
        const took = performance.now() - started;
        slowest = Math.max(slowest, took);
        expect(took, 'past the deadline').toBeLessThan(DEADLINE_MS);
        expect(problems(result.cells)).toEqual([]);
        // The sandbox holds: nothing reached the host.
        expect(typeof process.exit).toBe('function');
      }),
      { numRuns: RUNS, seed: SEED },
    );
    if (process.env.FUZZ_REPORT) console.log(`fuzz: ${RUNS} sheets, seed ${SEED}, slowest ${slowest.toFixed(0)} ms`);
  }, 600_000);

  it('stops a value doubled line after line at the size limit, with a sentence (fixed seed)', () => {
    fc.assert(
      fc.property(doublingSheet, (sheet) => {
        const result = evaluateSheet(sheet);
        expect(problems(result.cells)).toEqual([]);
        const lines = sheet.cells[0].source.split('\n').length;
        if (lines > 30) expect(result.cells[0].errors.some((e) => /larger than the limit|longer than the limit/.test(e.message))).toBe(true);
      }),
      { numRuns: 40, seed: SEED },
    );
  });

  it('evaluates generated hostile network cells with clear messages, or stops them at the deadline (fixed seed)', () => {
    fc.assert(
      fc.property(hostileNetworkSheet, (sheet) => {
        const started = performance.now();
        // As the server runs it: with its 2 s deadline, past which the sheet is stopped with a sentence.
        const run = runWithDeadline(Date.now() + DEADLINE_MS, () => evaluateSheet(sheet as never));
        expect(performance.now() - started, 'long past the deadline').toBeLessThan(DEADLINE_MS + 1000);
        if (!run.passed) expect(problems(run.value.cells)).toEqual([]);
      }),
      { numRuns: Number(process.env.FUZZ_NETWORK_RUNS ?? 400), seed: SEED },
    );
  }, 600_000);
});
