/**
 * One expression of a sheet: parsed once with mathjs, its names checked against the scope, compiled
 * once and evaluated. Errors are located: a syntax error by mathjs's own position, an error in
 * evaluation by finding the innermost operator or function that fails.
 */
import type { MathNode } from 'mathjs';
import { describePlace, type Place, type SheetScope } from '../cells/scope';
import { EngineError, explain, type Diagnostic } from './errors';
import { ALLOWED_CONSTANTS, ALLOWED_FUNCTIONS, ALLOWED_NODES, ALLOWED_OPERATORS } from './allowed';
import { isBuiltin, math, parse, REFUSED_NAMES, Unit } from './math';

const SYNTAX_WORDS: Record<string, string> = {
  ObjectNode: 'an object { … }',
  BlockNode: 'several statements on one line',
  FunctionAssignmentNode: 'defining a function',
};
const methodName = (accessor: AnyNode): string | undefined => {
  const index = accessor.index as AnyNode | undefined;
  const dim = (index?.dimensions as AnyNode[] | undefined)?.[0];
  return dim?.type === 'ConstantNode' ? String(dim.value) : undefined;
};
import { locateNodes } from './positions';

type AnyNode = MathNode & Record<string, unknown>;

/** µ and μ are read as the micro prefix u (same length, so columns stay right). */
export const normalizeSource = (s: string) => s.replace(/[µμ]/g, 'u');

/** Parses text at a place; `offset` is the column of the text's first character minus one. */
export function parseExpression(text: string, line: number, offset = 0, isValue: (name: string) => boolean = () => false): MathNode {
  try {
    const node = callsToProducts(parse(normalizeSource(text)), isValue);
    return /\bpi\b/.test(text) ? groupTwoPi(node) : node;
  } catch (err) {
    const char = (err as { char?: number }).char;
    const column = typeof char === 'number' ? Math.max(1, Math.min(char, text.length + 1)) + offset : offset + 1;
    throw new EngineError(explain(err), line, column);
  }
}

/**
 * mathjs reads `name(...)` as a call. Where the name is a value (a variable of the sheet, or the
 * imaginary unit i or j) a space or not, an engineer means a product: `j (w L - 1/(w C))`, `R(1 + a)`.
 */
export function callsToProducts(node: MathNode, isValue: (name: string) => boolean): MathNode {
  const isCandidate = (n: MathNode) => {
    const f = n as AnyNode;
    if (f.type !== 'FunctionNode' || (f.fn as AnyNode).type !== 'SymbolNode') return false;
    const name = String((f.fn as AnyNode).name);
    return name === 'i' || name === 'j' || isValue(name);
  };
  if (node.filter(isCandidate).length === 0) return node;
  return node.transform((n) => {
    const f = n as AnyNode;
    if (f.type === 'FunctionNode' && (f.fn as AnyNode).type === 'SymbolNode' && (f.args as MathNode[]).length === 1) {
      const name = String((f.fn as AnyNode).name);
      if (name === 'i' || name === 'j' || isValue(name)) {
        const arg = callsToProducts((f.args as MathNode[])[0], isValue);
        return new math.OperatorNode('*', 'multiply', [new math.SymbolNode(name), new math.ParenthesisNode(arg)], true);
      }
    }
    return n;
  });
}

const isMultiply = (n: MathNode) => n.type === 'OperatorNode' && (n as AnyNode).fn === 'multiply' && ((n as AnyNode).args as MathNode[]).length === 2;
const isTwo = (n: MathNode) => n.type === 'ConstantNode' && (n as AnyNode).value === 2;
const isPi = (n: MathNode) => n.type === 'SymbolNode' && (n as AnyNode).name === 'pi';

/**
 * A product with the factors 2 and pi anywhere in it (`2 f pi`) is read as `2 pi f`, so that 2π meets
 * the frequency first and makes it an angular frequency (see math.ts). Only scalar factors move.
 */
