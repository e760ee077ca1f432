/**
 * The fastest path for sweeps: the expression (units already replaced by SI factors) is turned into
 * straight-line JavaScript over the swept variable, with real and complex parts in separate locals
 * and every part that does not depend on the variable folded to a literal. Only numeric literals
 * and generated local names are ever written into the code, never text from the sheet. Returns
 * undefined when the expression holds anything else (or where the platform forbids generated code);
 * the caller then uses the closure compiler.
 */
import type { MathNode } from 'mathjs';
import { compileNumeric, type Num } from './numeric';

type AnyNode = MathNode & Record<string, unknown>;
type Part = { kind: 'r'; v: string } | { kind: 'c'; re: string; im: string };

class Unsupported extends Error {}

const literal = (x: number) => {
  if (!Number.isFinite(x)) throw new Unsupported();
  return Object.is(x, -0) ? '-0' : x < 0 ? `(${String(x)})` : String(x);
};

export type SweepKernel = (points: Float64Array) => { re: Float64Array; im: Float64Array; complex: boolean };

export function compileSweepKernel(node: MathNode, variable: string, scope: Map<string, unknown>): SweepKernel | undefined {
  const lines: string[] = [];
  let counter = 0;
  const temp = () => `t${counter++}`;
  const depends = (m: MathNode) => m.filter((x) => x.type === 'SymbolNode' && (x as AnyNode).name === variable).length > 0;

  const constantPart = (m: MathNode): Part => {
    const fn = compileNumeric(m);
    if (!fn) throw new Unsupported();
    const v: Num = fn(scope, NaN);
    return typeof v === 'number'
      ? { kind: 'r', v: literal(v) }
      : v.im === 0
        ? { kind: 'r', v: literal(v.re) }
        : { kind: 'c', re: literal(v.re), im: literal(v.im) };
  };
  const real = (code: string): Part => {
    const t = temp();
    lines.push(`const ${t} = ${code};`);
    return { kind: 'r', v: t };
  };
  const complex = (re: string, im: string): Part => {
    const t = temp();
    lines.push(`const ${t}r = ${re}, ${t}i = ${im};`);
    return { kind: 'c', re: `${t}r`, im: `${t}i` };
  };
  const re = (p: Part) => (p.kind === 'r' ? p.v : p.re);
  const im = (p: Part) => (p.kind === 'r' ? '0' : p.im);

  const gen = (m: MathNode): Part => {
    if (!depends(m)) return constantPart(m);
    const n = m as AnyNode;
    switch (n.type) {
      case 'SymbolNode':
        return { kind: 'r', v: 'x' };
      case 'ParenthesisNode':
        return gen(n.content as MathNode);
      case 'OperatorNode': {
        const args = (n.args as MathNode[]).map(gen);
        const fn = String(n.fn);
        if (args.length === 1) {
          const [a] = args;
          if (fn === 'unaryPlus') return a;
          if (fn === 'unaryMinus') return a.kind === 'r' ? real(`-${a.v}`) : complex(`-${a.re}`, `-${a.im}`);
          throw new Unsupported();
        }
        if (args.length !== 2) throw new Unsupported();
        const [a, b] = args;
        const bothReal = a.kind === 'r' && b.kind === 'r';
        switch (fn) {
          case 'add':
            return bothReal ? real(`${re(a)} + ${re(b)}`) : complex(`${re(a)} + ${re(b)}`, `${im(a)} + ${im(b)}`);
          case 'subtract':
            return bothReal ? real(`${re(a)} - ${re(b)}`) : complex(`${re(a)} - ${re(b)}`, `${im(a)} - ${im(b)}`);
          case 'multiply':
          case 'dotMultiply':
            if (bothReal) return real(`${re(a)} * ${re(b)}`);
            if (a.kind === 'r') return complex(`${a.v} * ${re(b)}`, `${a.v} * ${im(b)}`);
            if (b.kind === 'r') return complex(`${re(a)} * ${b.v}`, `${im(a)} * ${b.v}`);
            return complex(`${re(a)} * ${re(b)} - ${im(a)} * ${im(b)}`, `${re(a)} * ${im(b)} + ${im(a)} * ${re(b)}`);
          case 'divide':
          case 'dotDivide': {
            if (bothReal) return real(`${re(a)} / ${re(b)}`);
            if (b.kind === 'r') return complex(`${re(a)} / ${b.v}`, `${im(a)} / ${b.v}`);
            const d = real(`${re(b)} * ${re(b)} + ${im(b)} * ${im(b)}`) as { v: string };
            return complex(`(${re(a)} * ${re(b)} + ${im(a)} * ${im(b)}) / ${d.v}`, `(${im(a)} * ${re(b)} - ${re(a)} * ${im(b)}) / ${d.v}`);
          }
          case 'pow':
          case 'dotPow':
            if (bothReal) {
              // A negative base with a fractional exponent is complex: leave it to the slower paths.
              const t = real(`${re(a)} ** ${re(b)}`) as { v: string };
              lines.push(`if (${t.v} !== ${t.v} && ${re(a)} === ${re(a)}) throw fallback;`);
              return { kind: 'r', v: t.v };
            }
            if (b.kind === 'r' && /^\d+$/.test(b.v) && Number(b.v) <= 16) {
              let r: Part = a;
              for (let k = 1; k < Number(b.v); k++) r = complex(`${re(r)} * ${re(a)} - ${im(r)} * ${im(a)}`, `${re(r)} * ${im(a)} + ${im(r)} * ${re(a)}`);
              return Number(b.v) === 0 ? { kind: 'r', v: '1' } : r;
            }
            throw new Unsupported();
          default:
            throw new Unsupported();
        }
      }
      case 'FunctionNode': {
        // Only a plain function name is ever looked up (never a method or an accessor), and only in the
        // fixed table below: nothing of the sheet's text is written into the generated code.
        const fn = n.fn as AnyNode;
        if (fn.type !== 'SymbolNode' || !/^[A-Za-z_][A-Za-z0-9_]*$/.test(String(fn.name))) throw new Unsupported();
        const name = String(fn.name);
        const args = (n.args as MathNode[]).map(gen);
        if (args.length !== 1) throw new Unsupported();
        const [a] = args;
        const mathFn: Record<string, string> = {
          sin: 'Math.sin',
          cos: 'Math.cos',
          tan: 'Math.tan',
          atan: 'Math.atan',
          exp: 'Math.exp',
          log: 'Math.log',
          log10: 'Math.log10',
          sinh: 'Math.sinh',
          cosh: 'Math.cosh',
          tanh: 'Math.tanh',
        };
        if (a.kind === 'r' && mathFn[name]) return real(`${mathFn[name]}(${a.v})`);
        if (a.kind === 'r' && name === 'sqrt') {
          lines.push(`if (${a.v} < 0) throw fallback;`);
          return real(`Math.sqrt(${a.v})`);
        }
        if (name === 'abs') return real(a.kind === 'r' ? `Math.abs(${a.v})` : `Math.hypot(${a.re}, ${a.im})`);
        if (name === 're') return { kind: 'r', v: re(a) };
        if (name === 'im') return { kind: 'r', v: im(a) };
        if (name === 'conj') return a.kind === 'r' ? a : complex(a.re, `-${a.im}`);
        if (name === 'arg') return real(`Math.atan2(${im(a)}, ${re(a)})`);
        throw new Unsupported();
      }
      default:
        throw new Unsupported();
    }
  };

  try {
    const result = gen(node);
    const body = [
      'const n = points.length, outRe = new Float64Array(n), outIm = new Float64Array(n);',
      'for (let k = 0; k < n; k++) {',
      '  const x = points[k];',
      ...lines.map((l) => `  ${l}`),
      `  outRe[k] = ${re(result)};`,
      `  outIm[k] = ${im(result)};`,
      '}',
      `return { re: outRe, im: outIm, complex: ${result.kind === 'c'} };`,
    ].join('\n');
    const kernel = new Function('points', 'fallback', body) as (points: Float64Array, fallback: Error) => ReturnType<SweepKernel>;
    return (points) => kernel(points, KERNEL_FALLBACK);
  } catch (err) {
    if (err instanceof Unsupported || err instanceof EvalError || (err as Error).name === 'EvalError') return undefined;
    throw err;
  }
}

/** Thrown by a kernel at a point it cannot compute with real arithmetic (a negative square root). */
export const KERNEL_FALLBACK = new Error('numeric kernel fallback');
