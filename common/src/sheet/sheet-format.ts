/**
 * The sheet file format `ampwright.sheet/1` (see PRODUCT.md): the contract for export, import and
 * templates. Validation is strict about what we read and loose about what we keep: fields we do not
 * know are carried through untouched, so a file written by a newer version loses nothing here.
 */
import { z } from 'zod';

export const SHEET_FORMAT = 'ampwright.sheet/1';

export const CELL_KINDS = ['note', 'calc', 'check', 'sweep', 'transient', 'table', 'figure', 'network'] as const;
export type CellKind = (typeof CELL_KINDS)[number];

const text = (what: string) => z.string({ error: `${what} must be text` });

export const settingsSchema = z.looseObject({
  significantDigits: z
    .number({ error: 'significantDigits must be a number' })
    .int('significantDigits must be a whole number')
    .min(1, 'significantDigits must be at least 1')
    .max(15, 'significantDigits must be at most 15')
    .optional(),
  complexForm: z.enum(['polar', 'rectangular'], { error: 'complexForm must be "polar" or "rectangular"' }).optional(),
});

/** The longest text a note, calc or check cell holds (a cell's save may carry up to 8 MB, for a table). */
export const CELL_TEXT_MAX = 1_000_000;
const cellText = (what: string) => text(what).max(CELL_TEXT_MAX, `${what} is longer than ${CELL_TEXT_MAX.toLocaleString('en')} characters`);
export const noteCellSchema = z.looseObject({ kind: z.literal('note'), text: cellText("A note cell's text") });
export const calcCellSchema = z.looseObject({ kind: z.literal('calc'), source: cellText("A calc cell's source") });
export const checkCellSchema = z.looseObject({
  kind: z.literal('check'),
  condition: cellText("A check cell's condition"),
  basis: text("A check cell's basis").optional(),
  severity: z.enum(['mandatory', 'advisory'], { error: 'severity must be "mandatory" or "advisory"' }).optional(),
});
export const sweepCellSchema = z.looseObject({
  kind: z.literal('sweep'),
  variable: text("A sweep cell's variable"),
  from: text("A sweep cell's start"),
  to: text("A sweep cell's end"),
  points: z
    .number({ error: 'points must be a number' })
    .int('points must be a whole number')
    .min(2, 'points must be at least 2')
    .max(20000, 'points must be at most 20 000'),
  spacing: z.enum(['linear', 'log'], { error: 'spacing must be "linear" or "log"' }).optional(),
  outputs: z.array(text('A sweep output'), { error: 'outputs must be a list of expressions' }).min(1, 'a sweep needs at least one output'),
});
export const transientCellSchema = z.looseObject({
  kind: z.literal('transient'),
  R: text('R'),
  L: text('L'),
  C: text('C'),
  source: text('The source E(t)'),
  q0: text('q0').optional(),
  i0: text('i0').optional(),
  span: text('The time span'),
  points: z.number({ error: 'points must be a number' }).int().min(2).max(20000).optional(),
});
/** The most rows and columns a table cell holds (a CSV import, a paste, a file), and the most values in all. */
export const TABLE_MAX_ROWS = 20_000;
export const TABLE_MAX_COLUMNS = 200;
/** Rows × columns: a table this size saves back in one request (under 8 MB of JSON, see the server's body limits). */
export const TABLE_MAX_VALUES = 200_000;
/** A value typed as text: a number as written, at most this long. */
export const TABLE_MAX_TEXT = 32;
export const tableCellSchema = z
  .looseObject({
    kind: z.literal('table'),
    columns: z
      .array(z.looseObject({ name: text('A column name'), unit: z.string().optional() }))
      .max(TABLE_MAX_COLUMNS, `a table has at most ${TABLE_MAX_COLUMNS} columns`),
    rows: z
      .array(
        z
          .array(z.union([z.number(), z.string().max(TABLE_MAX_TEXT, `a table value is at most ${TABLE_MAX_TEXT} characters`), z.null()]))
          .max(TABLE_MAX_COLUMNS, `a table row has at most ${TABLE_MAX_COLUMNS} values`),
      )
      .max(TABLE_MAX_ROWS, `a table has at most ${TABLE_MAX_ROWS.toLocaleString('en')} rows`),
  })
  .refine((t) => t.rows.length * t.rows.reduce((width, r) => Math.max(width, r.length), t.columns.length) <= TABLE_MAX_VALUES, {
    message: `a table holds at most ${TABLE_MAX_VALUES.toLocaleString('en')} values (rows × columns)`,
    path: ['rows'],
  });
export const figureCellSchema = z.looseObject({ kind: z.literal('figure'), caption: z.string().optional() });

