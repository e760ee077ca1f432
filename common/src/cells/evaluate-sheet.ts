/**
 * Evaluates a sheet, cell by cell, top to bottom. Incremental: a cell is evaluated again only when
 * its content changed or a value it read from above changed; otherwise its previous result and
 * definitions are reused. The cache is plain data, so a caller can keep it between edits.
 */
import { checkDeadline } from '../language/deadline';
import type { Cell, CellKind, SheetFile } from '../sheet/sheet-format';
import { cellJson } from '../sheet/sealed-cells';
import { DEFAULT_DISPLAY, formatValue, type DisplayOptions } from '../units/display';
import { evaluateCalcCell } from './calc';
import { evaluateCheckCell } from './check';
import { assignedName, SheetScope, type Held, type Place } from './scope';
import type { CellOf, ResultOf } from './kinds';
import type { CellResult, PlainResult } from './types';
import { evaluateSweepCell } from './sweep';
import { evaluateTransientCell } from './transient';
import { evaluateTableCell, tableColumnNames } from './table';
import { evaluateNetworkCell, networkNames } from './network';

/**
 * What the scope held for a name when a cell was evaluated: its print (printOf), and the objects behind it —
 * the value (frozen, so the same object always prints the same), where it was defined or failed, and every
 * place the sheet defines it — so that a later pass can tell "unchanged" by identity, printing only otherwise.
 */
interface Seen extends Held {
  name: string;
  print: string;
  definitions: Place[] | undefined;
}

interface CacheEntry {
  key: string;
  /**
   * The names the cell depends on — those it read from above, and those it defines or fails (whose
   * earlier definition its warnings name) — each with what the scope held for it before.
   */
  reads: Seen[];
  defined: [string, unknown, Place][];
  /** How the defined values were shown where defined (with their `to` unit), for later workings. */
  shown: [string, unknown, string][];
  failed: [string, Place][];
  result: CellResult;
}

export interface EvaluationCache {
  entries: CacheEntry[];
}

export interface SheetEvaluation {
  cells: CellResult[];
  /** Indexes of the cells evaluated this time (the others came from the cache). */
  evaluated: number[];
  cache: EvaluationCache;
}

/** Identifies a value for the cache: its SI value, its dimensions and the units it is shown in. */
const fingerprint = (v: unknown): string => {
  if (typeof v === 'number' || typeof v === 'boolean') return `${typeof v}:${v}`;
  const u = v as {
    value?: unknown;
    dimensions?: number[];
    units?: { unit: { name: string }; prefix: { name: string }; power: number }[];
    toArray?: () => unknown[];
  };
  if (u && u.units && u.dimensions) {
    const value = u.value as { re?: number; im?: number } | number | null;
    return `u:${typeof value === 'number' ? value : value ? `${value.re},${value.im}` : 'null'}:${u.dimensions.join(',')}:${u.units.map((x) => `${x.prefix.name}${x.unit.name}^${x.power}`).join(' ')}`;
  }
  if (u && typeof u.toArray === 'function') {
    // A mathjs matrix's valueOf is its own nested arrays, read here without the copy toArray makes.
    const data = (u as { valueOf(): unknown }).valueOf();
    return `m:${(Array.isArray(data) ? data : u.toArray()).map(fingerprint).join(';')}`;
  }
  return `x:${JSON.stringify(formatValue(v, { significantDigits: 17, complexForm: 'rectangular' }).si)}`;
};

/**
 * What a cell can see of a name: its value, where it was defined, where it failed, and every place the
 * sheet defines it (for "defined later" and "defined before" messages).
 */
function printOf(held: Held, definitions: Place[] | undefined): string {
  return JSON.stringify([held.present ? fingerprint(held.value) : '', held.origin ?? null, held.failed ?? null, definitions ?? []]);
}

const samePlace = (a: Place | undefined, b: Place | undefined) => a === b || (a !== undefined && b !== undefined && a.cell === b.cell && a.line === b.line);
const samePlaces = (a: Place[] | undefined, b: Place[] | undefined) =>
  a === b || (a !== undefined && b !== undefined && a.length === b.length && a.every((p, k) => samePlace(p, b[k])));

/** Whether the scope holds for a name what it held when `seen` was taken: the same objects, or failing that the same print. */
function unchanged(seen: Seen, scope: SheetScope): boolean {
  const now = scope.held(seen.name);
  const definitions = scope.definitions.get(seen.name);
  const same =
    now.present === seen.present &&
    now.value === seen.value &&
    samePlace(now.origin, seen.origin) &&
    samePlace(now.failed, seen.failed) &&
    samePlaces(definitions, seen.definitions);
  return same || printOf(now, definitions) === seen.print;
}

