/**
 * Ampwright's own mathjs instance. Units are adjusted for the trade (var and VA as real units of
 * power), `j` joins `i` as the imaginary unit, functions that reject a Unit are taught to accept one,
 * and everything that could reach outside a sheet (import, createUnit, evaluate, parse, ...) is
 * disabled inside expressions, as mathjs's security notes advise. Host code keeps its own references.
 * Then the finished language: the trade's functions, operators that drop a radian riding along with another
 * dimension (so rad/s·H adds to Ω), and the 2π rules of angular frequency.
 *
 * This is the one module of the instance: import `math` (and `parse`, `Unit`, `isUnit`, ...) from here.
 * The two modules its set-up uses (units/quantities.ts, circuits/functions.ts) are handed the instance
 * instead of importing it, so there is no import cycle (load-order.spec.ts loads each module first).
 */
import { all, create, type MathJsInstance, type MathNode, type Unit as MathUnit } from 'mathjs';
import { circuitFunctions, useInstance as handToFunctions } from '../circuits/functions';
import { asFrequencyKind, dropRidingAngle, frequencyKind, isAnglePower, useInstance as handToQuantities, withValue } from '../units/quantities';
import { noteOffsetProduct, onOneScale, temperatureDifference } from '../units/temperature';
import { checkDeadline } from './deadline';

export const math: MathJsInstance = create(all, { number: 'number', precision: 64 });
// The modules the set-up below uses get the instance first; they never import this module.
handToQuantities(math);
handToFunctions(math);

// Host references, taken before the expression-level functions are disabled.
export const parse = math.parse.bind(math) as (expr: string) => MathNode;
export const Unit = math.Unit as unknown as {
  /** `unit`: a unit's name, or a valueless Unit whose units the new one takes (no parsing). */
  new (value: unknown, unit?: string | MathUnit): MathUnit;
  isValuelessUnit(name: string): boolean;
  BASE_DIMENSIONS: string[];
  PREFIXES: Record<string, Record<string, { name: string; value: number; scientific: boolean }>>;
  UNITS: Record<string, unknown>;
  parse(s: string): MathUnit;
};
export const isUnit = (x: unknown): x is MathUnit => math.isUnit(x);
export { withValue };
export const isComplex = (x: unknown): x is { re: number; im: number } => math.isComplex(x);

// mathjs defines VAR as an imaginary multiple of W; reactive power in this trade is a real quantity.
math.createUnit('VAR', { definition: '1 W', prefixes: 'short' }, { override: true });
math.createUnit('var', { definition: '1 W', prefixes: 'short' });
// mathjs's electronvolt is the CODATA 2010 value; since the 2019 SI, e = 1.602176634e-19 C exactly.
math.createUnit('eV', { definition: '1.602176634e-19 J', prefixes: 'short' }, { override: true });

// Whether a name is a unit is asked for every symbol at every compile; the unit table is fixed once
// this module has run, so the answer is remembered.
{
  const UnitClass = math.Unit as unknown as { isValuelessUnit(name: string): boolean };
  const original = UnitClass.isValuelessUnit.bind(UnitClass);
  const known = new Map<string, boolean>();
  UnitClass.isValuelessUnit = (name: string) => {
    let answer = known.get(name);
    if (answer === undefined) {
      answer = original(name);
      known.set(name, answer);
    }
    return answer;
  };
}

/**
 * Guards against results too large to compute in an evaluation (the worker also has a memory bound).
 * 100 000 keeps the costliest whole-matrix operation with units well inside the server's 2 s deadline:
 * the fuzzer found `ones(562500) * 2 V` taking 2.1 s on this machine under the former limit of 10^6.
 */
export const MAX_ELEMENTS = 100_000;
const checkSize = (dims: number[]) => {
  const count = dims.reduce((a, b) => a * Math.max(0, b), 1);
  if (!Number.isFinite(count) || count > MAX_ELEMENTS) {
    throw new Error(`a matrix of ${dims.join(' × ')} elements is larger than the limit of ${MAX_ELEMENTS.toLocaleString('en')} elements`);
  }
};

