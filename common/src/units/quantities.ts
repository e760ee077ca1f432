/**
 * Quantities by dimension, for the engine's own functions: read a mathjs Unit as an SI number (or
 * complex) after checking its dimension, and make a Unit from an SI value. Radians ride along in
 * mathjs as a dimension of their own; in SI they are 1 (SI Brochure, 9th ed., 2.3.3), so where an
 * angle multiplies another quantity it is dropped (rad/s·H is Ω).
 */
import { isComplex, isUnit, type MathJsInstance, type Unit as MathUnit } from 'mathjs';

/**
 * The language's instance, handed over by language/math.ts as it sets itself up (`useInstance`). This module
 * never imports that one, so there is no import cycle and no order of loading in which either is half made.
 */
let math: MathJsInstance;
export function useInstance(instance: MathJsInstance): void {
  math = instance;
}

/** A copy of a Unit with another value (mathjs keeps a Unit's value in SI, whatever its prefix). */
export function withValue(u: MathUnit, value: unknown): MathUnit {
  const out = u.clone();
  (out as unknown as { value: unknown }).value = value;
  return out;
}

export type Scalar = number | { re: number; im: number };

export const DIMENSIONS = {
  none: [0, 0, 0, 0, 0, 0, 0, 0, 0],
  current: [0, 0, 0, 1, 0, 0, 0, 0, 0],
  voltage: [1, 2, -3, -1, 0, 0, 0, 0, 0],
  impedance: [1, 2, -3, -2, 0, 0, 0, 0, 0],
  capacitance: [-1, -2, 4, 2, 0, 0, 0, 0, 0],
  inductance: [1, 2, -2, -2, 0, 0, 0, 0, 0],
  frequency: [0, 0, -1, 0, 0, 0, 0, 0, 0],
  time: [0, 0, 1, 0, 0, 0, 0, 0, 0],
  power: [1, 2, -3, 0, 0, 0, 0, 0, 0],
  charge: [0, 0, 1, 1, 0, 0, 0, 0, 0],
} as const;
export type Dimension = keyof typeof DIMENSIONS;

const ANGLE = 7;
const NAMES: Record<Dimension, string> = {
  none: 'a plain number',
  current: 'a current',
  voltage: 'a voltage',
  impedance: 'an impedance',
  capacitance: 'a capacitance',
  inductance: 'an inductance',
  frequency: 'a frequency',
  time: 'a time',
  power: 'a power',
  charge: 'a charge',
};
const SI_UNIT: Record<Dimension, string> = {
  none: '',
  current: 'A',
  voltage: 'V',
  impedance: 'ohm',
  capacitance: 'F',
  inductance: 'H',
  frequency: 'Hz',
  time: 's',
  power: 'W',
  charge: 'C',
};

export function dimensionsOf(u: MathUnit): number[] {
  return (u as unknown as { dimensions: number[] }).dimensions;
}

/** Dimensions without a radian that rides along with other dimensions. */
export function withoutAngle(d: readonly number[]): number[] {
  const out = [...d];
  if (out.some((x, i) => i !== ANGLE && x !== 0)) out[ANGLE] = 0;
  return out;
}

const equalDims = (a: readonly number[], b: readonly number[]) => a.every((x, i) => Math.abs(x - (b[i] ?? 0)) < 1e-12);

/** True when the engine's numeric mode is on: plain numbers are taken as SI values (sweeps). */
let numericMode = false;
export function withNumericMode<T>(fn: () => T): T {
  const before = numericMode;
  numericMode = true;
  try {
    return fn();
  } finally {
    numericMode = before;
  }
}

