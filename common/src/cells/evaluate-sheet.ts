/**
 * Evaluates a sheet, cell by cell, top to bottom. Incremental: a cell is evaluated again only when
 * its content changed or a value it read from above changed; otherwise its previous result and
 * definitions are reused. The cache is plain data, so a caller can keep it between edits.
 */
import type { Cell, SheetFile } from '../sheet/sheet-format';
import { DEFAULT_DISPLAY, formatValue, type DisplayOptions } from '../units/display';
import { evaluateCalcCell } from './calc';
import { evaluateCheckCell } from './check';
import { assignedName, SheetScope, type Place } from './scope';
import type { CellResult } from './types';
import { evaluateSweepCell } from './sweep';
import { evaluateTransientCell } from './transient';
import { evaluateTableCell, tableColumnNames } from './table';

interface CacheEntry {
  key: string;
  /** Outer names read, with a fingerprint of each value. */
  reads: [string, string][];
  defined: [string, unknown, Place][];
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
  const u = v as { value?: unknown; dimensions?: number[]; units?: { unit: { name: string }; prefix: { name: string }; power: number }[]; toArray?: () => unknown[] };
  if (u && u.units && u.dimensions) {
    const value = u.value as { re?: number; im?: number } | number | null;
    return `u:${typeof value === 'number' ? value : value ? `${value.re},${value.im}` : 'null'}:${u.dimensions.join(',')}:${u.units.map((x) => `${x.prefix.name}${x.unit.name}^${x.power}`).join(' ')}`;
  }
  if (u && typeof u.toArray === 'function') return `m:${u.toArray().map(fingerprint).join(';')}`;
  return `x:${JSON.stringify(formatValue(v, { significantDigits: 17, complexForm: 'rectangular' }).si)}`;
};

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
  });
  return defs;
}

export function displayOptionsOf(sheet: Pick<SheetFile, 'settings'>): DisplayOptions {
  return {
    significantDigits: sheet.settings?.significantDigits ?? DEFAULT_DISPLAY.significantDigits,
    complexForm: sheet.settings?.complexForm ?? DEFAULT_DISPLAY.complexForm,
  };
}

function evaluateCell(cell: Cell, index: number, scope: SheetScope, display: DisplayOptions): CellResult {
  switch (cell.kind) {
    case 'calc':
      return evaluateCalcCell(cell, index, scope, display);
    case 'check':
      return evaluateCheckCell(cell, index, scope, display);
    case 'sweep':
      return evaluateSweepCell(cell, index, scope, display);
    case 'transient':
      return evaluateTransientCell(cell, index, scope, display);
    case 'table':
      return evaluateTableCell(cell, index, scope, display);
    default:
      return { kind: cell.kind, status: 'ok', errors: [], warnings: [] };
  }
}

export function evaluateSheet(sheet: Pick<SheetFile, 'cells' | 'settings'>, previous?: EvaluationCache): SheetEvaluation {
  const display = displayOptionsOf(sheet);
  const scope = new SheetScope(definitionsOf(sheet.cells));
  const entries: CacheEntry[] = [];
  const results: CellResult[] = [];
  const evaluated: number[] = [];
  const settingsKey = JSON.stringify(display);
  sheet.cells.forEach((cell, index) => {
    const key = `${settingsKey}|${index}|${JSON.stringify(cell)}`;
    const cached = previous?.entries[index];
    const reusable =
      cached &&
      cached.key === key &&
      cached.reads.every(([name, print]) => (scope.values.has(name) ? fingerprint(scope.values.get(name)) === print : print === ''));
    if (reusable && cached) {
      for (const [name, value, place] of cached.defined) scope.define(name, value, place);
      for (const [name, place] of cached.failed) scope.markFailed(name, place);
      entries.push(cached);
      results.push(cached.result);
      return;
    }
    const before = new Map(scope.values);
    const beforeOrigin = new Map(scope.origin);
    const { result, reads } = scope.tracking(() => evaluateCell(cell, index, scope, display));
    const defined: [string, unknown, Place][] = [];
    for (const [name, place] of scope.origin) {
      if (beforeOrigin.get(name) !== place) defined.push([name, scope.values.get(name), place]);
    }
    const failed: [string, Place][] = [...scope.failed].filter(([, place]) => place.cell === index);
    // Names looked up but absent count too (print ''): defining one above must re-evaluate this cell.
    const outerReads: [string, string][] = [...reads].map((name) => [name, before.has(name) ? fingerprint(before.get(name)) : '']);
    entries.push({ key, reads: outerReads, defined, failed, result });
    results.push(result);
    evaluated.push(index);
  });
  return { cells: results, evaluated, cache: { entries } };
}
