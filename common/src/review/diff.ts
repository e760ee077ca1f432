/**
 * The difference between two states of a sheet, cell by cell: which cells were added, removed or
 * changed, which of their inputs changed, and which results changed. Cells are matched by their id
 * (kept across revisions); results are compared by their displayed value, so a change in the last
 * shown digit counts and noise below it does not.
 */
import type { CellResult, FormattedValue } from '../cells/types';

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

function resultValues(r: CellResult | null): Record<string, string> {
  if (!r) return {};
  const out: Record<string, string> = {};
  if ('values' in r && r.values) for (const [k, v] of Object.entries(r.values as Record<string, FormattedValue>)) out[k] = v.display;
  if (r.kind === 'check') {
    out.outcome = r.pass === true ? 'pass' : r.pass === false ? 'fail' : 'not evaluated';
    if (r.utilization !== null) out.utilisation = `${(r.utilization * 100).toFixed(1)} %`;
  }
  if (r.kind === 'transient' && r.peakCurrent) out['peak current'] = r.peakCurrent.display;
  if (r.status === 'error') out.errors = r.errors.map((e) => e.message).join('; ');
  return out;
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

export function diffCells(before: SnapshotCell[], after: SnapshotCell[]): CellDiff[] {
  const old = new Map(before.map((c, i) => [c.id, { c, i }]));
  const seen = new Set<string>();
  const out: CellDiff[] = after.map((c, position) => {
    const prior = old.get(c.id)?.c;
    seen.add(c.id);
    if (!prior) {
      const results = Object.entries(resultValues(c.results)).map(([name, v]) => ({ name, before: null, after: v }));
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
    const ra = resultValues(prior.results);
    const rb = resultValues(c.results);
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
        results: Object.entries(resultValues(c.results)).map(([name, v]) => ({ name, before: v, after: null })),
      });
    }
  });
  return out;
}
