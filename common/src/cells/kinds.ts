/**
 * The registry of cell kinds: everything about a kind in one entry — its name, its schema in the sheet
 * file, the fields of a new cell, its inputs as text, the figures a comparison of revisions lists, and
 * its presentation (the blocks of cells/presentation.ts that the screen and the signed package draw).
 *
 * The evaluator is the one part kept apart, in `EVALUATORS` (cells/evaluate-sheet.ts), a Record over the
 * same kinds: it needs the engine (mathjs), which the browser must not load just to draw a sheet.
 * Adding a kind to CELL_KINDS does not compile until it has an entry here, an evaluator there and an
 * editor in the app (KIND_EDITORS).
 */
import type { z } from 'zod';
import { calcFigures, harmonicBarsPlot, sweepPlot, transientPlot } from '../plot/charts';
import {
  type Cell,
  type CellKind,
  calcCellSchema,
  checkCellSchema,
  figureCellSchema,
  networkCellSchema,
  noteCellSchema,
  sweepCellSchema,
  tableCellSchema,
  transientCellSchema,
} from '../sheet/sheet-format';
import { checkPresentation, transientSummary, type PresentationBlock } from './presentation';
import { ELEMENT_VALUES, NETWORK_CONVENTIONS } from './network-labels';
import type { CellResult, FormattedValue, PlainResult } from './types';

/** A cell of one kind, as in the sheet file. */
export type CellOf<K extends CellKind> = Extract<Cell, { kind: K }>;
/** A cell's fields without its kind (what the API carries as `fields`); fields this version does not know are kept. */
export type FieldsOf<K extends CellKind> = { [P in keyof CellOf<K> as P extends 'kind' ? never : P]: CellOf<K>[P] };
/** The result the engine gives a cell of this kind. */
export type ResultOf<K extends CellKind> = [Extract<CellResult, { kind: K }>] extends [never] ? PlainResult : Extract<CellResult, { kind: K }>;

export interface CellKindDefinition<K extends CellKind> {
  /** Its name on screen and in the package. */
  label: string;
  /** Its schema in the sheet file (`ampwright.sheet/1`). */
  schema: z.ZodType<CellOf<K>>;
  /** The fields of a new cell of this kind. */
  defaults: FieldsOf<K>;
  /** Its inputs as text, where they are not the content itself: the screen shows them when the cell is not being edited. */
  inputs: (fields: FieldsOf<K>) => string;
  /** The package prints `inputs` above the results (where the results do not typeset the inputs themselves). */
  inputsInPackage: boolean;
  /** The screen keeps drawing the presentation under the editor while the cell is edited (a note's preview). */
  previewWhileEditing: boolean;
  /** The figures a comparison of two revisions lists for this cell, by name (display text). */
  figures: (result: ResultOf<K>) => Record<string, string>;
  /** What the cell shows, from its fields and (when the sheet was evaluated) its result. */
  present: (fields: FieldsOf<K>, result: ResultOf<K> | null) => PresentationBlock[];
}

const str = (v: unknown) => (typeof v === 'string' ? v : v === undefined || v === null ? '' : String(v));
const displays = (values: Record<string, FormattedValue>) => Object.fromEntries(Object.entries(values).map(([k, v]) => [k, v.display]));
const caption = (text: string): PresentationBlock[] => (text ? [{ type: 'sentence', text, style: 'caption' }] : []);