/** The most elements a network cell holds. */
export const NETWORK_MAX_ELEMENTS = 2000;
export const NETWORK_ELEMENT_KINDS = ['resistor', 'inductor', 'capacitor', 'source', 'supply', 'transformer', 'injection', 'switch'] as const;
export const NETWORK_ANALYSES = ['steady', 'scan', 'harmonics', 'transient'] as const;
const short = (what: string) => text(what).max(2000, `${what} is longer than 2000 characters`);
export const networkElementSchema = z.looseObject({
  name: short("An element's name"),
  kind: z.enum(NETWORK_ELEMENT_KINDS, { error: `an element's kind must be one of ${NETWORK_ELEMENT_KINDS.join(', ')}` }),
  a: short("An element's first node"),
  b: short("An element's second node"),
  values: z.array(short("An element's value")).max(4, 'an element has at most 4 values'),
});
export const networkCellSchema = z.looseObject({
  kind: z.literal('network'),
  frequency: short('The fundamental frequency'),
  reference: short('The reference node'),
  elements: z.array(networkElementSchema).max(NETWORK_MAX_ELEMENTS, `a network has at most ${NETWORK_MAX_ELEMENTS} elements`),
  analysis: z.enum(NETWORK_ANALYSES, { error: `analysis must be one of ${NETWORK_ANALYSES.join(', ')}` }),
  /** The scan: the node looked into, the range and the number of points (log spaced). */
  node: short('The node the scan looks into').optional(),
  from: short('The start of the scan').optional(),
  to: short('The end of the scan').optional(),
  points: z.number({ error: 'points must be a number' }).int().min(2).max(20000).optional(),
  /** The transient's span. */
  span: short('The time span').optional(),
  /** The nominal line-to-line voltage the IEEE 519 limits are chosen by (harmonic flow). */
  limitsVoltage: short('The voltage for the distortion limits').optional(),
});

export const cellSchema = z.discriminatedUnion(
  'kind',
  [noteCellSchema, calcCellSchema, checkCellSchema, sweepCellSchema, transientCellSchema, tableCellSchema, figureCellSchema, networkCellSchema],
  { error: (issue) => (issue.code === 'invalid_union' ? `kind must be one of ${CELL_KINDS.join(', ')}` : undefined) },
);

export const sheetFileSchema = z.looseObject({
  format: z.literal(SHEET_FORMAT, { error: `format must be "${SHEET_FORMAT}"` }),
  title: text('title').min(1, 'title must not be empty').max(200, 'title must be at most 200 characters'),
  settings: settingsSchema.optional(),
  cells: z.array(cellSchema, { error: 'cells must be a list' }),
});

export type SheetSettings = z.infer<typeof settingsSchema>;
export type NoteCell = z.infer<typeof noteCellSchema>;
export type CalcCell = z.infer<typeof calcCellSchema>;
export type CheckCell = z.infer<typeof checkCellSchema>;
export type SweepCell = z.infer<typeof sweepCellSchema>;
export type TransientCell = z.infer<typeof transientCellSchema>;
export type NetworkCell = z.infer<typeof networkCellSchema>;
export type NetworkElementRow = z.infer<typeof networkElementSchema>;
export type TableCell = z.infer<typeof tableCellSchema>;
export type FigureCell = z.infer<typeof figureCellSchema>;
export type Cell = z.infer<typeof cellSchema>;
export type SheetFile = z.infer<typeof sheetFileSchema>;

export interface SheetProblem {
  /** Where in the file, as a JSON path such as `cells[2].source`. */
  path: string;
  message: string;
}

export type SheetParseResult = { ok: true; sheet: SheetFile } | { ok: false; problems: SheetProblem[] };

function formatPath(path: readonly PropertyKey[]): string {
  return path.reduce<string>((acc, key) => (typeof key === 'number' ? `${acc}[${key}]` : acc ? `${acc}.${String(key)}` : String(key)), '');
}

/** Validates a parsed JSON value against the sheet format; every problem is reported with its place. */
export function parseSheetFile(value: unknown): SheetParseResult {
  const result = sheetFileSchema.safeParse(value);
  if (result.success) return { ok: true, sheet: result.data };
  return {
    ok: false,
    problems: result.error.issues.map((issue) => ({ path: formatPath(issue.path) || '(file)', message: issue.message })),
  };
}

/** Reads sheet JSON text; a syntax error is reported as a problem, never thrown. */
export function parseSheetJson(json: string): SheetParseResult {
  let value: unknown;
  try {
    value = JSON.parse(json);
  } catch (err) {
    return { ok: false, problems: [{ path: '(file)', message: `not valid JSON: ${(err as Error).message}` }] };
  }
  return parseSheetFile(value);
}