/** The longest string an expression may build (concat of strings). */
export const MAX_STRING_LENGTH = 100_000;

/** The dimensions of a matrix or nested array; undefined for anything else. */
function dimsOf(x: unknown): number[] | undefined {
  if (math.isMatrix(x)) return (x as { size(): number[] }).size();
  if (!Array.isArray(x)) return undefined;
  const dims: number[] = [];
  let level: unknown = x;
  while (Array.isArray(level)) {
    dims.push(level.length);
    level = level[0];
  }
  return dims;
}
const countOf = (x: unknown) => dimsOf(x)?.reduce((a, b) => a * b, 1) ?? 1;

/**
 * Before an element-wise operation with broadcasting, or a matrix product: the largest result it can give
 * for these operands — per axis, the largest size (an n×1 by 1×m pair makes n×m) — is checked before
 * mathjs allocates anything, and the evaluation's deadline is read at each matrix operation.
 */
export function checkCombined(args: unknown[]): void {
  const all = args.map(dimsOf).filter((d): d is number[] => d !== undefined);
  if (all.length === 0) return checkDeadline();
  checkDeadline(true);
  if (all.length < 2) return;
  const rank = Math.max(...all.map((d) => d.length));
  const combined = Array.from({ length: rank }, (_, k) => Math.max(...all.map((d) => d[d.length - rank + k] ?? 1)));
  checkSize(combined);
}

const typed = math.typed;
const origZeros = math.zeros;
const origOnes = math.ones;
const origIdentity = math.identity;
const origRange = math.range;
const origRe = math.re as (x: unknown) => unknown;
const origIm = math.im as (x: unknown) => unknown;
const origConj = math.conj as (x: unknown) => unknown;
const origArg = math.arg as (x: unknown) => unknown;

const origResize = math.resize as (...a: unknown[]) => unknown;
const origDiag = math.diag as (...a: unknown[]) => unknown;
const origKron = math.kron as (...a: unknown[]) => unknown;
const origConcat = math.concat as (...a: unknown[]) => unknown;
const origMatrix = math.matrix as (...a: unknown[]) => unknown;

/** `range("1:10")`, `range("1:2:10")`: the numbers of mathjs's string form, as start, end, step. */
function rangeStringNumbers(text: string): number[] {
  const parts = text.split(':').map((p) => Number(p.trim()));
  if (parts.length === 3) return [parts[0], parts[2], parts[1]];
  return parts;
}

/** Element-wise and matrix operations whose result can be larger than either operand (broadcasting, outer products). */
const COMBINING = [
  'multiply',
  'divide',
  'dotMultiply',
  'dotDivide',
  'dotPow',
  'pow',
  'mod',
  'and',
  'or',
  'xor',
  'atan2',
  'hypot',
  'nthRoot',
  'gcd',
  'lcm',
] as const;

const sizeArgs = (args: unknown[]) =>
  args.flatMap((a) => (Array.isArray(a) ? a : math.isMatrix(a) ? (a.toArray() as unknown[]) : [a])).filter((a) => typeof a === 'number') as number[];

function unitValueAs(u: MathUnit, fn: (v: unknown) => unknown): MathUnit {
  return withValue(u, fn((u as unknown as { value: unknown }).value));
}

const radians = (x: number): MathUnit => math.unit(x, 'rad');

