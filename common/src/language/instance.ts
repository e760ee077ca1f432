/**
 * The finished language: mathjs with our units, the trade's functions, operators that drop a radian
 * riding along with another dimension (so rad/s·H adds to Ω), and the unsafe functions disabled.
 * Import `math` from here, never from ./math, so nothing runs before this set-up is complete.
 */
import type { Unit as MathUnit } from 'mathjs';
import { circuitFunctions } from '../circuits/functions';
import { asFrequencyKind, dropRidingAngle, frequencyKind, isAnglePower } from '../units/quantities';
import { checkCombined, disableUnsafeFunctions, isUnit, math, operatorRules, withValue } from './math';

const typed = math.typed;
const ANGLE = 7;
const dims = (u: MathUnit) => (u as unknown as { dimensions: number[] }).dimensions;
const isPureAngle = (u: MathUnit) => dims(u).every((x, i) => x === (i === ANGLE ? 1 : 0));
const isDimensionless = (u: MathUnit) => dims(u).every((x) => x === 0);
const asRadians = (value: unknown) => withValue(math.unit('rad') as MathUnit, value);

/** Operators that treat the radian as 1 (SI Brochure): rad·Ω meets Ω, and a plain number meets an angle. */
const withRidingAngleDropped = (name: 'add' | 'subtract' | 'smaller' | 'larger' | 'smallerEq' | 'largerEq' | 'equal' | 'unequal') => {
  const original = math[name] as (a: unknown, b: unknown) => unknown;
  const plainAsAngle = (x: unknown, other: MathUnit) => (isPureAngle(other) ? asRadians(x) : x);
  // rad², rad⁻¹, ... alone (the (2 pi f)² L C of a filter) is a plain number.
  const plainIfAnglePower = (u: MathUnit): unknown => (isAnglePower(u) ? (u as unknown as { value: unknown }).value : u);
  return typed(name, {
    'Unit, Unit': (a: MathUnit, b: MathUnit) => {
      if (isAnglePower(a) || isAnglePower(b)) return (math[name] as (x: unknown, y: unknown) => unknown)(plainIfAnglePower(a), plainIfAnglePower(b));
      if (isPureAngle(a) && isDimensionless(b)) return original(a, asRadians((b as unknown as { value: unknown }).value));
      if (isPureAngle(b) && isDimensionless(a)) return original(asRadians((a as unknown as { value: unknown }).value), b);
      return original(dropRidingAngle(a), dropRidingAngle(b));
    },
    'number | Complex, Unit': (a: unknown, b: MathUnit) => (isAnglePower(b) ? original(a, plainIfAnglePower(b)) : original(plainAsAngle(a, b), b)),
    'Unit, number | Complex': (a: MathUnit, b: unknown) => (isAnglePower(a) ? original(plainIfAnglePower(a), b) : original(a, plainAsAngle(b, a))),
    'any, any': (a: unknown, b: unknown) => {
      checkCombined([a, b]);
      return original(a, b);
    },
  });
};

math.import(
  {
    add: withRidingAngleDropped('add'),
    subtract: withRidingAngleDropped('subtract'),
    smaller: withRidingAngleDropped('smaller'),
    larger: withRidingAngleDropped('larger'),
    smallerEq: withRidingAngleDropped('smallerEq'),
    largerEq: withRidingAngleDropped('largerEq'),
    equal: withRidingAngleDropped('equal'),
    unequal: withRidingAngleDropped('unequal'),
  },
  { override: true },
);
const TWO_PI = 2 * Math.PI;
const isTwoPi = (x: unknown) => typeof x === 'number' && Math.abs(x - TWO_PI) <= 4 * Number.EPSILON * TWO_PI;
const isTime = (u: MathUnit) => dims(u).every((x, i) => x === (i === 2 ? 1 : 0));

/*
 * 2π keeps angular frequency apart from frequency (operatorRules, applied in math.ts's wrappers):
 * 2π times a frequency (or 2π over a time) is an angular frequency in rad/s; an angular frequency (or
 * any s⁻¹) over 2π, or one over 2π times a time (1 / (2 pi sqrt(L C))), is a frequency in Hz.
 */

/** Marks 2π times a time (2 pi sqrt(L C)): a period, one over which is a frequency in Hz. */
const PERIOD = Symbol('period');
const overPeriod = (out: unknown, divisor: MathUnit) =>
  (divisor as unknown as Record<symbol, boolean>)[PERIOD] && frequencyKind(out) === 'rate' ? asFrequencyKind(out as MathUnit, 'cyclic') : out;
operatorRules.multiply = (a, b, out) => {
  const [n, u] = typeof a === 'number' ? [a, b] : [b, a];
  if (!isTwoPi(n) || !isUnit(u)) return out;
  const kind = frequencyKind(u);
  if (kind === 'cyclic' || kind === 'rate') return asFrequencyKind(out as MathUnit, 'angular');
  if (isTime(u as MathUnit)) (out as Record<symbol, boolean>)[PERIOD] = true;
  return out;
};
operatorRules.divide = (a, b, out) => {
  if (!isUnit(b)) {
    const kind = isUnit(a) && isTwoPi(b) ? frequencyKind(a) : undefined;
    return kind === 'angular' || kind === 'rate' ? asFrequencyKind(out as MathUnit, 'cyclic') : out;
  }
  if (typeof a === 'number' && isTwoPi(a) && isTime(b as MathUnit)) return asFrequencyKind(out as MathUnit, 'angular');
  return overPeriod(out, b as MathUnit);
};
math.import(circuitFunctions, { override: false });
disableUnsafeFunctions(math);

export { math };
export { parse, isUnit, isComplex, Unit } from './math';

/** Names the language gives meaning to (functions and constants), so they are not "unknown". */
export function isBuiltin(name: string): boolean {
  return Object.prototype.hasOwnProperty.call(math, name) || name in circuitFunctions;
}
