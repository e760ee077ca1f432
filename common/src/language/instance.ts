/**
 * The finished language: mathjs with our units, the trade's functions, operators that drop a radian
 * riding along with another dimension (so rad/s·H adds to Ω), and the unsafe functions disabled.
 * Import `math` from here, never from ./math, so nothing runs before this set-up is complete.
 */
import type { Unit as MathUnit } from 'mathjs';
import { circuitFunctions } from '../circuits/functions';
import { dropRidingAngle } from '../units/quantities';
import { checkCombined, disableUnsafeFunctions, math, withValue } from './math';

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
  return typed(name, {
    'Unit, Unit': (a: MathUnit, b: MathUnit) => {
      if (isPureAngle(a) && isDimensionless(b)) return original(a, asRadians((b as unknown as { value: unknown }).value));
      if (isPureAngle(b) && isDimensionless(a)) return original(asRadians((a as unknown as { value: unknown }).value), b);
      return original(dropRidingAngle(a), dropRidingAngle(b));
    },
    'number | Complex, Unit': (a: unknown, b: MathUnit) => original(plainAsAngle(a, b), b),
    'Unit, number | Complex': (a: MathUnit, b: unknown) => original(a, plainAsAngle(b, a)),
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
math.import(circuitFunctions, { override: false });
disableUnsafeFunctions(math);

export { math };
export { parse, isUnit, isComplex, Unit } from './math';

/** Names the language gives meaning to (functions and constants), so they are not "unknown". */
export function isBuiltin(name: string): boolean {
  return Object.prototype.hasOwnProperty.call(math, name) || name in circuitFunctions;
}