math.import(
  {
    zeros: (...args: unknown[]) => {
      checkSize(sizeArgs(args));
      return (origZeros as (...a: unknown[]) => unknown)(...args);
    },
    ones: (...args: unknown[]) => {
      checkSize(sizeArgs(args));
      return (origOnes as (...a: unknown[]) => unknown)(...args);
    },
    identity: (...args: unknown[]) => {
      const dims = sizeArgs(args);
      checkSize(dims.length === 1 ? [dims[0], dims[0]] : dims);
      return (origIdentity as (...a: unknown[]) => unknown)(...args);
    },
    range: (...args: unknown[]) => {
      const nums = typeof args[0] === 'string' ? rangeStringNumbers(args[0]) : sizeArgs(args);
      if (nums.some((x) => !Number.isFinite(x))) checkSize([Infinity]);
      if (nums.length >= 2) {
        const step = nums[2] ?? 1;
        checkSize([Math.abs((nums[1] - nums[0]) / (step || 1))]);
      }
      return (origRange as (...a: unknown[]) => unknown)(...args);
    },
    resize: (x: unknown, size: unknown, ...rest: unknown[]) => {
      checkSize(sizeArgs([size]));
      return origResize(x, size, ...rest);
    },
    diag: (x: unknown, ...rest: unknown[]) => {
      const dims = dimsOf(x);
      if (dims && dims.length === 1) {
        const k = Math.abs(Number(sizeArgs(rest)[0] ?? 0)) || 0;
        checkSize([dims[0] + k, dims[0] + k]);
      }
      return origDiag(x, ...rest);
    },
    kron: (x: unknown, y: unknown) => {
      checkSize([countOf(x), countOf(y)]);
      return origKron(x, y);
    },
    concat: (...args: unknown[]) => {
      const strings = args.filter((a): a is string => typeof a === 'string');
      if (strings.length === args.length || strings.length === args.length - 1) {
        const length = strings.reduce((n, a) => n + a.length, 0);
        if (length > MAX_STRING_LENGTH)
          throw new Error(`a string of ${length.toLocaleString('en')} characters is longer than the limit of ${MAX_STRING_LENGTH.toLocaleString('en')}`);
      }
      checkSize([args.reduce((n: number, a) => n + (dimsOf(a) ? countOf(a) : 0), 0)]);
      return origConcat(...args);
    },
    matrix: (...args: unknown[]) => {
      if (typeof args[0] === 'string' || typeof args[1] === 'string') {
        if (args.some((a) => typeof a === 'string' && a !== 'dense')) throw new Error('only dense matrices are part of the sheet language');
      }
      return origMatrix(...args);
    },
    re: typed('re', { Unit: (u: MathUnit) => unitValueAs(u, (v) => (isComplex(v) ? v.re : v)), any: (x: unknown) => origRe(x) }),
    im: typed('im', { Unit: (u: MathUnit) => unitValueAs(u, (v) => (isComplex(v) ? v.im : 0)), any: (x: unknown) => origIm(x) }),
    conj: typed('conj', { Unit: (u: MathUnit) => unitValueAs(u, (v) => (isComplex(v) ? math.complex(v.re, -v.im) : v)), any: (x: unknown) => origConj(x) }),
    arg: typed('arg', {
      Unit: (u: MathUnit) => {
        const v = (u as unknown as { value: unknown }).value;
        return radians(isComplex(v) ? Math.atan2(v.im, v.re) : (v as number) < 0 ? Math.PI : 0);
      },
      any: (x: unknown) => radians(origArg(x) as number),
    }),
  },
  { override: true },
);

/**
 * A rule applied to the result of a binary multiply or divide (the 2π rule of angular frequency, set in
 * below), inside the same wrapper as the size check so that it adds no layer to every operation.
 */
export const operatorRules: { multiply?: (a: unknown, b: unknown, out: unknown) => unknown; divide?: (a: unknown, b: unknown, out: unknown) => unknown } = {};

/** Operations in which a temperature on an offset scale counts by its number on that scale (units/temperature.ts). */
const PRODUCTS = new Set<string>(['multiply', 'divide', 'dotMultiply', 'dotDivide', 'pow', 'dotPow']);

