/**
 * How values are shown: coherent SI with an engineering prefix by default (12.5 mA, not 0.0125 A), or
 * in the unit asked for, to the sheet's significant digits; complex values in polar and rectangular form.
 * Also the `si` form of the command-line contract: coherent SI, no prefixes, `{re, im}` for complex.
 */
import type { Unit as MathUnit } from 'mathjs';
import { isComplex, isUnit, math } from '../language/math';
import { frequencyKind, isAnglePower } from './quantities';
import { prettyUnit } from './pretty-unit';
import { kelvinOf, offsetScaleOf } from './temperature';

export type SiValue = number | boolean | string | { re: number; im: number } | SiValue[];

export interface DisplayOptions {
  significantDigits: number;
  complexForm: 'polar' | 'rectangular';
}

export const DEFAULT_DISPLAY: DisplayOptions = { significantDigits: 4, complexForm: 'polar' };

export interface FormattedValue {
  si: SiValue;
  /** The value in coherent SI units as text (e.g. "ohm"); empty when dimensionless. */
  siUnit: string;
  display: string;
  /** The other complex form, when the value is complex. */
  displayAlt?: string;
  /** The unit shown, in mathjs syntax, e.g. "mA". */
  unit: string;
}

const ANGLE = 7; // index of ANGLE in mathjs's BASE_DIMENSIONS

/** Preferred coherent SI units, in order; the first with the value's dimension is used. */
const PREFERRED = [
  'A',
  'V',
  'ohm',
  'S',
  'F',
  'H',
  'Hz',
  's',
  'W',
  'J',
  'C',
  'Wb',
  'T',
  'N',
  'Pa',
  'm',
  'kg',
  'K',
  'mol',
  'cd',
  'rad',
  'm^2',
  'm^3',
  'm/s',
  'V/m',
  'A/m',
  'ohm m',
  'F/m',
  'H/m',
  // The heat of a cable or a busbar: flux, loss per metre, conductivity and resistivity; and current density.
  'W/m^2',
  'W/m',
  'W/(m K)',
  'K m/W',
  'A/m^2',
];
const POWER_UNITS = new Set(['W', 'VA', 'var', 'VAR']);
const NO_PREFIX = new Set(['kg', 'K', 'rad', 'deg', 'mol', 'cd', 'm^2', 'm^3', 'm/s', 'ohm m']);

const preferredUnits = PREFERRED.map((name) => ({ name, unit: math.unit(name) as MathUnit }));

function dims(u: MathUnit): number[] {
  return (u as unknown as { dimensions: number[] }).dimensions;
}

/** Dimensions with the radian dropped where it rides along with others (rad·Ω is Ω; rad alone stays an angle). */
function effectiveDims(u: MathUnit): number[] {
  const d = [...dims(u)];
  if (d.some((x, i) => i !== ANGLE && x !== 0)) d[ANGLE] = 0;
  return d;
}

const sameDims = (a: number[], b: number[]) => a.every((x, i) => Math.abs(x - (b[i] ?? 0)) < 1e-12);

function unitValue(u: MathUnit): unknown {
  return (u as unknown as { value: unknown }).value;
}

/** The coherent-SI unit name for a quantity, or undefined when none of ours fits. */
export function siUnitName(u: MathUnit): string | undefined {
  // An angular frequency in rad/s, a frequency in Hz, any other s⁻¹ (a rate such as R/L) in s⁻¹.
  const frequency = frequencyKind(u);
  if (frequency) return frequency === 'angular' ? 'rad/s' : frequency === 'cyclic' ? 'Hz' : 's^-1';
  const d = effectiveDims(u);
  const single = (u as unknown as { units: { unit: { name: string }; power: number }[] }).units;
  if (single.length === 1 && single[0].power === 1 && POWER_UNITS.has(single[0].unit.name)) {
    return single[0].unit.name === 'VAR' ? 'var' : single[0].unit.name;
  }
  return preferredUnits.find((p) => sameDims(effectiveDims(p.unit), d) && (d[ANGLE] === 0 || p.name === 'rad'))?.name;
}

