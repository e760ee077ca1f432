/**
 * The sweep cell: one variable over a range (linear or logarithmic, up to 20 000 points), evaluating
 * expressions of the sheet at each point. Units are checked once, at the first point, with full unit
 * arithmetic; the points are then evaluated on plain SI numbers, and the first point is compared
 * with the unit-checked value to make sure both paths agree.
 */
import type { MathNode } from 'mathjs';
import type { SweepCell } from '../sheet/sheet-format';
import { EngineError } from '../language/errors';
import { checkNames, evaluateNode, parseExpression, valueNames } from '../language/expression';
import { isComplex, isUnit, math, Unit } from '../language/math';
import { siUnitName, type DisplayOptions } from '../units/display';
import { withNumericMode } from '../units/quantities';
import { offsetScaleOf } from '../units/temperature';
import { compileNumeric, NumericFallback } from '../language/numeric';
import { compileSweepKernel, KERNEL_FALLBACK } from '../language/numeric-codegen';
import type { SheetScope } from './scope';
import type { SeriesData, SweepResult } from './types';

type AnyNode = MathNode & Record<string, unknown>;
const NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

const siOf = (v: unknown): unknown => {
  if (isUnit(v)) return (v as unknown as { value: unknown }).value;
  if (math.isMatrix(v)) return (v as { map(f: (x: unknown) => unknown): unknown }).map(siOf);
  return v;
};

/**
 * The unit a series' numbers are in: the coherent SI unit, or for a temperature on an offset scale that scale
 * (the numbers are on it: a sweep from 20 degC runs 20, 25, ...; see units/temperature.ts).
 */
function seriesUnit(v: unknown): string {
  if (!isUnit(v)) return '';
  const scale = offsetScaleOf(v);
  return scale ? `${scale.prefix.name}${scale.unit.name}` : (siUnitName(v as never) ?? '');
}

/** A copy of the expression with every unit replaced by its SI factor, for numeric evaluation. */
function stripUnits(node: MathNode, isVariable: (n: string) => boolean): MathNode {
  return node.transform((n, path, parent) => {
    if (n.type === 'SymbolNode' && !(parent?.type === 'FunctionNode' && path === 'fn')) {
      const name = String((n as AnyNode).name);
      if (!isVariable(name) && Unit.isValuelessUnit(name)) {
        return new math.ConstantNode((math.unit(1, name) as unknown as { value: number }).value);
      }
    }
    return n;
  });
}

/** A number, a mathjs Complex or a plain {re, im} pair, as a pair. */
const pair = (v: unknown): { re: number; im: number } =>
  typeof v === 'number'
    ? { re: v, im: 0 }
    : isComplex(v) || (v && typeof (v as { re?: unknown }).re === 'number')
      ? { re: (v as { re: number }).re, im: (v as { im: number }).im }
      : { re: Number(v), im: 0 };

function seriesOf(name: string, values: unknown[], unit: string): SeriesData {
  const pairs = values.map(pair);
  if (pairs.some((p) => p.im !== 0)) return { name, unit, complex: true, values: pairs.map((p) => p.re), im: pairs.map((p) => p.im) };
  return { name, unit, values: pairs.map((p) => p.re) };
}