export const CELL_KIND_REGISTRY: { [K in CellKind]: CellKindDefinition<K> } = {
  note: {
    label: 'Note',
    schema: noteCellSchema,
    defaults: { text: '' },
    inputs: () => '',
    inputsInPackage: false,
    previewWhileEditing: true,
    figures: () => ({}),
    present: (f) => [{ type: 'note', text: str(f.text) }],
  },
  calc: {
    label: 'Calculation',
    schema: calcCellSchema,
    defaults: { source: '' },
    inputs: (f) => str(f.source),
    inputsInPackage: false,
    previewWhileEditing: true,
    figures: (r) => displays(r.values),
    present: (_f, r) =>
      r
        ? [
            { type: 'lines', lines: r.lines.filter((l) => l.tex) },
            ...calcFigures(r).map((fig): PresentationBlock => ({
              type: 'figure',
              label: fig.kind === 'impedance-triangle' ? 'Impedance triangle' : 'Phasor diagram',
              svg: fig.svg,
              small: true,
            })),
          ]
        : [],
  },
  check: {
    label: 'Check',
    schema: checkCellSchema,
    defaults: { condition: '', basis: '', severity: 'mandatory' },
    inputs: (f) => str(f.condition),
    inputsInPackage: false,
    previewWhileEditing: true,
    figures: (r) => ({
      outcome: r.pass === true ? 'pass' : r.pass === false ? 'fail' : 'not evaluated',
      ...(r.utilization !== null ? { utilisation: `${(r.utilization * 100).toFixed(1)} %` } : {}),
    }),
    present: (f, r) => [
      ...(r ? [{ type: 'outcome', check: checkPresentation(r), formula: r.tex?.formula, working: r.tex?.working || undefined } as const] : []),
      ...(f.basis ? [{ type: 'sentence', text: `Basis: ${f.basis}`, style: 'muted' } as const] : []),
    ],
  },
  sweep: {
    label: 'Sweep',
    schema: sweepCellSchema,
    defaults: { variable: 'f', from: '10 Hz', to: '1 kHz', points: 200, spacing: 'log', outputs: ['f'] },
    inputs: (f) => `${f.variable} from ${f.from} to ${f.to}, ${f.points} points (${f.spacing ?? 'linear'})\n${(f.outputs ?? []).join('\n')}`,
    inputsInPackage: true,
    previewWhileEditing: true,
    figures: () => ({}),
    present: (f, r) => {
      if (!r) return [];
      const logX = f.spacing === 'log';
      const drawn = sweepPlot(r, { logX });
      return [
        { type: 'sentence', text: `${r.variable?.values.length ?? 0} points of ${r.variable?.name ?? f.variable}`, style: 'plain' },
        ...(drawn
          ? [
              {
                type: 'figure',
                label: 'Frequency response',
                svg: drawn.svg,
                plot: drawn.data,
                redraw: (xRange: [number, number] | null) => sweepPlot(r, { logX, xRange: xRange ?? undefined }),
              } as const,
            ]
          : []),
      ];
    },
  },
  transient: {
    label: 'Transient',
    schema: transientCellSchema,
    defaults: { R: '1 ohm', L: '1 mH', C: '100 uF', source: '10 V', span: '20 ms' },
    inputs: (f) => `R = ${f.R}, L = ${f.L}, C = ${f.C}, E(t) = ${f.source}, from q0 = ${f.q0 || '0'}, i0 = ${f.i0 || '0'}, over ${f.span}`,
    inputsInPackage: true,
    previewWhileEditing: true,
    figures: (r): Record<string, string> => (r.peakCurrent ? { 'peak current': r.peakCurrent.display } : {}),
    present: (_f, r) => {
      if (!r) return [];
      const drawn = transientPlot(r);
      return [
        { type: 'rows', label: 'Transient results', rows: transientSummary(r) },
        ...(drawn
          ? [
              {
                type: 'figure',
                label: 'Transient current',
                svg: drawn.svg,
                plot: drawn.data,
                redraw: (xRange: [number, number] | null) => transientPlot(r, { xRange: xRange ?? undefined }),
              } as const,
            ]
          : []),
      ];
    },
  },
  table: {
    label: 'Table',
    schema: tableCellSchema,
    defaults: { columns: [{ name: 'x' }], rows: [[null]] },
    inputs: () => '',
    inputsInPackage: false,
    // The editor is the table itself.
    previewWhileEditing: false,
    figures: (r) => displays(r.values),
    present: (f) => [
      {
        type: 'table',
        columns: (f.columns ?? []).map((c) => ({ name: str(c.name), ...(c.unit ? { unit: c.unit } : {}) })),
        rows: (f.rows ?? []).map((row) => row.map(str)),
      },
    ],
  },
  figure: {
    label: 'Figure',
    schema: figureCellSchema,
    defaults: { caption: '' },
    inputs: () => '',
    inputsInPackage: false,
    previewWhileEditing: true,
    figures: () => ({}),
    present: (f) => caption(str(f.caption)),
  },
  network: {
    label: 'Network',
    schema: networkCellSchema,
    defaults: {
      frequency: '50 Hz',
      reference: 'gnd',
      analysis: 'steady',
      elements: [
        { name: 'Grid', kind: 'supply', a: 'B1', b: 'gnd', values: ['11 kV', '250 MVA', '10'] },
        { name: 'Bank', kind: 'capacitor', a: 'B1', b: 'gnd', values: ['80 uF'] },
      ],
    },
    inputs: (f) => {
      const what =
        f.analysis === 'scan'
          ? `frequency scan from node ${f.node ?? '?'}, ${f.from ?? '?'} to ${f.to ?? '?'}, ${f.points ?? 500} points`
          : f.analysis === 'harmonics'
            ? 'harmonic flow'
            : f.analysis === 'transient'
              ? `switching transient over ${f.span ?? '?'}`
              : 'steady state';
      return `${what}; fundamental ${f.frequency || '50 Hz'}, reference node ${f.reference || 'gnd'}, ${(f.elements ?? []).length} elements`;
    },
    inputsInPackage: true,
    previewWhileEditing: false,
    figures: (r) => displays(r.values ?? {}),
    present: (f, r) => {
      const blocks: PresentationBlock[] = [
        { type: 'sentence', text: NETWORK_CONVENTIONS, style: 'muted' },
        {
          type: 'table',
          columns: [{ name: 'element' }, { name: 'kind' }, { name: 'from' }, { name: 'to' }, { name: 'values' }],
          rows: (f.elements ?? []).map((e) => [
            str(e.name),
            str(e.kind),
            str(e.a),
            str(e.b),
            (e.values ?? [])
              .map((v, i) => (v ? `${ELEMENT_VALUES[e.kind]?.[i] ?? `value ${i + 1}`} = ${v}` : ''))
              .filter(Boolean)
              .join('; '),
          ]),
        },
      ];
      if (!r) return blocks;
      for (const t of r.tables ?? [])
        blocks.push({ type: 'sentence', text: t.title, style: 'plain' }, { type: 'table', columns: t.columns.map((name) => ({ name })), rows: t.rows });
      if (r.scan) {
        const scan = r.scan;
        const markers = scan.resonances.map((x) => ({ at: x.frequency, label: `${x.type === 'parallel' ? 'par' : 'ser'} h = ${x.order.toFixed(2)}` }));
        const sweep = { kind: 'sweep' as const, status: 'ok' as const, errors: [], warnings: [], variable: scan.frequency, outputs: [scan.impedance] };
        const drawn = sweepPlot(sweep, { logX: true, markers });
        if (drawn)
          blocks.push({
            type: 'figure',
            label: 'Driving-point impedance',
            svg: drawn.svg,
            plot: drawn.data,
            redraw: (xRange) => sweepPlot(sweep, { logX: true, markers, xRange: xRange ?? undefined }),
          });
      }
      if (r.harmonics) {
        const drawn = harmonicBarsPlot(r.harmonics.orders, r.harmonics.nodes, r.harmonics.limit?.individual ?? null);
        if (drawn) blocks.push({ type: 'figure', label: 'Harmonic voltages', svg: drawn.svg, plot: drawn.data });
      }
      if (r.transient) {
        const currents = r.transient.series.filter((s) => s.unit === 'A').slice(0, 4);
        const voltages = r.transient.series.filter((s) => s.unit === 'V').slice(0, 4);
        const sweep = {
          kind: 'sweep' as const,
          status: 'ok' as const,
          errors: [],
          warnings: [],
          variable: r.transient.time,
          outputs: [...currents, ...voltages],
        };
        const drawn = sweepPlot(sweep);
        if (drawn)
          blocks.push({
            type: 'figure',
            label: 'Time response',
            svg: drawn.svg,
            plot: drawn.data,
            redraw: (xRange) => sweepPlot(sweep, { xRange: xRange ?? undefined }),
          });
      }
      return blocks;
    },
  },
};

