/**
 * Ampwright's own mathjs instance. Units are adjusted for the trade (var and VA as real units of
 * power), `j` joins `i` as the imaginary unit, functions that reject a Unit are taught to accept one,
 * and everything that could reach outside a sheet (import, createUnit, evaluate, parse, ...) is
 * disabled inside expressions, as mathjs's security notes advise. Host code keeps its own references.
 */
import { all, create, type MathJsInstance, type MathNode, type Unit as MathUnit } from 'mathjs';

export const math: MathJsInstance = create(all, { number: 'number', precision: 64 });

// Host references, taken before the expression-level functions are disabled.
export const parse = math.parse.bind(math) as (expr: string) => MathNode;
export const Unit = math.Unit as unknown as {
  new (value: unknown, name?: string): MathUnit;
  isValuelessUnit(name: string): boolean;
  BASE_DIMENSIONS: string[];
  PREFIXES: Record<string, Record<string, { name: string; value: number; scientific: boolean }>>;
  UNITS: Record<string, unknown>;
  parse(s: string): MathUnit;
};
export const isUnit = (x: unknown): x is MathUnit => math.isUnit(x);
/** A copy of a Unit with another value (mathjs keeps a Unit's value in SI, whatever its prefix). */
export function withValue(u: MathUnit, value: unknown): MathUnit {
  const out = u.clone();
  (out as unknown as { value: unknown }).value = value;
  return out;
}
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

const typed = math.typed;
const origZeros = math.zeros;
const origOnes = math.ones;
const origIdentity = math.identity;
const origRange = math.range;
const origRe = math.re as (x: unknown) => unknown;
const origIm = math.im as (x: unknown) => unknown;
const origConj = math.conj as (x: unknown) => unknown;
const origArg = math.arg as (x: unknown) => unknown;

const sizeArgs = (args: unknown[]) => args.flatMap((a) => (Array.isArray(a) ? a : math.isMatrix(a) ? (a.toArray() as unknown[]) : [a])).filter((a) => typeof a === 'number') as number[];

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
      const nums = sizeArgs(args);
      if (nums.length >= 2) {
        const step = nums[2] ?? 1;
        checkSize([Math.abs((nums[1] - nums[0]) / (step || 1))]);
      }
      return (origRange as (...a: unknown[]) => unknown)(...args);
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

math.import({ j: math.complex(0, 1) }, { override: false });

/**
 * Names that would let an expression reach outside the sheet or change the language itself.
 * The first list is replaced in the instance by functions that refuse (mathjs's security advice);
 * the second is used by the library's own lazy factories, so it is refused when an expression is
 * checked instead (language/expression.ts), before anything is evaluated.
 */
export const DISABLED_FUNCTIONS = [
  'import', 'createUnit', 'evaluate', 'parse', 'simplify', 'simplifyConstant', 'simplifyCore', 'derivative',
  'resolve', 'compile', 'parser', 'rationalize', 'leafCount', 'symbolicEqual', 'help',
] as const;
export const REFUSED_NAMES = new Set<string>([...DISABLED_FUNCTIONS, 'typed', 'config', 'chain', 'reviver', 'replacer', 'format', 'print', 'Unit', 'Complex', 'Node', 'SymbolNode', 'FunctionNode', 'Parser', 'Help', 'ResultSet', 'Chain', 'Matrix', 'DenseMatrix', 'SparseMatrix', 'Range', 'Index', 'splitUnit', 'createUnitClass']);

export function disableUnsafeFunctions(instance: MathJsInstance): void {
  const disabled: Record<string, () => never> = {};
  for (const name of DISABLED_FUNCTIONS) {
    disabled[name] = () => {
      throw new Error(`the function ${name} is not available in a sheet`);
    };
  }
  instance.import(disabled, { override: true });
}
