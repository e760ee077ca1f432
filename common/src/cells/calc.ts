/**
 * The calc cell: one statement a line, `name = expression`, optionally ending in `to unit` and a
 * `# description`. Each line gives its value, and the LaTeX of its formula, working and result.
 */
import type { MathNode } from 'mathjs';
import type { CalcCell } from '../sheet/sheet-format';
import { checkDeadline } from '../language/deadline';
import { EngineError, type Diagnostic } from '../language/errors';
import { checkNames, evaluateNode, normalizeSource, parseExpression, valueNames } from '../language/expression';
import { displayTex, expressionTex, variableTex } from '../tex/tex';
import { formatValue, type DisplayOptions } from '../units/display';
import { asFrequencyKind, frequencyKind } from '../units/quantities';
import { collectingNotes } from '../units/temperature';
import { convertTo } from './convert';
import { calledFunction, RESULT_CONVENTIONS, rmsWarnings } from '../circuits/conventions';
import { circuitFunctions } from '../circuits/functions';
import { describePlace, type SheetScope } from './scope';
import type { CalcResult } from './types';

type AnyNode = MathNode & Record<string, unknown>;

/** Splits `expr # description` at the first # outside a string. */
export function splitComment(line: string): { code: string; description?: string } {
  let quote: string | null = null;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (quote) {
      if (ch === quote) quote = null;
    } else if (ch === '"') quote = ch;
    else if (ch === '#') {
      const description = line.slice(i + 1).trim();
      return { code: line.slice(0, i), description: description || undefined };
    }
  }
  return { code: line };
}

export interface ParsedStatement {
  name: string;
  expression: MathNode;
  /** The unit asked for with `to`, in mathjs syntax. */
  target?: string;
  description?: string;
  code: string;
}

/** Parses one line; undefined for a blank or comment-only line. */
export function parseStatement(text: string, line: number, isValue: (name: string) => boolean = () => false): ParsedStatement | undefined {
  const { code, description } = splitComment(text);
  if (!code.trim()) return undefined;
  const node = parseExpression(code, line, 0, isValue) as AnyNode;
  if (node.type !== 'AssignmentNode' || (node.object as AnyNode).type !== 'SymbolNode') {
    const eq = code.indexOf('=');
    throw new EngineError(
      node.type === 'FunctionAssignmentNode'
        ? 'defining functions is not part of the language: write name = expression'
        : 'each line must be a definition: name = expression (for example I = V / Z)',
      line,
      eq >= 0 ? eq + 1 : code.search(/\S/) + 1,
    );
  }
  const name = String((node.object as AnyNode).name);
  let expression = node.value as AnyNode;
  let target: string | undefined;
  if (expression.type === 'OperatorNode' && (expression.fn === 'to' || expression.op === 'in')) {
    const [value, unit] = expression.args as AnyNode[];
    target = normalizeSource(code.slice(code.lastIndexOf(String(expression.op)) + String(expression.op).length)).trim();
    expression = value;
    if (!target || !(unit.type === 'SymbolNode' || unit.type === 'OperatorNode' || unit.type === 'ParenthesisNode')) {
      throw new EngineError('after "to" write a unit, for example to mA', line, code.lastIndexOf('to') + 1);
    }
  }
  return { name, expression, target, description, code };
}

/** w, omega, w_0, omega_d, ...: a name an engineer gives an angular frequency. */
const isAngularName = (name: string) => /^(w|omega)(_|\d|$)/.test(name);

/**
 * A rate in s⁻¹ (1/sqrt(L C)) bound to an angular name is an angular frequency; a frequency in Hz bound
 * to one is kept in Hz, with a warning, because showing it in rad/s would be 2π out.
 */
function angularByName(name: string, value: unknown, line: number, warnings: Diagnostic[]): unknown {
  if (!isAngularName(name)) return value;
  const kind = frequencyKind(value);
  if (kind === 'rate') return asFrequencyKind(value as never, 'angular');
  if (kind === 'cyclic')
    warnings.push({
      line,
      column: 1,
      message: `${name} is named like an angular frequency but holds a frequency in Hz; for the angular frequency write 2 pi times it`,
    });
  return value;
}

const RESERVED = new Set(['pi', 'e', 'i', 'j', 'true', 'false', 'Infinity', 'NaN', 'null', 'end']);