const ENGINEERING_PREFIXES: [number, string][] = [
  [-24, 'y'],
  [-21, 'z'],
  [-18, 'a'],
  [-15, 'f'],
  [-12, 'p'],
  [-9, 'n'],
  [-6, 'u'],
  [-3, 'm'],
  [0, ''],
  [3, 'k'],
  [6, 'M'],
  [9, 'G'],
  [12, 'T'],
  [15, 'P'],
  [18, 'E'],
  [21, 'Z'],
  [24, 'Y'],
];

/** Text of a number to n significant digits, without exponent notation inside [1e-3, 1e6). */
export function formatNumber(x: number, digits: number): string {
  if (!Number.isFinite(x)) return Number.isNaN(x) ? 'NaN' : x > 0 ? '∞' : '−∞';
  if (x === 0) return '0';
  const abs = Math.abs(x);
  let text: string;
  if (abs >= 1e-3 && abs < 1e6) {
    const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(abs)));
    text = abs.toFixed(Math.min(decimals, 20));
    // toFixed may carry into one more digit (999.96 → 1000.0): trim to the digits asked for.
    const intDigits = text.split('.')[0].replace(/^0+/, '').length;
    if (intDigits > 0 && text.includes('.') && intDigits + (text.split('.')[1]?.length ?? 0) > Math.max(digits, intDigits)) {
      text = abs.toFixed(Math.max(0, digits - intDigits));
    }
  } else {
    const [mantissa, exponent] = abs.toExponential(digits - 1).split('e');
    text = `${mantissa}e${exponent.replace('+', '')}`;
  }
  return (x < 0 ? '−' : '') + text;
}

function chooseEngineering(magnitude: number, base: string): { unit: string; factor: number } {
  if (NO_PREFIX.has(base) || base.includes('/') || base.includes(' ') || base.includes('^') || magnitude === 0 || !Number.isFinite(magnitude)) {
    return { unit: base, factor: 1 };
  }
  const exp = Math.floor(Math.log10(magnitude) / 3) * 3;
  const clamped = Math.max(-24, Math.min(24, exp));
  const [e, p] = ENGINEERING_PREFIXES.find(([x]) => x === clamped)!;
  return { unit: `${p}${base}`, factor: 10 ** e };
}

/** A matrix's own nested arrays, to read only (toArray copies every element: a 200 000-value column was copied to be shown). */
const matrixData = (m: unknown): unknown[] => (m as { valueOf(): unknown[] }).valueOf();

function siForm(value: unknown): SiValue {
  if (typeof value === 'number' || typeof value === 'boolean' || typeof value === 'string') return value;
  if (isComplex(value)) return value.im === 0 ? value.re : { re: value.re, im: value.im };
  if (isUnit(value)) return siForm(offsetScaleOf(value) ? kelvinOf(value) : unitValue(value));
  if (math.isMatrix(value)) return siForm(matrixData(value));
  if (Array.isArray(value)) return value.map(siForm);
  if (typeof value === 'bigint') return Number(value);
  if (value && typeof value === 'object' && 'valueOf' in value) {
    const v = (value as { valueOf(): unknown }).valueOf();
    if (typeof v === 'number') return v;
  }
  return String(value);
}

function angleText(rad: number, digits: number): string {
  const deg = (rad * 180) / Math.PI;
  const decimals = Math.max(1, digits - 3);
  const text = Math.abs(deg).toFixed(decimals);
  return `${deg < 0 && Number(text) !== 0 ? '−' : ''}${text}°`;
}

function complexTexts(re: number, im: number, unitText: string, digits: number): { polar: string; rect: string } {
  const mag = Math.hypot(re, im);
  const u = unitText ? ` ${unitText}` : '';
  const polar = `${formatNumber(mag, digits)}${u} ∠ ${angleText(Math.atan2(im, re), digits)}`;
  const sign = im < 0 ? '−' : '+';
  const rectCore = `${formatNumber(re, digits)} ${sign} j${formatNumber(Math.abs(im), digits)}`;
  const rect = unitText ? `(${rectCore}) ${unitText}` : rectCore;
  return { polar, rect };
}

