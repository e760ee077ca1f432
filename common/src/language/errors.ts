/** Errors and warnings of the engine: a sentence an engineer understands, with a 1-based position. */
import type { Unit as MathUnit } from 'mathjs';
import { isUnit } from './math';

export interface Diagnostic {
  line: number;
  column: number;
  message: string;
}

export class EngineError extends Error {
  constructor(
    message: string,
    readonly line = 1,
    readonly column = 1,
  ) {
    super(message);
  }

  toDiagnostic(): Diagnostic {
    return { line: this.line, column: this.column, message: this.message };
  }
}

/** Names of the kinds of quantity, by SI dimension (mathjs order: kg m s A K cd mol rad bit). */
const KINDS: [number[], string][] = [
  [[0, 0, 0, 0, 0, 0, 0, 0, 0], 'a plain number'],
  [[0, 0, 0, 1, 0, 0, 0, 0, 0], 'a current'],
  [[1, 2, -3, -1, 0, 0, 0, 0, 0], 'a voltage'],
  [[1, 2, -3, -2, 0, 0, 0, 0, 0], 'a resistance or impedance'],
  [[-1, -2, 3, 2, 0, 0, 0, 0, 0], 'a conductance or admittance'],
  [[-1, -2, 4, 2, 0, 0, 0, 0, 0], 'a capacitance'],
  [[1, 2, -2, -2, 0, 0, 0, 0, 0], 'an inductance'],
  [[0, 0, -1, 0, 0, 0, 0, 0, 0], 'a frequency'],
  [[0, 0, 1, 0, 0, 0, 0, 0, 0], 'a time'],
  [[1, 2, -3, 0, 0, 0, 0, 0, 0], 'a power'],
  [[1, 2, -2, 0, 0, 0, 0, 0, 0], 'an energy'],
  [[0, 0, 1, 1, 0, 0, 0, 0, 0], 'a charge'],
  [[0, 0, 0, 0, 0, 0, 0, 1, 0], 'an angle'],
  [[0, 1, 0, 0, 0, 0, 0, 0, 0], 'a length'],
  [[1, 0, 0, 0, 0, 0, 0, 0, 0], 'a mass'],
  [[0, 0, 0, 0, 1, 0, 0, 0, 0], 'a temperature'],
];

export function kindOf(value: unknown): string {
  if (!isUnit(value)) return typeof value === 'boolean' ? 'a true/false value' : 'a plain number';
  const d = (value as unknown as { dimensions: number[] }).dimensions;
  const found = KINDS.find(([k]) => k.every((x, i) => x === d[i]));
  if (found) return found[1];
  return `a quantity in ${(value as MathUnit & { formatUnits(): string }).formatUnits() || 'mixed units'}`;
}

const OPERATION: Record<string, string> = {
  add: 'add',
  subtract: 'subtract',
  unaryMinus: 'negate',
  smaller: 'compare',
  larger: 'compare',
  smallerEq: 'compare',
  largerEq: 'compare',
  equal: 'compare',
  unequal: 'compare',
  compare: 'compare',
};

/** mathjs's internal names of the operators, as a reader knows them. */
const FUNCTION_NAMES: Record<string, string> = {
  addScalar: '+',
  add: '+',
  subtractScalar: '−',
  subtract: '−',
  multiplyScalar: '×',
  multiply: '×',
  divideScalar: '/',
  divide: '/',
  unaryMinus: 'negation (−)',
  unaryPlus: '+',
  pow: '^',
  dotPow: '.^',
  dotMultiply: '.*',
  dotDivide: './',
  smaller: '<',
  larger: '>',
  smallerEq: '<=',
  largerEq: '>=',
  equal: '==',
  unequal: '!=',
  mod: 'mod',
};

/** Rewrites a mathjs error for a reader; `operands` are the values at the failing operator, if known. */
export function explain(err: unknown, context: { fn?: string; operands?: unknown[] } = {}): string {
  const raw = err instanceof Error ? err.message : String(err);
  const op = context.fn ? OPERATION[context.fn] : undefined;
  if (
    (/Units do not match|different base|Cannot compare units/.test(raw) || (op && /Unit/.test(raw))) &&
    context.operands?.length === 2 &&
    kindOf(context.operands[0]) !== kindOf(context.operands[1])
  ) {
    const [a, b] = context.operands.map(kindOf);
    const verb = op ?? 'combine';
    return `cannot ${verb} ${a} and ${b}: the two sides have different dimensions`;
  }
  if (/Units do not match/.test(raw)) return 'the units do not match: the quantities have different dimensions';
  if (/Cannot compare units with different base/.test(raw)) return 'cannot compare quantities of different dimensions';
  let m = /Undefined symbol (\S+)/.exec(raw);
  if (m) return `unknown name ${m[1]}: it is not defined above, and it is not a unit or function`;
  m = /Undefined function (\S+)/.exec(raw);
  if (m) return `unknown function ${m[1]}`;
  m = /Unexpected type of argument in function (\w+) \(expected: ([^,]+(?:,[^,]+)*?), actual: (\w+)/.exec(raw);
  if (m)
    return `${FUNCTION_NAMES[m[1]] ? `the operation ${FUNCTION_NAMES[m[1]]}` : `the function ${m[1]}`} cannot take ${m[3] === 'Unit' ? 'a quantity with units' : `a ${m[3].toLowerCase()}`} there`;
  m = /Too many arguments in function (\w+) \(expected: (\d+)/.exec(raw);
  if (m) return `the function ${m[1]} takes at most ${m[2]} argument${m[2] === '1' ? '' : 's'}`;
  m = /Too few arguments in function (\w+) \(expected: \w+, index: (\d+)/.exec(raw);
  if (m) return `the function ${m[1]} needs more arguments`;
  if (/Unit .* is no angle|is no angle/.test(raw)) return 'this function needs an angle (rad or deg) or a plain number';
  if (/Unexpected end of expression/.test(raw)) return 'the expression ends too early: something is missing at the end';
  m = /Unexpected operator (\S+)/.exec(raw);
  if (m) return `the operator ${m[1]} is not expected here`;
  m = /Parenthesis \) expected/.exec(raw);
  if (m) return 'a closing parenthesis ) is missing';
  m = /Value expected/.exec(raw);
  if (m) return 'a value is missing here';
  m = /(?:Syntax error in part|Unexpected part) "([^"]*)"/.exec(raw);
  if (m) {
    if (m[1].startsWith('∠')) return 'the ∠ sign is not part of the language: write a phasor as phasor(230 V, -30 deg)';
    return `cannot read "${m[1].split(/\s+/)[0].slice(0, 20)}" here`;
  }
  m = /End of string (\S) expected/.exec(raw);
  if (m) return `a closing quote ${m[1]} is missing`;
  if (/Invalid left hand side of assignment/.test(raw)) return 'only a name can stand on the left of =';
  m = /Signature not found \(signature: (\w+)\(([^)]*)\)\)/.exec(raw);
  if (m) return `the operation ${FUNCTION_NAMES[m[1]] ?? m[1]} cannot take ${m[2] === 'null' ? 'a bare unit without a number' : m[2]} here`;
  if (/Maximum call stack/.test(raw)) return 'the expression is nested too deeply to evaluate';
  if (/Unit .* not found|not found/.test(raw)) return raw.replace(/^Error: /, '').replace(/"/g, '');
  return raw.replace(/ \(char \d+\)$/, '').replace(/^Error: /, '');
}
