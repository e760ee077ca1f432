/**
 * mathjs nodes carry no source positions, so we find them: the line is split into tokens, and the
 * tree is walked in source order, matching each node that has a token of its own (a name, a number,
 * an operator) to the next token with that text. Used only to say where an error is.
 */
import type { MathNode } from 'mathjs';

interface Token {
  text: string;
  kind: 'name' | 'number' | 'op' | 'string';
  column: number; // 1-based
}

const OPERATORS = [
  '==',
  '!=',
  '<=',
  '>=',
  '<<',
  '>>>',
  '>>',
  '.*',
  './',
  '.^',
  "'",
  '+',
  '-',
  '*',
  '/',
  '^',
  '%',
  '<',
  '>',
  '=',
  '!',
  '?',
  ':',
  '(',
  ')',
  '[',
  ']',
  '{',
  '}',
  ',',
  ';',
  '&',
  '|',
  '~',
];
const NAME_START = /[A-Za-z_$\u00C0-\u02AF\u0370-\u03FF\u2100-\u214F]/;
const NAME_PART = /[A-Za-z0-9_$\u00C0-\u02AF\u0370-\u03FF\u2100-\u214F]/;

export function tokenize(source: string): Token[] {
  const tokens: Token[] = [];
  let i = 0;
  while (i < source.length) {
    const c = source[i];
    if (c === ' ' || c === '\t') {
      i++;
      continue;
    }
    const start = i;
    if (NAME_START.test(c)) {
      while (i < source.length && NAME_PART.test(source[i])) i++;
      tokens.push({ text: source.slice(start, i), kind: 'name', column: start + 1 });
      continue;
    }
    const num = /^(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?/.exec(source.slice(i));
    if (num) {
      i += num[0].length;
      tokens.push({ text: num[0], kind: 'number', column: start + 1 });
      continue;
    }
    if (c === '"' || c === "'") {
      const end = source.indexOf(c, i + 1);
      if (c === '"' || end > 0) {
        i = end < 0 ? source.length : end + 1;
        tokens.push({ text: source.slice(start, i), kind: 'string', column: start + 1 });
        continue;
      }
    }
    const op = OPERATORS.find((o) => source.startsWith(o, i)) ?? c;
    i += op.length;
    tokens.push({ text: op, kind: 'op', column: start + 1 });
  }
  return tokens;
}

type AnyNode = MathNode & Record<string, unknown>;

/** Maps each node to the 1-based column of its own token (or of its first token). */
export function locateNodes(root: MathNode, source: string, offset = 0): Map<MathNode, number> {
  const tokens = tokenize(source);
  const columns = new Map<MathNode, number>();
  let next = 0;

  const take = (match: (t: Token) => boolean): number | undefined => {
    for (let k = next; k < tokens.length; k++) {
      if (match(tokens[k])) {
        next = k + 1;
        return tokens[k].column + offset;
      }
    }
    return undefined;
  };
  const first = () => (tokens[next] ? tokens[next].column + offset : undefined);

  const visit = (node: AnyNode | undefined): void => {
    if (!node) return;
    const start = first();
    switch (node.type) {
      case 'SymbolNode': {
        const col = take((t) => t.kind === 'name' && t.text === node.name);
        if (col !== undefined) columns.set(node, col);
        return;
      }
      case 'ConstantNode': {
        const col = take((t) => t.kind === 'number' || t.kind === 'string' || t.kind === 'name');
        if (col !== undefined) columns.set(node, col);
        return;
      }
      case 'AssignmentNode':
        visit(node.object as AnyNode);
        take((t) => t.text === '=');
        visit(node.value as AnyNode);
        break;
      case 'OperatorNode': {
        const args = node.args as AnyNode[];
        const op = String(node.op);
        if (args.length === 1) {
          const col = take((t) => t.text === op);
          if (col !== undefined) columns.set(node, col);
          visit(args[0]);
          return;
        }
        visit(args[0]);
        if (!node.implicit) {
          const col = take((t) => t.text === op);
          if (col !== undefined) columns.set(node, col);
        }
        for (const a of args.slice(1)) visit(a);
        if (node.implicit && start !== undefined) columns.set(node, start);
        return;
      }
      case 'RelationalNode': {
        const params = node.params as AnyNode[];
        const ops = node.conditionals as string[];
        const opSymbol: Record<string, string> = { smaller: '<', larger: '>', smallerEq: '<=', largerEq: '>=', equal: '==', unequal: '!=' };
        visit(params[0]);
        for (let k = 1; k < params.length; k++) {
          const col = take((t) => t.text === opSymbol[ops[k - 1]]);
          if (col !== undefined && k === 1) columns.set(node, col);
          visit(params[k]);
        }
        return;
      }
      case 'FunctionNode': {
        const fn = node.fn as AnyNode;
        if (fn.type === 'SymbolNode') {
          const col = take((t) => t.kind === 'name' && t.text === fn.name);
          if (col !== undefined) {
            columns.set(node, col);
            columns.set(fn, col);
          }
        } else visit(fn);
        for (const a of node.args as AnyNode[]) visit(a);
        return;
      }
      case 'ConditionalNode':
        visit(node.condition as AnyNode);
        visit(node.trueExpr as AnyNode);
        visit(node.falseExpr as AnyNode);
        break;
      default:
        (node as MathNode).forEach((child) => visit(child as AnyNode));
    }
    if (start !== undefined && !columns.has(node)) columns.set(node, start);
  };

  visit(root as AnyNode);
  return columns;
}