export function evaluateCalcCell(cell: CalcCell, cellIndex: number, scope: SheetScope, display: DisplayOptions): CalcResult {
  const result: CalcResult = { kind: 'calc', status: 'ok', values: {}, lines: [], errors: [], warnings: [] };
  const mathScope = scope.asMathScope();
  const lines = cell.source.split('\n');
  lines.forEach((text, i) => {
    const lineNo = i + 1;
    const place = { cell: cellIndex, line: lineNo };
    let statement: ParsedStatement | undefined;
    try {
      checkDeadline(true);
      statement = parseStatement(text, lineNo, valueNames(scope));
      if (!statement) return;
      const { name, expression, target, description, code } = statement;
      if (RESERVED.has(name)) {
        const hint = name === 'i' || name === 'j' ? ' (it is the imaginary unit): choose another name, such as i_1 or I' : '';
        throw new EngineError(`${name} is a constant of the language and cannot be redefined${hint}`, lineNo, code.indexOf(name) + 1);
      }
      const exprOffset = code.indexOf('=') + 1;
      const exprSource = code.slice(exprOffset);
      const warnings = checkNames(expression, exprSource, scope, place, exprOffset);
      result.warnings.push(...warnings);
      if (code.includes('_power')) for (const message of rmsWarnings(expression)) result.warnings.push({ line: lineNo, column: exprOffset + 1, message });
      const evaluated = collectingNotes(() => evaluateNode(expression, expression.compile(), mathScope, exprSource, lineNo, exprOffset));
      for (const message of evaluated.notes) result.warnings.push({ line: lineNo, column: exprOffset + 1, message });
      let value = evaluated.value;
      if (typeof value === 'function' || value === undefined) throw new EngineError('this expression has no value', lineNo, exprOffset + 1);
      if (target) {
        try {
          value = convertTo(value, target);
        } catch (err) {
          throw new EngineError((err as Error).message, lineNo, code.lastIndexOf(' to ') + 2);
        }
      }
      const previous = scope.origin.get(name);
      if (previous)
        result.warnings.push({
          line: lineNo,
          column: 1,
          message: `${name} was defined before (${describePlace(previous)}); from here on it means this new value`,
        });
      if (!target) value = angularByName(name, value, lineNo, result.warnings);
      const formatted = formatValue(value, display, target);
      // Typeset before binding: the formula's own name may be read on its right-hand side.
      const tex = lineTex(name, expression, scope, display, formatted.display);
      scope.define(name, value, place);
      scope.rememberDisplay(name, value, formatted.display);
      result.values[name] = formatted;
      result.lines.push({ line: lineNo, name, description, value: formatted, tex, ...conventionOf(expression, mathScope) });
    } catch (err) {
      const error: Diagnostic = err instanceof EngineError ? err.toDiagnostic() : { line: lineNo, column: 1, message: (err as Error).message };
      result.errors.push(error);
      result.status = 'error';
      const name = statement?.name ?? /^\s*([A-Za-z_]\w*)\s*=/.exec(text)?.[1];
      if (name) scope.markFailed(name, place);
      result.lines.push({ line: lineNo, name: name ?? '', error });
    }
  });
  return result;
}

/** The convention of the function a line calls, with the sense of a power factor from its argument. */
function conventionOf(expression: MathNode, mathScope: Map<string, unknown>): { convention?: string } {
  const call = calledFunction(expression);
  const convention = call && RESULT_CONVENTIONS[call.name as keyof typeof RESULT_CONVENTIONS];
  if (!call || !convention) return {};
  if (call.name === 'power_factor' && call.args.length === 1) {
    let sense: string;
    try {
      sense = circuitFunctions.power_factor_sense(call.args[0].compile().evaluate(mathScope));
    } catch {
      return { convention };
    }
    return {
      convention: `${sense} (${sense === 'lagging' ? 'Q > 0: the current lags the voltage' : sense === 'leading' ? 'Q < 0: the current leads the voltage' : 'Q = 0'}); ${convention}`,
    };
  }
  if (call.name === 'power_factor')
    return { convention: `${convention}; from P and |S| alone the sense (leading or lagging) is unknown: pass the complex power S for it` };
  return { convention };
}

/** Formula, working and result of one line as LaTeX. */
export function lineTex(name: string, expression: MathNode, scope: SheetScope, display: DisplayOptions, shown: string) {
  const lhs = variableTex(name);
  const isVariable = (n: string) => scope.has(n);
  const formula = `${lhs} = ${expressionTex(expression, { isVariable })}`;
  const working = `${lhs} = ${expressionTex(expression, {
    isVariable,
    valueTexOf: (n) => {
      const shown = scope.displayOf(n, (v) => formatValue(v, display).display);
      const t = displayTex(shown);
      return /^[\d.]+$/.test(shown) ? t : `\\left(${t}\\right)`;
    },
  })}`;
  return { formula, working, result: `${lhs} = ${displayTex(shown)}` };
}
