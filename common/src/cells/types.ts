import type { Diagnostic } from '../language/errors';
import type { DisplayOptions, FormattedValue } from '../units/display';

export type { Diagnostic, DisplayOptions, FormattedValue };

export interface LineTex {
  /** The formula with names: X_{L} = 2 \pi f L */
  formula: string;
  /** The formula with values and units substituted. */
  working: string;
  /** The result in the unit shown: X_{L} = 12.57\,\Omega */
  result: string;
}

export interface LineResult {
  line: number;
  name: string;
  description?: string;
  /** The convention of the function the line calls (rms values, a bank's basis, leading or lagging). */
  convention?: string;
  value?: FormattedValue;
  tex?: LineTex;
  error?: Diagnostic;
}

export interface CellResultBase {
  kind: string;
  status: 'ok' | 'error';
  errors: Diagnostic[];
  warnings: Diagnostic[];
}

export interface CalcResult extends CellResultBase {
  kind: 'calc';
  values: Record<string, FormattedValue>;
  lines: LineResult[];
}

export interface CheckResult extends CellResultBase {
  kind: 'check';
  pass: boolean | null;
  utilization: number | null;
  /** 1 − utilisation: the share of the limit still unused (negative when exceeded). */
  margin: number | null;
  severity: 'mandatory' | 'advisory';
  actual?: FormattedValue;
  limit?: FormattedValue;
  relation?: string;
  tex?: { formula: string; working: string };
}

export interface SeriesData {
  name: string;
  unit: string;
  /** Real values in `unit`; for a complex series, the real parts (the imaginary parts are in `im`). */
  values: number[];
  im?: number[];
  complex?: boolean;
}

export interface SweepResult extends CellResultBase {
  kind: 'sweep';
  variable?: SeriesData;
  outputs: SeriesData[];
}

export interface ExtremumResult {
  value: FormattedValue;
  time: FormattedValue;
}

/** The largest value, the smallest value and the largest magnitude (with its sign) of a waveform. */
export interface ExtremaResult {
  peak: ExtremumResult;
  max: ExtremumResult;
  min: ExtremumResult;
}

export interface TransientResult extends CellResultBase {
  kind: 'transient';
  dampingCase?: 'overdamped' | 'critically damped' | 'underdamped' | 'undamped';
  parameters?: Record<string, FormattedValue>;
  analytic?: { available: boolean; reason?: string; sourceForm?: string };
  time?: SeriesData;
  charge?: SeriesData;
  current?: SeriesData;
  chargeAnalytic?: SeriesData;
  currentAnalytic?: SeriesData;
  currentSteady?: SeriesData;
  currentTransient?: SeriesData;
  /** The current's largest magnitude (signed) and its time: the same as peaks.current.peak. */
  peakCurrent?: FormattedValue;
  peakTime?: FormattedValue;
  /** Extrema of i(t) and of the capacitor voltage q(t)/C over the span, from the solution (not from samples). */
  peaks?: { from: 'analytic' | 'numeric'; current: ExtremaResult; capacitorVoltage: ExtremaResult };
  /**
   * The steady state: for a constant source q_ss, v_C_ss, i_ss; for a sinusoid the amplitudes I_ss,
   * Q_ss, V_C_ss and the delay angle phi. Absent when there is none (undamped resonance) or no analytic form.
   */
  steady?: Record<string, FormattedValue>;
  /** Largest difference between the numeric and analytic current, relative to the peak current. */
  maxRelativeDeviation?: number;
  solver?: { name: string; version: string; steps: number; evaluations: number };
}

export interface TableResult extends CellResultBase {
  kind: 'table';
  values: Record<string, FormattedValue>;
}

export interface PlainResult extends CellResultBase {
  kind: 'note' | 'figure';
}

/** A cell whose sheet could not be evaluated (stopped at its deadline or memory bound): no numbers. */
export interface UnevaluatedResult extends CellResultBase {
  kind: 'unevaluated';
  status: 'error';
}

/** A table of results as shown: a title, column headings and display text. */
export interface ResultTable {
  title: string;
  columns: string[];
  rows: string[][];
}

export interface NetworkResult extends CellResultBase {
  kind: 'network';
  analysis?: 'steady' | 'scan' | 'harmonics' | 'transient';
  /** Every name the cell defines for the cells below, with its value as shown. */
  values: Record<string, FormattedValue>;
  tables: ResultTable[];
  scan?: { frequency: SeriesData; impedance: SeriesData; resonances: { type: 'parallel' | 'series'; frequency: number; order: number }[] };
  harmonics?: { orders: number[]; nodes: { node: string; individual: number[] }[]; limit: { individual: number; thd: number; basis: string } | null };
  transient?: { time: SeriesData; series: SeriesData[] };
}

export type CellResult = NetworkResult | CalcResult | CheckResult | SweepResult | TransientResult | TableResult | PlainResult | UnevaluatedResult;
