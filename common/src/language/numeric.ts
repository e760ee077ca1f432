/**
 * A compiler from an expression tree (units already replaced by their SI factors) to closures on
 * plain numbers and {re, im} pairs, for sweeps: the units were checked once at the first point, so
 * each of thousands of points is evaluated without unit or type dispatch. Returns undefined for a
 * construct it does not know; the caller then evaluates with mathjs.
 */
import type { MathNode } from 'mathjs';
import { circuitFunctions } from '../circuits/functions';
import { withNumericMode } from '../units/quantities';
import { isComplex } from './math';

export type Num = number | { re: number; im: number };
export type NumericFn = (vars: Map<string, unknown>, x: number) => Num;
type AnyNode = MathNode & Record<string, unknown>;

const cx = (x: Num) => (typeof x === 'number' ? { re: x, im: 0 } : x);
const simplify = (re: number, im: number): Num => (im === 0 ? re : { re, im });

const add = (a: Num, b: Num): Num => (typeof a === 'number' && typeof b === 'number' ? a + b : simplify(cx(a).re + cx(b).re, cx(a).im + cx(b).im));
const sub = (a: Num, b: Num): Num => (typeof a === 'number' && typeof b === 'number' ? a - b : simplify(cx(a).re - cx(b).re, cx(a).im - cx(b).im));
const mul = (a: Num, b: Num): Num => {
  if (typeof a === 'number' && typeof b === 'number') return a * b;
  const p = cx(a);
  const q = cx(b);
  return simplify(p.re * q.re - p.im * q.im, p.re * q.im + p.im * q.re);
};
const div = (a: Num, b: Num): Num => {
  if (typeof a === 'number' && typeof b === 'number') return a / b;
  const p = cx(a);
  const q = cx(b);
  const d = q.re * q.re + q.im * q.im;
  return simplify((p.re * q.re + p.im * q.im) / d, (p.im * q.re - p.re * q.im) / d);
};
const neg = (a: Num): Num => (typeof a === 'number' ? -a : { re: -a.re, im: -a.im });
const pow = (a: Num, b: Num): Num | undefined => {
  if (typeof a === 'number' && typeof b === 'number') return a >= 0 || Number.isInteger(b) ? a ** b : undefined;
  if (typeof b === 'number' && Number.isInteger(b) && b >= 0 && b <= 64) {
    let r: Num = 1;
    for (let k = 0; k < b; k++) r = mul(r, a);
    return r;
  }
  return undefined;
};
const real =
  (f: (x: number) => number) =>
  (a: Num): Num | undefined =>
    typeof a === 'number' ? f(a) : undefined;
const FUNCTIONS: Record<string, (a: Num) => Num | undefined> = {
  sin: real(Math.sin),
  cos: real(Math.cos),
  tan: real(Math.tan),
  atan: real(Math.atan),
  asin: real(Math.asin),
  acos: real(Math.acos),
  exp: real(Math.exp),
  log: real(Math.log),
  log10: real(Math.log10),
  sinh: real(Math.sinh),
  cosh: real(Math.cosh),
  tanh: real(Math.tanh),
  sqrt: (a) => (typeof a === 'number' ? (a >= 0 ? Math.sqrt(a) : undefined) : undefined),
  abs: (a) => (typeof a === 'number' ? Math.abs(a) : Math.hypot(a.re, a.im)),
  re: (a) => cx(a).re,
  im: (a) => cx(a).im,
  conj: (a) => (typeof a === 'number' ? a : { re: a.re, im: -a.im }),
  arg: (a) => Math.atan2(cx(a).im, cx(a).re),
};

class Unsupported extends Error {}
const need = (x: Num | undefined): Num => {
  if (x === undefined) throw new Unsupported();
  return x;
};
const fromMath = (v: unknown): Num => {
  if (typeof v === 'number') return v;
  if (isComplex(v)) return simplify(v.re, v.im);
  throw new Unsupported();
};

export function compileNumeric(node: MathNode, variable?: string): NumericFn | undefined {
  const dependsOnVariable = (m: MathNode) => variable === undefined || m.filter((x) => x.type === 'SymbolNode' && (x as AnyNode).name === variable).length > 0;
  /** Subtrees that do not read the swept variable are evaluated once, at the first point. */
  const build = (m: MathNode): NumericFn => {
    const f = buildNode(m);
    if (dependsOnVariable(m) || m.type === 'ConstantNode') return f;
    let cached: Num | undefined;
    return (v, x) => (cached ??= f(v, x));
  };
  const buildNode = (m: MathNode): NumericFn => {
    const n = m as AnyNode;
    switch (n.type) {
      case 'ConstantNode': {
        const v = n.value;
        if (typeof v !== 'number') throw new Unsupported();
        return () => v;
      }
      case 'SymbolNode': {
        const name = String(n.name);
        if (name === 'pi') return () => Math.PI;
        if (name === 'e') return () => Math.E;
        if (name === 'i' || name === 'j') return (vars) => (vars.has(name) ? fromMath(vars.get(name)) : { re: 0, im: 1 });
        if (name === variable) return (_vars, x) => x;
        return (vars) => fromMath(vars.get(name));
      }
      case 'ParenthesisNode':
        return build(n.content as MathNode);
      case 'OperatorNode': {
        const args = (n.args as MathNode[]).map(build);
        const fn = String(n.fn);
        if (args.length === 1) {
          const [a] = args;
          if (fn === 'unaryMinus') return (v, x) => neg(a(v, x));
          if (fn === 'unaryPlus') return a;
          throw new Unsupported();
        }
        if (args.length !== 2) throw new Unsupported();
        const [a, b] = args;
        switch (fn) {
          case 'add':
            return (v, x) => add(a(v, x), b(v, x));
          case 'subtract':
            return (v, x) => sub(a(v, x), b(v, x));
          case 'multiply':
          case 'dotMultiply':
            return (v, x) => mul(a(v, x), b(v, x));
          case 'divide':
          case 'dotDivide':
            return (v, x) => div(a(v, x), b(v, x));
          case 'pow':
          case 'dotPow':
            return (v, x) => need(pow(a(v, x), b(v, x)));
          default:
            throw new Unsupported();
        }
      }
      case 'FunctionNode': {
        const name = String((n.fn as AnyNode).name);
        const args = (n.args as MathNode[]).map(build);
        const f = FUNCTIONS[name];
        if (f && args.length === 1) {
          const [a] = args;
          return (v, x) => need(f(a(v, x)));
        }
        const circuit = (circuitFunctions as Record<string, (...x: unknown[]) => unknown>)[name];
        if (circuit) return (v, x) => fromMath(withNumericMode(() => circuit(...args.map((a) => a(v, x)))));
        throw new Unsupported();
      }
      default:
        throw new Unsupported();
    }
  };
  try {
    const fn = build(node);
    return (vars, x) => {
      try {
        return fn(vars, x);
      } catch (err) {
        if (err instanceof Unsupported) throw new NumericFallback();
        throw err;
      }
    };
  } catch (err) {
    if (err instanceof Unsupported) return undefined;
    throw err;
  }
}

/** Thrown at a point where the fast path meets a value it does not handle (a negative square root). */
export class NumericFallback extends Error {}
