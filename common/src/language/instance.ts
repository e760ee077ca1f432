/**
 * The finished language: mathjs with our units, the trade's functions, operators that drop a radian
 * riding along with another dimension (so rad/s·H adds to Ω), and the unsafe functions disabled.
 * Import `math` from here, never from ./math, so nothing runs before this set-up is complete.
 */
import type { Unit as MathUnit } from 'mathjs';
import { circuitFunctions } from '../circuits/functions';
import { dropRidingAngle } from '../units/quantities';
import { disableUnsafeFunctions, math } from './math';

const typed = math.typed;
const withRidingAngleDropped = (name: 'add' | 'subtract' | 'smaller' | 'larger' | 'smallerEq' | 'largerEq' | 'equal' | 'unequal' | 'compare') => {
  const original = math[name] as (a: unknown, b: unknown) => unknown;
  return typed(name, {
    'Unit, Unit': (a: MathUnit, b: MathUnit) => original(dropRidingAngle(a), dropRidingAngle(b)),
    'any, any': (a: unknown, b: unknown) => original(a, b),
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