export function groupTwoPi(node: MathNode): MathNode {
  if (node.filter(isPi).length === 0) return node;
  return node.transform((n) => {
    if (!isMultiply(n)) return n;
    const factors: MathNode[] = [];
    const flatten = (m: MathNode) => (isMultiply(m) ? ((m as AnyNode).args as MathNode[]).forEach(flatten) : factors.push(m));
    flatten(n);
    const two = factors.findIndex(isTwo);
    const pi = factors.findIndex(isPi);
    const rest = factors.filter((_, k) => k !== two && k !== pi).map(groupTwoPi);
    if (two < 0 || pi < 0 || rest.length === 0 || Math.max(two, pi) === 1) return n.map((c) => groupTwoPi(c));
    const implicit = Boolean((n as AnyNode).implicit);
    const product = (a: MathNode, b: MathNode) => new math.OperatorNode('*', 'multiply', [a, b], implicit);
    return rest.reduce(product, product(factors[two], factors[pi]));
  });
}

/** A scope's test for callsToProducts: a name holding a value, not a function. */
export const valueNames = (scope: SheetScope) => (name: string) => scope.values.has(name) && typeof scope.values.get(name) !== 'function';

/** The names an expression reads (function names excluded). */
export function symbolsOf(node: MathNode): AnyNode[] {
  const out: AnyNode[] = [];
  node.traverse((n, path, parent) => {
    if (n.type !== 'SymbolNode') return;
    if (parent && parent.type === 'FunctionNode' && path === 'fn') return;
    out.push(n as AnyNode);
  });
  return out;
}

/** Functions an expression calls. */
function functionsOf(node: MathNode): AnyNode[] {
  const out: AnyNode[] = [];
  node.traverse((n) => {
    if (n.type === 'FunctionNode') out.push(n as AnyNode);
  });
  return out;
}

export interface CheckedExpression {
  node: MathNode;
  warnings: Diagnostic[];
}

/**
 * Checks that every name is known at this place. A name defined in the sheet always means the
 * variable; a name not (yet) defined means a unit, constant or function if there is one.
 */
export function checkNames(node: MathNode, source: string, scope: SheetScope, place: Place, offset = 0, local: ReadonlySet<string> = new Set()): Diagnostic[] {
  const warnings: Diagnostic[] = [];
  let columns: Map<MathNode, number> | undefined;
  const columnOf = (n: MathNode) => (columns ??= locateNodes(node, normalizeSource(source), offset)).get(n) ?? offset + 1;
  node.traverse((n, path, parent) => {
    const name = n.type === 'SymbolNode' ? String((n as AnyNode).name) : '';
    if (REFUSED_NAMES.has(name)) throw new EngineError(`${name} is not available in a sheet`, place.line, columnOf(n));
    if (n.type === 'FunctionAssignmentNode') throw new EngineError('defining functions is not part of the language', place.line, columnOf(n));
    if (n.type === 'AssignmentNode' && n !== node)
      throw new EngineError('an assignment inside an expression is not allowed: write one definition a line', place.line, columnOf(n));
    if (!ALLOWED_NODES.has(n.type))
      throw new EngineError(`${SYNTAX_WORDS[n.type] ?? 'this kind of expression'} is not part of the sheet language`, place.line, columnOf(n));
    const a = n as AnyNode;
    if (n.type === 'FunctionNode' && (a.fn as AnyNode).type !== 'SymbolNode') {
      const method = (a.fn as AnyNode).type === 'AccessorNode' ? methodName(a.fn as AnyNode) : undefined;
      throw new EngineError(
        method
          ? `calling a method on a value (.${method}(…)) is not part of the sheet language: use the function form, for example ${method}(x, …), which leaves x unchanged`
          : 'only a function named directly can be called, for example sqrt(x)',
        place.line,
        columnOf(n),
      );
    }
    if ((n.type === 'AccessorNode' || n.type === 'IndexNode') && (n.type === 'IndexNode' ? a.dotNotation : (a.index as AnyNode).dotNotation)) {
      if (!(parent?.type === 'FunctionNode' && path === 'fn'))
        throw new EngineError('reading a property of a value (x.name) is not part of the sheet language: index a matrix with x[k]', place.line, columnOf(n));
    }
    if (n.type === 'OperatorNode' && !ALLOWED_OPERATORS.has(String(a.fn)))
      throw new EngineError(`the operator ${String(a.op)} is not part of the sheet language`, place.line, columnOf(n));
  });
  for (const fn of functionsOf(node)) {
    const f = fn.fn as AnyNode;
    if (f.type !== 'SymbolNode') continue;
    const name = String(f.name);
    if (scope.has(name) && typeof scope.values.get(name) === 'function') continue;
    if (ALLOWED_FUNCTIONS.has(name) && typeof (math as unknown as Record<string, unknown>)[name] === 'function') continue;
    if (isBuiltin(name))
      throw new EngineError(
        `the function ${name} is not part of the sheet language (LANGUAGE.md lists the functions a sheet may call)`,
        place.line,
        columnOf(fn),
      );
    throw new EngineError(`unknown function ${name}`, place.line, columnOf(fn));
  }
  for (const sym of symbolsOf(node)) {
    const name = String(sym.name);
    if (scope.has(name) || local.has(name)) continue;
    const failedAt = scope.failed.get(name);
    if (failedAt) throw new EngineError(`${name} has no value because its definition failed (${describePlace(failedAt)})`, place.line, columnOf(sym));
    const later = scope.definedLater(name, place);
    const isUnit = Unit.isValuelessUnit(name);
    if (later && !isUnit) {
      throw new EngineError(
        `${name} is used before it is defined: it is defined at ${describePlace(later)}; move this line below it`,
        place.line,
        columnOf(sym),
      );
    }
    if (later && isUnit) {
      warnings.push({
        line: place.line,
        column: columnOf(sym),
        message: `${name} here means the unit ${name}; the variable ${name} is only defined later, at ${describePlace(later)}`,
      });
      continue;
    }
    if (isUnit || ALLOWED_CONSTANTS.has(name)) continue;
    if (ALLOWED_FUNCTIONS.has(name))
      throw new EngineError(`${name} is a function: call it with its arguments, for example ${name}(x)`, place.line, columnOf(sym));
    if (isBuiltin(name)) throw new EngineError(`${name} is not part of the sheet language`, place.line, columnOf(sym));
    throw new EngineError(`unknown name ${name}: it is not defined above, and it is not a unit, constant or function`, place.line, columnOf(sym));
  }
  return warnings;
}