/** The definition of a kind, widened for callers that hold a kind only known at run time. */
const definitionOf = (kind: string) =>
  (CELL_KIND_REGISTRY as Record<string, CellKindDefinition<CellKind> | undefined>)[kind] as CellKindDefinition<CellKind> | undefined;

/** Every kind's name, in the order of the registry. */
export const KIND_LABELS = Object.fromEntries(Object.entries(CELL_KIND_REGISTRY).map(([k, d]) => [k, d.label])) as Record<CellKind, string>;

export const kindLabel = (kind: string) => definitionOf(kind)?.label ?? kind;

/** The fields of a new cell of a kind (a fresh copy). */
export const newCellFields = <K extends CellKind>(kind: K): FieldsOf<K> => structuredClone(CELL_KIND_REGISTRY[kind].defaults) as FieldsOf<K>;

/** A result belongs to a cell only when it is of the cell's kind (an unevaluated sheet's results are not). */
const resultFor = (kind: string, result: CellResult | null | undefined) => (result && result.kind === kind ? result : null);

/** What a cell shows: its presentation blocks (problems are drawn by the caller from the result's errors and warnings). */
export function presentCell(kind: string, fields: Record<string, unknown>, result: CellResult | null | undefined): PresentationBlock[] {
  const d = definitionOf(kind);
  return d ? d.present(fields as FieldsOf<CellKind>, resultFor(kind, result) as ResultOf<CellKind> | null) : [];
}

/** A cell's inputs as text ('' where the content is the presentation itself). */
export const cellInputs = (kind: string, fields: Record<string, unknown>) => definitionOf(kind)?.inputs(fields as FieldsOf<CellKind>) ?? '';

export const kindFacts = (kind: string) => {
  const d = definitionOf(kind);
  return { inputsInPackage: d?.inputsInPackage ?? false, previewWhileEditing: d?.previewWhileEditing ?? true };
};

/** The figures of a result a comparison of revisions lists (with the errors, when there are any). */
export function resultFigures(kind: string, result: CellResult | null | undefined): Record<string, string> {
  if (!result) return {};
  const own = resultFor(kind, result);
  const out = own ? { ...definitionOf(kind)?.figures(own as ResultOf<CellKind>) } : {};
  if (result.status === 'error') out.errors = result.errors.map((e) => e.message).join('; ');
  return out;
}
