/**
 * The check cell: a condition (a comparison of quantities of one dimension, or a true/false value),
 * its basis and severity. Utilisation is actual / limit for `<=` and `<`, limit / actual for `>=` and `>`.
 */
import type { MathNode } from 'mathjs';
import type { CheckCell } from '../sheet/sheet-format';
import { EngineError } from '../language/errors';
import { checkNames, evaluateNode, parseExpression, valueNames } from '../language/expression';
import { isComplex, isUnit } from '../language/math';
import { displayTex, expressionTex } from '../tex/tex';
import { formatValue, type DisplayOptions } from '../units/display';
import { dropRidingAngle } from '../units/quantities';
import { collectingNotes, offsetScaleOf } from '../units/temperature';
import type { SheetScope } from './scope';
import type { CheckResult } from './types';

type AnyNode = MathNode & Record<string, unknown>;

const RELATIONS: Record<string, { symbol: string; tex: string; utilization: 'actual/limit' | 'limit/actual' | null }> = {
  smaller: { symbol: '<', tex: '<', utilization: 'actual/limit' },
  smallerEq: { symbol: '<=', tex: '\\le', utilization: 'actual/limit' },
  larger: { symbol: '>', tex: '>', utilization: 'limit/actual' },
  largerEq: { symbol: '>=', tex: '\\ge', utilization: 'limit/actual' },
  equal: { symbol: '==', tex: '=', utilization: null },
  unequal: { symbol: '!=', tex: '\\ne', utilization: null },
};

function siNumber(x: unknown, what: string, column: number): number {
  const v = isUnit(x) ? (dropRidingAngle(x) as unknown as { value: unknown }).value : x;
  if (isComplex(v)) throw new EngineError(`the ${what} is complex: compare magnitudes, for example abs(I) <= I_max`, 1, column);
  if (typeof v !== 'number') throw new EngineError(`the ${what} must be a quantity or a number`, 1, column);
  return v;
}

export function evaluateCheckCell(cell: CheckCell, cellIndex: number, scope: SheetScope, display: DisplayOptions): CheckResult {
  const severity = cell.severity ?? 'mandatory';
  const result: CheckResult = { kind: 'check', status: 'ok', pass: null, utilization: null, margin: null, severity, errors: [], warnings: [] };
  const source = cell.condition;
  try {
    if (!source.trim()) throw new EngineError('the condition is empty: write a comparison such as I_rms <= 1.35 * I_rated', 1, 1);
    const node = parseExpression(source, 1, 0, valueNames(scope)) as AnyNode;
    result.warnings.push(...checkNames(node, source, scope, { cell: cellIndex, line: 1 }));
    const mathScope = scope.asMathScope();
    const isVariable = (n: string) => scope.has(n);
    const valueTex = (n: string) => `\\left(${displayTex(scope.displayOf(n, (v) => formatValue(v, display).display))}\\right)`;
    result.tex = { formula: expressionTex(node, { isVariable }), working: expressionTex(node, { isVariable, valueTexOf: valueTex }) };

    let sides: [MathNode, MathNode] | undefined;
    let relation: string | undefined;
    if (node.type === 'OperatorNode' && RELATIONS[String(node.fn)] && (node.args as MathNode[]).length === 2) {
      sides = node.args as [MathNode, MathNode];
      relation = String(node.fn);
    } else if (node.type === 'RelationalNode') {
      throw new EngineError('a check compares two sides once: split a chained comparison into two checks', 1, 1);
    }
    if (sides && relation) {
      const [lhsNode, rhsNode] = sides;
      const both = collectingNotes(() => [
        evaluateNode(lhsNode, lhsNode.compile(), mathScope, source, 1),
        evaluateNode(rhsNode, rhsNode.compile(), mathScope, source, 1),
      ]);
      const [actual, limit] = both.value;
      for (const message of both.notes) result.warnings.push({ line: 1, column: 1, message });
      const pass = evaluateNode(node, node.compile(), mathScope, source, 1);
      if (typeof pass !== 'boolean') throw new EngineError('the condition does not give true or false', 1, 1);
      result.pass = pass;
      result.relation = RELATIONS[relation].symbol;
      result.actual = formatValue(actual, display);
      result.limit = formatValue(limit, display);
      const kind = RELATIONS[relation].utilization;
      const offsetScale = [actual, limit].some((x) => isUnit(x) && offsetScaleOf(x));
      if (kind && offsetScale)
        result.warnings.push({
          line: 1,
          column: 1,
          message: "no utilisation is given for a temperature on the °C or °F scale: a ratio of such temperatures depends on where the scale's zero is",
        });
      else if (kind) {
        const a = siNumber(actual, 'left side', 1);
        const l = siNumber(limit, 'right side', 1);
        const u = kind === 'actual/limit' ? a / l : l / a;
        result.utilization = Number.isFinite(u) ? u : null;
        result.margin = result.utilization === null ? null : 1 - result.utilization;
        if (l <= 0 && kind === 'actual/limit')
          result.warnings.push({ line: 1, column: 1, message: 'the limit is zero or negative, so the utilisation has no meaning' });
      }
    } else {
      const value = evaluateNode(node, node.compile(), mathScope, source, 1);
      if (typeof value !== 'boolean') {
        throw new EngineError('a check needs a comparison (such as V_pk <= 1.2 * sqrt(2) * V_rated) or a true/false value', 1, 1);
      }
      result.pass = value;
    }
  } catch (err) {
    result.status = 'error';
    result.pass = null;
    result.errors.push(err instanceof EngineError ? err.toDiagnostic() : { line: 1, column: 1, message: (err as Error).message });
  }
  return result;
}