export function evaluateSweepCell(cell: SweepCell, cellIndex: number, scope: SheetScope, _display: DisplayOptions): SweepResult {
  const result: SweepResult = { kind: 'sweep', status: 'ok', outputs: [], errors: [], warnings: [] };
  const place = { cell: cellIndex, line: 1 };
  try {
    const variable = cell.variable.trim();
    if (!NAME.test(variable)) throw new EngineError(`the sweep variable "${cell.variable}" is not a name`, 1, 1);
    const mathScope = scope.asMathScope();
    const bound = (text: string, what: string) => {
      const node = parseExpression(text, 1, 0, valueNames(scope));
      checkNames(node, text, scope, place);
      const v = evaluateNode(node, node.compile(), mathScope, text, 1);
      if (!isUnit(v) && typeof v !== 'number') throw new EngineError(`the sweep's ${what} must be a real quantity or number`, 1, 1);
      return v;
    };
    const from = bound(cell.from, 'start');
    const to = bound(cell.to, 'end');
    if (isUnit(from) !== isUnit(to) || (isUnit(from) && !(from as unknown as { equalBase(u: unknown): boolean }).equalBase(to))) {
      throw new EngineError('the start and end of a sweep must be of one kind (both frequencies, for example)', 1, 1);
    }
    const a = Number(siOf(from));
    const b = Number(siOf(to));
    const n = cell.points;
    const log = cell.spacing === 'log';
    if (log && !(a > 0 && b > 0)) throw new EngineError('a logarithmic sweep needs a start and end greater than zero', 1, 1);
    const points = Array.from({ length: n }, (_, k) => (log ? a * (b / a) ** (k / (n - 1)) : a + ((b - a) * k) / (n - 1)));
    const variableUnit = seriesUnit(from);
    const template = isUnit(from) ? from : undefined;
    const atPoint = (x: number) => {
      if (!template) return x;
      const u = (template as unknown as { clone(): { value: unknown } }).clone();
      u.value = x;
      return u;
    };
    result.variable = { name: variable, unit: variableUnit, values: points };
    const pointArray = Float64Array.from(points);

    const isVariable = (name: string) => name === variable || scope.has(name);
    const numericScope = new Map<string, unknown>();
    for (const [k, v] of scope.values) numericScope.set(k, siOf(v));

    cell.outputs.forEach((text, o) => {
      const node = parseExpression(text, o + 1, 0, valueNames(scope));
      checkNames(node, text, scope, { cell: cellIndex, line: o + 1 }, 0, new Set([variable]));
      // Units once, at the first point, with the full unit arithmetic.
      const unitScope = new Map(scope.values);
      unitScope.set(variable, atPoint(points[0]));
      const first = evaluateNode(node, node.compile(), unitScope, text, o + 1);
      const unit = seriesUnit(first);
      const stripped = stripUnits(node, isVariable);
      const viaMathjs = () => {
        const compiled = stripped.compile();
        return withNumericMode(() =>
          points.map((x) => {
            numericScope.set(variable, x);
            return compiled.evaluate(numericScope);
          }),
        );
      };
      const viaClosures = () => {
        const fast = compileNumeric(stripped, variable);
        if (!fast) return viaMathjs();
        try {
          return points.map((x) => fast(numericScope, x));
        } catch (err) {
          if (!(err instanceof NumericFallback)) throw err;
          return viaMathjs();
        }
      };
      let series: SeriesData | undefined;
      const kernel = compileSweepKernel(stripped, variable, numericScope);
      if (kernel) {
        try {
          const out = kernel(pointArray);
          series = out.complex
            ? { name: text, unit, complex: true, values: Array.from(out.re), im: Array.from(out.im) }
            : { name: text, unit, values: Array.from(out.re) };
        } catch (err) {
          if (err !== KERNEL_FALLBACK) throw err;
        }
      }
      if (!series) series = seriesOf(text, viaClosures(), unit);
      const check = siOf(first);
      const got = series.complex ? { re: series.values[0], im: series.im![0] } : series.values[0];
      const close = (p: unknown, q: unknown) => {
        const pr = pair(p);
        const qr = pair(q);
        return Math.hypot(pr.re - qr.re, pr.im - qr.im) <= 1e-9 * Math.max(1e-300, Math.hypot(qr.re, qr.im));
      };
      if (!close(got, check)) {
        throw new EngineError(`the output ${text} gives different values with and without units; write its units explicitly`, o + 1, 1);
      }
      result.outputs.push(series);
    });
  } catch (err) {
    result.status = 'error';
    result.errors.push(err instanceof EngineError ? err.toDiagnostic() : { line: 1, column: 1, message: (err as Error).message });
  }
  return result;
}