const factors = new Map<string, number>();
/** The SI value of one of a unit (mA → 0.001), remembered per unit text. */
function unitFactor(unit: string): number {
  let f = factors.get(unit);
  if (f === undefined) {
    f = (unitValue(math.unit(1, unit) as MathUnit) as number) ?? 1;
    factors.set(unit, f);
  }
  return f;
}

/** Formats a value; `target` is the unit asked for with `to`, in mathjs syntax. */
export function formatValue(value: unknown, options: DisplayOptions = DEFAULT_DISPLAY, target?: string): FormattedValue {
  const digits = options.significantDigits;
  if (isUnit(value)) {
    const u = value as MathUnit;
    const raw = unitValue(u);
    // rad², rad⁻¹, ... alone is a plain number (the radian is 1 in SI).
    if (!target && isAnglePower(u)) return formatValue(raw, options);
    const baseName = siUnitName(u) ?? '';
    let shownUnit: string;
    let factor: number;
    const scale = offsetScaleOf(u);
    if (scale && !target) {
      // A temperature on an offset scale is shown on it (75.00 °C); its SI value is in kelvin (siForm).
      shownUnit = `${scale.prefix.name}${scale.unit.name}`;
      factor = Number(scale.unit.value) * scale.prefix.value;
    } else if (target) {
      shownUnit = target;
      factor = unitFactor(target);
    } else if (baseName) {
      const magnitude = isComplex(raw) ? Math.hypot(raw.re, raw.im) : Math.abs(Number(raw));
      ({ unit: shownUnit, factor } = chooseEngineering(magnitude, baseName));
      if (shownUnit !== baseName) {
        // Rounding can carry into the next prefix (999.96 mA → 1000 mA): choose again from the rounded value.
        const rounded = Number(formatNumber(magnitude / factor, digits).replace('−', '-'));
        if (rounded >= 1000) ({ unit: shownUnit, factor } = chooseEngineering(rounded * factor, baseName));
      }
    } else {
      const simplified = (u as unknown as { simplify(): MathUnit }).simplify();
      shownUnit = (simplified as unknown as { formatUnits(): string }).formatUnits();
      factor = unitFactor(shownUnit);
    }
    const unitText = prettyUnit(shownUnit);
    const siUnit = baseName;
    if (isComplex(raw)) {
      const { polar, rect } = complexTexts(raw.re / factor, raw.im / factor, unitText, digits);
      const [display, displayAlt] = options.complexForm === 'polar' ? [polar, rect] : [rect, polar];
      return { si: siForm(raw), siUnit, display, displayAlt, unit: shownUnit };
    }
    const n = Number(raw);
    return {
      si: siForm(scale ? u : raw),
      siUnit,
      display: `${formatNumber(n / factor, digits)}${unitText === '°' ? '' : ' '}${unitText}`.trim(),
      unit: shownUnit,
    };
  }
  if (isComplex(value)) {
    const { polar, rect } = complexTexts(value.re, value.im, '', digits);
    if (value.im === 0) return { si: value.re, siUnit: '', display: formatNumber(value.re, digits), unit: '' };
    const [display, displayAlt] = options.complexForm === 'polar' ? [polar, rect] : [rect, polar];
    return { si: siForm(value), siUnit: '', display, displayAlt, unit: '' };
  }
  if (typeof value === 'number') return { si: value, siUnit: '', display: formatNumber(value, digits), unit: '' };
  if (typeof value === 'boolean') return { si: value, siUnit: '', display: value ? 'true' : 'false', unit: '' };
  if (math.isMatrix(value) || Array.isArray(value)) {
    const arr = math.isMatrix(value) ? matrixData(value) : (value as unknown[]);
    const shown = arr.length > 12 ? [...arr.slice(0, 12), '…'] : arr;
    const inner = (x: unknown): string => (Array.isArray(x) ? `[${x.map(inner).join(', ')}]` : x === '…' ? '…' : formatValue(x, options).display);
    return { si: siForm(arr), siUnit: '', display: `[${shown.map(inner).join(', ')}]`, unit: '' };
  }
  return { si: siForm(value), siUnit: '', display: String(value), unit: '' };
}
