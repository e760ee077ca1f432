/**
 * The difference between two states of a sheet, cell by cell: which cells were added, removed or
 * changed, which of their inputs changed, and which results changed. Cells are matched by their id
 * (kept across revisions); results are compared by their displayed value, so a change in the last
 * shown digit counts and noise below it does not.
 */
import { resultFigures } from '../cells/kinds';
import type { CellResult } from '../cells/types';

export interface SnapshotCell {
  id: string;
  kind: string;
  fields: Record<string, unknown>;
  results: CellResult | null;
}

export interface FieldChange {
  field: string;
  before: unknown;
  after: unknown;
}

export interface ResultChange {
  name: string;
  before: string | null;
  after: string | null;
}

export interface CellDiff {
  id: string;
  kind: string;
  status: 'added' | 'removed' | 'changed' | 'same';
  /** Position in the later state (or in the earlier one, for a removed cell), from 0. */
  position: number;
  inputs: FieldChange[];
  results: ResultChange[];
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

export function diffCells(before: SnapshotCell[], after: SnapshotCell[]): CellDiff[] {
  const old = new Map(before.map((c, i) => [c.id, { c, i }]));
  const seen = new Set<string>();
  const out: CellDiff[] = after.map((c, position) => {
    const prior = old.get(c.id)?.c;
    seen.add(c.id);
    if (!prior) {
      const results = Object.entries(resultFigures(c.kind, c.results)).map(([name, v]) => ({ name, before: null, after: v }));
      return {
        id: c.id,
        kind: c.kind,
        status: 'added',
        position,
        inputs: Object.entries(c.fields).map(([field, v]) => ({ field, before: undefined, after: v })),
        results,
      };
    }
    const fields = new Set([...Object.keys(prior.fields), ...Object.keys(c.fields), 'kind']);
    const inputs = [...fields].flatMap((field) => {
      const a = field === 'kind' ? prior.kind : prior.fields[field];
      const b = field === 'kind' ? c.kind : c.fields[field];
      return same(a, b) ? [] : [{ field, before: a, after: b }];
    });
    const ra = resultFigures(prior.kind, prior.results);
    const rb = resultFigures(c.kind, c.results);
    const names = [...new Set([...Object.keys(ra), ...Object.keys(rb)])];
    const results = names.flatMap((name) => (ra[name] === rb[name] ? [] : [{ name, before: ra[name] ?? null, after: rb[name] ?? null }]));
    return { id: c.id, kind: c.kind, status: inputs.length || results.length ? 'changed' : 'same', position, inputs, results };
  });
  before.forEach((c, position) => {
    if (!seen.has(c.id)) {
      out.push({
        id: c.id,
        kind: c.kind,
        status: 'removed',
        position,
        inputs: Object.entries(c.fields).map(([field, v]) => ({ field, before: v, after: undefined })),
        results: Object.entries(resultFigures(c.kind, c.results)).map(([name, v]) => ({ name, before: v, after: null })),
      });
    }
  });
  return out;
}