// Checked before the operation, whatever the operands' types; everything else passes straight through.
math.import(
  Object.fromEntries(
    COMBINING.map((name) => {
      const original = math[name] as (...a: unknown[]) => unknown;
      const rule = name === 'multiply' || name === 'divide' ? name : undefined;
      const notesOffset = PRODUCTS.has(name);
      return [
        name,
        typed(name, {
          'any, any': (a: unknown, b: unknown) => {
            checkCombined([a, b]);
            if (notesOffset) noteOffsetProduct(a, b);
            const out = original(a, b);
            return rule && operatorRules[rule] ? operatorRules[rule](a, b, out) : out;
          },
          'any, any, ...any': (a: unknown, b: unknown, rest: unknown[]) => {
            checkCombined([a, b, ...rest]);
            return original(a, b, ...rest);
          },
        }),
      ];
    }),
  ),
  { override: true },
);

math.import({ j: math.complex(0, 1) }, { override: false });

/**
 * Names that would let an expression reach outside the sheet or change the language itself.
 * The first list is replaced in the instance by functions that refuse (mathjs's security advice);
 * the second is used by the library's own lazy factories, so it is refused when an expression is
 * checked instead (language/expression.ts), before anything is evaluated.
 */
export const DISABLED_FUNCTIONS = [
  'import',
  'createUnit',
  'evaluate',
  'parse',
  'simplify',
  'simplifyConstant',
  'simplifyCore',
  'derivative',
  'resolve',
  'compile',
  'parser',
  'rationalize',
  'leafCount',
  'symbolicEqual',
  'help',
] as const;
export const REFUSED_NAMES = new Set<string>([
  ...DISABLED_FUNCTIONS,
  'typed',
  'config',
  'chain',
  'reviver',
  'replacer',
  'format',
  'print',
  'Unit',
  'Complex',
  'Node',
  'SymbolNode',
  'FunctionNode',
  'Parser',
  'Help',
  'ResultSet',
  'Chain',
  'Matrix',
  'DenseMatrix',
  'SparseMatrix',
  'Range',
  'Index',
  'splitUnit',
  'createUnitClass',
]);

export function disableUnsafeFunctions(instance: MathJsInstance): void {
  const disabled: Record<string, () => never> = {};
  for (const name of DISABLED_FUNCTIONS) {
    disabled[name] = () => {
      throw new Error(`the function ${name} is not available in a sheet`);
    };
  }
  instance.import(disabled, { override: true });
}

// The finished language.
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
  // Temperatures on offset scales (degC, degF), alone or in matrices: a difference is in K, a comparison in kelvin.
  const onTemperatures = (x: unknown, y: unknown): unknown =>
    name === 'subtract' ? (temperatureDifference(x, y, original) ?? original(x, y)) : name === 'add' ? original(x, y) : original(...onOneScale(x, y));
  return typed(name, {
    'Unit, Unit': (a: MathUnit, b: MathUnit) => {
      if (isAnglePower(a) || isAnglePower(b)) return (math[name] as (x: unknown, y: unknown) => unknown)(plainIfAnglePower(a), plainIfAnglePower(b));
      if (isPureAngle(a) && isDimensionless(b)) return original(a, asRadians((b as unknown as { value: unknown }).value));
      if (isPureAngle(b) && isDimensionless(a)) return original(asRadians((a as unknown as { value: unknown }).value), b);
      return onTemperatures(dropRidingAngle(a), dropRidingAngle(b));
    },
    'number | Complex, Unit': (a: unknown, b: MathUnit) => (isAnglePower(b) ? original(a, plainIfAnglePower(b)) : original(plainAsAngle(a, b), b)),
    'Unit, number | Complex': (a: MathUnit, b: unknown) => (isAnglePower(a) ? original(plainIfAnglePower(a), b) : original(a, plainAsAngle(b, a))),
    'any, any': (a: unknown, b: unknown) => {
      checkCombined([a, b]);
      return onTemperatures(a, b);
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

/** Names the language gives meaning to (functions and constants), so they are not "unknown". */
export function isBuiltin(name: string): boolean {
  return Object.prototype.hasOwnProperty.call(math, name) || name in circuitFunctions;
}
