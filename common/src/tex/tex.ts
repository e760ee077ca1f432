/**
 * LaTeX of formulas, working and results, for KaTeX on screen and MathJax in the PDF.
 * mathjs's own toTex takes names like L, C, A as units and writes V_out as V\_out; here a name
 * defined in the sheet is always set as an italic variable (X_L → X_{L}, omega → \omega).
 */
import type { MathNode } from 'mathjs';
import { Unit } from '../language/math';

const GREEK = new Set([
  'alpha', 'beta', 'gamma', 'delta', 'epsilon', 'varepsilon', 'zeta', 'eta', 'theta', 'vartheta', 'iota', 'kappa', 'lambda', 'mu', 'nu', 'xi',
  'pi', 'rho', 'sigma', 'tau', 'upsilon', 'phi', 'varphi', 'chi', 'psi', 'omega', 'Gamma', 'Delta', 'Theta', 'Lambda', 'Xi', 'Pi', 'Sigma',
  'Upsilon', 'Phi', 'Psi', 'Omega',
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
export function displayTex(display: string): string {
  return display
    .replace(/−/g, '-')
    .replace(/∠ ?(-?[\d.]+)°/g, '\\angle $1^{\\circ}')
    .replace(/\bj(?=[\d.])/g, '\\mathrm{j}')
    .replace(/(\d)e(-?\d+)/g, '$1\\times 10^{$2}')
    .replace(/(?<=[\d)] )([µA-Za-zΩ°·⁻¹²³⁴⁵⁶⁷⁸⁹⁰/]+)/g, (u: string) => {
      const t = u
        .replace(/µ/g, '\\mu ')
        .replace(/Ω/g, '\\Omega ')
        .replace(/·/g, '\\cdot ')
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

/** LaTeX of an expression; with `valueOf`, variables are replaced by their values (the working). */
export function expressionTex(node: MathNode, context: TexContext): string {
  const handler = (n: AnyNode): string | undefined => {
    if (n.type === 'SymbolNode') {
      const name = String(n.name);
      if (context.isVariable(name)) {
        const value = context.valueTexOf?.(name);
        // A leading space keeps KaTeX from reading "\cdotL" as one command.
        return value !== undefined ? ` ${value}` : ` ${variableTex(name)}`;
      }
      if (name === 'pi') return ' \\pi';
      if (name === 'i' || name === 'j') return ' \\mathrm{j}';
      if (name === 'e') return ' e';
      if (Unit.isValuelessUnit(name)) return ` ${unitTex(name)}`;
      return ` ${variableTex(name)}`;
    }
    if (n.type === 'FunctionNode') {
      const fn = n.fn as AnyNode;
      const fnName = String(fn.name ?? '');
      const args = (n.args as MathNode[]).map((a) => expressionTex(a, context));
      if (fnName === 'sqrt') return ` \\sqrt{${args[0]}}`;
      if (fnName === 'abs') return ` \\left|${args[0]}\\right|`;
      if (['sin', 'cos', 'tan', 'exp', 'log', 'ln', 'arg'].includes(fnName)) return ` \\${fnName}\\left(${args.join(',')}\\right)`;
      if (['atan', 'asin', 'acos'].includes(fnName)) return ` \\${fnName.replace('a', 'arc')}\\left(${args.join(',')}\\right)`;
      if (fnName && !context.isVariable(fnName)) return ` \\operatorname{${fnName.replace(/_/g, '\\_')}}\\left(${args.join(',\\,')}\\right)`;
    }
    if (n.type === 'OperatorNode' && n.implicit && (n.args as AnyNode[]).length === 2) {
      const [a, b] = n.args as AnyNode[];
      if (b.type === 'SymbolNode' && !context.isVariable(String(b.name)) && Unit.isValuelessUnit(String(b.name))) {
        return ` ${expressionTex(a, context)}\,${unitTex(String(b.name))}`;
      }
    }
    if (n.type === 'OperatorNode' && n.fn === 'to') {
      const args = n.args as MathNode[];
      return `${expressionTex(args[0], context)}\\rightarrow ${expressionTex(args[1], { isVariable: () => false })}`;
    }
    return undefined;
  };
  return node.toTex({ handler: handler as never, implicit: 'show', parenthesis: 'keep' }).replace(/\s+/g, ' ').trim();
}
