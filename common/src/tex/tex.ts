/**
 * LaTeX of formulas, working and results, for KaTeX on screen and MathJax in the PDF.
 * mathjs's own toTex takes names like L, C, A as units and writes V_out as V\_out; here a name
 * defined in the sheet is always set as an italic variable (X_L → X_{L}, omega → \omega).
 */
import type { MathNode } from 'mathjs';
import { Unit } from '../language/math';

const GREEK = new Set([
  'alpha',
  'beta',
  'gamma',
  'delta',
  'epsilon',
  'varepsilon',
  'zeta',
  'eta',
  'theta',
  'vartheta',
  'iota',
  'kappa',
  'lambda',
  'mu',
  'nu',
  'xi',
  'pi',
  'rho',
  'sigma',
  'tau',
  'upsilon',
  'phi',
  'varphi',
  'chi',
  'psi',
  'omega',
  'Gamma',
  'Delta',
  'Theta',
  'Lambda',
  'Xi',
  'Pi',
  'Sigma',
  'Upsilon',
  'Phi',
  'Psi',
  'Omega',
]);

function namePart(part: string): string {
  if (GREEK.has(part)) return `\\${part}`;
  if (/^\d+$/.test(part) || part.length === 1) return part;
  return `\\mathrm{${part}}`;
}

/** X_L → X_{L}; I_rms → I_{\mathrm{rms}}; omega_0 → \omega_{0}; V_out_max → V_{\mathrm{out},\mathrm{max}}. */
export function variableTex(name: string): string {
  const digits = /^([A-Za-z]+?)(\d+)$/.exec(name);
  if (digits && !name.includes('_')) name = `${digits[1]}_${digits[2]}`;
  const [base, ...subs] = name.split('_').filter((p, i) => p !== '' || i === 0);
  const baseTex = GREEK.has(base) ? `\\${base}` : base.length === 1 ? base : `\\mathit{${base}}`;
  return subs.length ? `${baseTex}_{${subs.map(namePart).join(',')}}` : baseTex;
}

const UNIT_TEX: Record<string, string> = { ohm: '\\Omega', deg: '{}^{\\circ}', degC: '{}^{\\circ}\\mathrm{C}' };

/** A unit in mathjs syntax as LaTeX: kohm → \mathrm{k\Omega}, uF → \mathrm{\mu F}, m/s^2 → \mathrm{m/s^{2}}. */
export function unitTex(unit: string): string {
  if (UNIT_TEX[unit]) return UNIT_TEX[unit];
  const body = unit
    .replace(/\bu(?=[A-Za-z])/g, '\\mu{}')
    .replace(/ohm/g, '\\Omega{}')
    .replace(/\^\(?(-?\d+)\)?/g, '^{$1}')
    .replace(/ \* | /g, '\\cdot ')
    .trim();
  return `\\mathrm{${body}}`;
}

/** A display string from units/display.ts ("0.6843 A ∠ −26.9°", "(3.000 + j4.000) Ω") as LaTeX. */
const displayTexCache = new Map<string, string>();

export function displayTex(display: string): string {
  let tex = displayTexCache.get(display);
  if (tex === undefined) {
    if (displayTexCache.size > 10_000) displayTexCache.clear();
    tex = displayTexUncached(display);
    displayTexCache.set(display, tex);
  }
  return tex;
}