/** Evaluates a checked expression; on failure, says which operator or function failed and where. */
export function evaluateNode(
  node: MathNode,
  compiled: { evaluate(scope?: unknown): unknown },
  mathScope: Map<string, unknown>,
  source: string,
  line: number,
  offset = 0,
): unknown {
  try {
    return compiled.evaluate(mathScope);
  } catch (err) {
    if (err instanceof EngineError) throw err;
    throw locateFailure(node, mathScope, source, line, offset, err);
  }
}

function tryEval(n: MathNode, scope: Map<string, unknown>): { ok: true; value: unknown } | { ok: false; error: unknown } {
  try {
    return { ok: true, value: n.compile().evaluate(scope) };
  } catch (error) {
    return { ok: false, error };
  }
}

/** Finds the innermost node whose children evaluate but which itself fails (slow; errors only). */
export function locateFailure(root: MathNode, scope: Map<string, unknown>, source: string, line: number, offset: number, fallback: unknown): EngineError {
  const columns = locateNodes(root, normalizeSource(source), offset);
  let culprit: MathNode = root;
  let error: unknown = fallback;
  let operands: unknown[] | undefined;
  const descend = (n: MathNode): void => {
    const children: MathNode[] = [];
    n.forEach((child) => children.push(child));
    const values: unknown[] = [];
    for (const child of children) {
      const r = tryEval(child, scope);
      if (!r.ok) return descend(child);
      values.push(r.value);
    }
    const self = tryEval(n, scope);
    if (!self.ok) {
      culprit = n;
      error = self.error;
      operands = values;
    }
  };
  descend(root);
  const c = culprit as AnyNode;
  const fnName =
    c.type === 'OperatorNode'
      ? String(c.fn)
      : c.type === 'RelationalNode'
        ? String((c.conditionals as string[])[0])
        : c.type === 'FunctionNode'
          ? String((c.fn as AnyNode).name)
          : undefined;
  let message = explain(error, { fn: fnName, operands });
  if (c.type === 'FunctionNode' && !message.includes(String((c.fn as AnyNode).name))) message = `in ${String((c.fn as AnyNode).name)}: ${message}`;
  return new EngineError(message, line, columns.get(culprit) ?? offset + 1);
}