/** Reads x as an SI value of the given dimension; `what` names the argument for the error message. */
export function si(x: unknown, dim: Dimension, what: string): Scalar {
  if (isUnit(x)) {
    const d = withoutAngle(dimensionsOf(x));
    const wanted = dim === 'frequency' ? [DIMENSIONS.frequency, [0, 0, -1, 0, 0, 0, 0, 1, 0]] : [DIMENSIONS[dim]];
    if (!wanted.some((w) => equalDims(d, w) || equalDims(dimensionsOf(x), w))) {
      throw new Error(`${what} must be ${NAMES[dim]}`);
    }
    const v = (x as unknown as { value: unknown }).value;
    return isComplex(v) ? (v.im === 0 ? v.re : { re: v.re, im: v.im }) : (v as number);
  }
  if (typeof x === 'number') {
    if (dim === 'none' || numericMode) return x;
    throw new Error(`${what} must be ${NAMES[dim]} with a unit (for example ${SI_UNIT[dim]}), not a plain number`);
  }
  if (isComplex(x)) {
    if (dim === 'none' || numericMode) return x.im === 0 ? x.re : { re: x.re, im: x.im };
    throw new Error(`${what} must be ${NAMES[dim]} with a unit, not a plain number`);
  }
  throw new Error(`${what} must be ${NAMES[dim]}`);
}

/** A real SI value of the given dimension; a complex value is refused. */
export function real(x: unknown, dim: Dimension, what: string): number {
  const v = si(x, dim, what);
  if (typeof v !== 'number') throw new Error(`${what} must be a real quantity, not a complex one`);
  return v;
}

/** Makes a Unit from an SI value (a plain number in numeric mode or for a dimensionless result). */
export function quantity(value: Scalar, unit: string): unknown {
  if (!unit || numericMode) return typeof value === 'number' ? value : math.complex(value.re, value.im);
  return withValue(math.unit(unit) as MathUnit, typeof value === 'number' ? value : math.complex(value.re, value.im));
}

/** Strips a riding radian from a Unit, so that rad/s·H and Ω can be added. */
export function dropRidingAngle(u: MathUnit): MathUnit {
  const d = dimensionsOf(u);
  if (d[ANGLE] === 0 || !d.some((x, i) => i !== ANGLE && x !== 0)) return u;
  const parts: string[] = [];
  const baseNames = ['kg', 'm', 's', 'A', 'K', 'cd', 'mol'];
  d.forEach((p, i) => {
    if (i < 7 && p !== 0) parts.push(p === 1 ? baseNames[i] : `${baseNames[i]}^${p}`);
  });
  return withValue(math.unit(parts.join(' ')) as MathUnit, (u as unknown as { value: unknown }).value);
}

/**
 * Angular frequency and frequency have the same SI dimension (s⁻¹, the radian being 1), yet confusing
 * them is an error of 2π. A value's kind is read from its unit: `angular` carries the radian (rad/s,
 * natural_frequency, 2 pi f); `cyclic` is in hertz (Hz, resonant_frequency, w / (2 pi)); `rate` is any
 * other s⁻¹ (R/L, 1/sqrt(L C), 1/T), which either kind of argument accepts.
 */
export type FrequencyKind = 'angular' | 'cyclic' | 'rate';

export function frequencyKind(x: unknown): FrequencyKind | undefined {
  if (!isUnit(x)) return undefined;
  const d = dimensionsOf(x);
  if (!d.every((p, i) => (i === 2 ? p === -1 : i === ANGLE || p === 0))) return undefined;
  if (d[ANGLE] === 1) return 'angular';
  if (d[ANGLE] !== 0) return undefined;
  const parts = (x as unknown as { units: { unit: { name: string }; power: number }[] }).units;
  return parts.length === 1 && parts[0].power === 1 && parts[0].unit.name === 'Hz' ? 'cyclic' : 'rate';
}

// Made on first use, once the instance is handed over.
let frequencyUnits: Record<'angular' | 'cyclic', MathUnit> | undefined;
const FREQUENCY_UNITS = () => (frequencyUnits ??= { angular: math.unit('rad/s') as MathUnit, cyclic: math.unit('Hz') as MathUnit });

/** The same SI value as an angular frequency (rad/s) or a frequency (Hz). */
export function asFrequencyKind(x: MathUnit, kind: 'angular' | 'cyclic'): MathUnit {
  return withValue(FREQUENCY_UNITS()[kind], (x as unknown as { value: unknown }).value);
}

/** Only the angle, to a power other than 0 and 1 (rad², rad⁻¹): a plain number, the radian being 1. */
export function isAnglePower(u: MathUnit): boolean {
  return dimensionsOf(u).every((x, i) => (i === ANGLE ? x !== 0 && x !== 1 : x === 0));
}