/** Where every name of the sheet is defined, for "used before it is defined" errors. */
export function definitionsOf(cells: readonly Cell[]): Map<string, Place[]> {
  const defs = new Map<string, Place[]>();
  const add = (name: string, place: Place) => defs.set(name, [...(defs.get(name) ?? []), place]);
  cells.forEach((cell, c) => {
    if (cell.kind === 'calc') {
      cell.source.split('\n').forEach((line, i) => {
        const name = assignedName(line);
        if (name) add(name, { cell: c, line: i + 1 });
      });
    }
    if (cell.kind === 'table') for (const name of tableColumnNames(cell)) add(name, { cell: c, line: 1 });
    if (cell.kind === 'network') for (const name of networkNames(cell)) add(name, { cell: c, line: 1 });
  });
  return defs;
}

export function displayOptionsOf(sheet: Pick<SheetFile, 'settings'>): DisplayOptions {
  return {
    significantDigits: sheet.settings?.significantDigits ?? DEFAULT_DISPLAY.significantDigits,
    complexForm: sheet.settings?.complexForm ?? DEFAULT_DISPLAY.complexForm,
  };
}

/** How each kind of cell is evaluated (the rest of what a kind is lives in its entry in kinds.ts): a new kind does not compile until it is here. */
const plain = (kind: 'note' | 'figure') => (): CellResult => ({ kind, status: 'ok', errors: [], warnings: [] });
export const EVALUATORS: { [K in CellKind]: (cell: CellOf<K>, index: number, scope: SheetScope, display: DisplayOptions) => ResultOf<K> } = {
  note: plain('note') as () => PlainResult,
  calc: evaluateCalcCell,
  check: evaluateCheckCell,
  sweep: evaluateSweepCell,
  transient: evaluateTransientCell,
  table: evaluateTableCell,
  figure: plain('figure') as () => PlainResult,
  network: evaluateNetworkCell,
};

function evaluateCell(cell: Cell, index: number, scope: SheetScope, display: DisplayOptions): CellResult {
  checkDeadline(true);
  const evaluate = EVALUATORS[cell.kind] as (cell: Cell, index: number, scope: SheetScope, display: DisplayOptions) => CellResult;
  return evaluate(cell, index, scope, display);
}

/**
 * What every cell shows when its sheet could not be evaluated at all: the reason, and no number, so
 * that no result computed from an older version of the sheet stays on screen as if it were current.
 */
export function unevaluatedResults(count: number, reason: string): CellResult[] {
  return Array.from({ length: count }, () => ({
    kind: 'unevaluated' as const,
    status: 'error' as const,
    errors: [{ line: 1, column: 1, message: `Not evaluated: ${reason}` }],
    warnings: [],
  }));
}

/**
 * `onCell` is told the index of each cell before it is evaluated afresh, so a caller stopped at a
 * deadline can say where the sheet was, and the results of the cells before it (all final), so a caller
 * can show them before the rest are done.
 */
export function evaluateSheet(
  sheet: Pick<SheetFile, 'cells' | 'settings'>,
  previous?: EvaluationCache,
  onCell?: (index: number, done: readonly CellResult[]) => void,
): SheetEvaluation {
  const display = displayOptionsOf(sheet);
  const scope = new SheetScope(definitionsOf(sheet.cells));
  const entries: CacheEntry[] = [];
  const results: CellResult[] = [];
  const evaluated: number[] = [];
  const settingsKey = JSON.stringify(display);
  sheet.cells.forEach((cell, index) => {
    const key = `${settingsKey}|${index}|${cellJson(cell)}`;
    const cached = previous?.entries[index];
    const reusable = cached && cached.key === key && cached.reads.every((seen) => unchanged(seen, scope));
    if (reusable && cached) {
      for (const [name, value, place] of cached.defined) scope.define(name, value, place);
      for (const [name, value, text] of cached.shown) scope.rememberDisplay(name, value, text);
      for (const [name, place] of cached.failed) scope.markFailed(name, place);
      entries.push(cached);
      results.push(cached.result);
      return;
    }
    onCell?.(index, results);
    const {
      result: { result, reads },
      before,
    } = scope.journaling(() => scope.tracking(() => evaluateCell(cell, index, scope, display)));
    // In the scope's order, as a reuse of this entry defines them again.
    const defined: [string, unknown, Place][] = [];
    for (const [name, place] of scope.origin) {
      const held = before.get(name);
      if (held && held.origin !== place) defined.push([name, scope.values.get(name), place]);
    }
    const failed: [string, Place][] = [...scope.failed].filter(([, place]) => place.cell === index);
    // Names looked up but absent count too: defining one above must re-evaluate this cell.
    const names = new Set([...reads, ...defined.map(([name]) => name), ...failed.map(([name]) => name)]);
    const outerReads: Seen[] = [...names].map((name) => {
      // A name the cell did not change holds now what it held before the cell.
      const held = before.get(name) ?? scope.held(name);
      const definitions = scope.definitions.get(name);
      return { name, print: printOf(held, definitions), ...held, definitions };
    });
    const shown: [string, unknown, string][] = [];
    for (const [name, value] of defined) {
      const text = scope.rememberedDisplay(name);
      if (text !== undefined) shown.push([name, value, text]);
    }
    entries.push({ key, reads: outerReads, defined, shown, failed, result });
    results.push(result);
    evaluated.push(index);
  });
  return { cells: results, evaluated, cache: { entries } };
}