/** Characters a display or a string may hold that mean something to LaTeX, as math-mode symbols. */
const MATH_ESCAPES: Record<string, string> = {
  '\\': '\\backslash ',
  '{': '\\{',
  '}': '\\}',
  $: '\\$',
  '&': '\\&',
  '%': '\\%',
  '#': '\\#',
  _: '\\_',
  '~': '\\sim ',
  '^': '\\hat{}',
};
// A lone ^ or ~ cannot start a command once backslashes and braces are escaped, and units use ^.
const escapeMath = (text: string) => text.replace(/[\\{}$&%#_]/g, (c) => MATH_ESCAPES[c]).replace(/[\u0000-\u001F\u007F]/g, '');

/**
 * A string of the sheet as LaTeX text: letters, digits and punctuation as they are, and everything that
 * means something to LaTeX escaped, so a string can never become a command (a link, a rule, a macro).
 * The escapes are ones KaTeX and MathJax both read the same way.
 */
export function textTex(text: string): string {
  const parts: string[] = [];
  let run = '';
  const flush = () => {
    if (run) parts.push(`\\text{${run}}`);
    run = '';
  };
  for (const ch of text.replace(/[\u0000-\u001F\u007F]/g, '')) {
    if (/[_$%&#{}]/.test(ch)) run += `\\${ch}`;
    else if (ch === '\\' || ch === '~' || ch === '^') {
      flush();
      parts.push(MATH_ESCAPES[ch]);
    } else run += ch;
  }
  flush();
  return parts.join('') || '\\text{}';
}

function displayTexUncached(display: string): string {
  return escapeMath(display)
    .replace(/−/g, '-')
    .replace(/∠ ?(-?[\d.]+)°/g, '\\angle $1^{\\circ}')
    .replace(/([\d.])°/g, '$1^{\\circ}')
    .replace(/\bj(?=[\d.])/g, '\\mathrm{j}')
    .replace(/(\d)e(-?\d+)/g, '$1\\times 10^{$2}')
    .replace(/(?<=[\d)] )([µA-Za-zΩ°·⁻¹²³⁴⁵⁶⁷⁸⁹⁰/]+)/g, (u: string) => {
      const t = u
        .replace(/µ/g, '\\mu ')
        .replace(/Ω/g, '\\Omega ')
        .replace(/·/g, '\\cdot ')
        .replace(/°/g, '{}^{\\circ}')
        .replace(/⁻?[¹²³⁴⁵⁶⁷⁸⁹⁰]+/g, (p) => `^{${p.replace('⁻', '-').replace(/[¹²³⁴⁵⁶⁷⁸⁹⁰]/g, (c) => String('⁰¹²³⁴⁵⁶⁷⁸⁹'.indexOf(c)))}}`)
        .trim();
      return `\\,\\mathrm{${t}}`;
    })
    .replace(/ \\,/g, '\\,');
}

export interface TexContext {
  /** Names that are variables of the sheet at this point. */
  isVariable(name: string): boolean;
  /** For the working: the LaTeX of a variable's value, or undefined to keep the name. */
  valueTexOf?(name: string): string | undefined;
}

type AnyNode = MathNode & Record<string, unknown>;

const FUNCTION_TEX: Record<string, string> = {
  sin: '\\sin',
  cos: '\\cos',
  tan: '\\tan',
  exp: '\\exp',
  log: '\\ln',
  ln: '\\ln',
  log10: '\\log_{10}',
  arg: '\\arg',
  atan: '\\arctan',
  asin: '\\arcsin',
  acos: '\\arccos',
  sinh: '\\sinh',
  cosh: '\\cosh',
  tanh: '\\tanh',
};
const BINARY_TEX: Record<string, string> = {
  add: '+',
  subtract: '-',
  multiply: '\\cdot ',
  dotMultiply: '\\cdot ',
  smaller: '<',
  smallerEq: '\\le ',
  larger: '>',
  largerEq: '\\ge ',
  equal: '=',
  unequal: '\\ne ',
  and: '\\wedge ',
  or: '\\vee ',
  xor: '\\veebar ',
};

function numberTex(value: unknown): string {
  const text = String(value);
  const m = /^(-?[\d.]+)e([+-]?\d+)$/.exec(text);
  return m ? `${m[1]}\\times 10^{${Number(m[2])}}` : text;
}

const unwrap = (n: AnyNode): AnyNode => (n.type === 'ParenthesisNode' ? unwrap(n.content as AnyNode) : n);

/**
 * LaTeX of an expression; with `valueTexOf`, variables are replaced by their values (the working).
 * Our own printer for the nodes a sheet uses (faster than mathjs's toTex and with engineering
 * conventions: 12\,\Omega, j for the imaginary unit); anything else falls back to mathjs's toTex.
 */
export function expressionTex(node: MathNode, context: TexContext): string {
  const tex = (m: MathNode): string => {
    const n = m as AnyNode;
    switch (n.type) {
      case 'ConstantNode':
        return typeof n.value === 'string' ? `\\text{“}${textTex(n.value)}\\text{”}` : numberTex(n.value);
      case 'SymbolNode': {
        const name = String(n.name);
        if (context.isVariable(name)) return context.valueTexOf?.(name) ?? variableTex(name);
        if (name === 'pi') return '\\pi ';
        if (name === 'i' || name === 'j') return '\\mathrm{j}';
        if (name === 'e') return 'e';
        if (Unit.isValuelessUnit(name)) return unitTex(name);
        return variableTex(name);
      }
      case 'ParenthesisNode':
        return `\\left(${tex(n.content as MathNode)}\\right)`;
      case 'OperatorNode': {
        const args = n.args as AnyNode[];
        const fn = String(n.fn);
        if (args.length === 1) {
          if (fn === 'unaryMinus') return `-${tex(args[0])}`;
          if (fn === 'unaryPlus') return `+${tex(args[0])}`;
          if (fn === 'not') return `\\neg ${tex(args[0])}`;
          break;
        }
        if (args.length !== 2) break;
        const [a, b] = args;
        if (n.implicit) return `${tex(a)}\\,${tex(b)}`;
        if (fn === 'divide') return `\\frac{${tex(unwrap(a))}}{${tex(unwrap(b))}}`;
        if (fn === 'pow' || fn === 'dotPow') {
          const base = tex(a);
          const needsParens = a.type === 'OperatorNode' || (a.type === 'ConstantNode' && Number(a.value) < 0);
          return `{${needsParens ? `\\left(${base}\\right)` : base}}^{${tex(unwrap(b))}}`;
        }
        if (fn === 'to') return `${tex(a)}\\rightarrow ${expressionTex(b, { isVariable: () => false })}`;
        if (BINARY_TEX[fn]) return `${tex(a)}${BINARY_TEX[fn]}${tex(b)}`;
        break;
      }
      case 'FunctionNode': {
        const f = n.fn as AnyNode;
        const name = String(f.name ?? '');
        const args = (n.args as MathNode[]).map((x) => tex(unwrap(x as AnyNode)));
        if (name === 'sqrt') return `\\sqrt{${args[0]}}`;
        if (name === 'abs') return `\\left|${args[0]}\\right|`;
        if (name === 'conj') return `\\overline{${args[0]}}`;
        if (FUNCTION_TEX[name]) return `${FUNCTION_TEX[name]}\\left(${args.join(',\\,')}\\right)`;
        if (name && !context.isVariable(name)) return `\\operatorname{${name.replace(/_/g, '\\_')}}\\left(${args.join(',\\,')}\\right)`;
        break;
      }
    }
    return fallbackTex(m, context);
  };
  return tex(node).replace(/\s+/g, ' ').trim();
}

/** mathjs's own toTex, with names, units and values set our way. */
function fallbackTex(node: MathNode, context: TexContext): string {
  const handler = (n: AnyNode): string | undefined => {
    if (n === (node as AnyNode)) return undefined;
    if (n.type === 'SymbolNode' || n.type === 'OperatorNode' || n.type === 'FunctionNode' || n.type === 'ConstantNode' || n.type === 'ParenthesisNode') {
      // A leading space keeps KaTeX from reading "\cdotL" as one command.
      return ` ${expressionTex(n, context)}`;
    }
    return undefined;
  };
  return node.toTex({ handler: handler as never, implicit: 'show', parenthesis: 'keep' });
}
