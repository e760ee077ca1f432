/**
 * What the sheet language allows: the functions, constants, operators and kinds of syntax an
 * expression may use. Anything not listed here is refused when the expression is checked, before
 * anything is evaluated, so a new mathjs release adds nothing to the language by itself.
 * Left out on purpose: functions that reach outside a sheet or change the language (import, parse,
 * evaluate, ...), functions that take other functions (map, filter, ...), random numbers (a package must
 * give the same numbers every time it is evaluated), sparse matrices, set and combinatorial builders
 * (setPowerset, setCartesian), bitwise and string-formatting functions, and type conversions to
 * bignumber, fraction or bigint.
 */
import { circuitFunctions } from '../circuits/functions';

const MATHJS_FUNCTIONS = [
  // arithmetic
  'abs', 'add', 'cbrt', 'ceil', 'cube', 'divide', 'dotDivide', 'dotMultiply', 'dotPow', 'exp', 'expm1', 'fix', 'floor', 'gcd',
  'hypot', 'lcm', 'log', 'log10', 'log1p', 'log2', 'mod', 'multiply', 'nthRoot', 'pow', 'round', 'sign', 'sqrt', 'square',
  'subtract', 'unaryMinus', 'unaryPlus',
  // complex numbers
  'arg', 'complex', 'conj', 'im', 're',
  // trigonometry
  'acos', 'acosh', 'acot', 'acoth', 'acsc', 'acsch', 'asec', 'asech', 'asin', 'asinh', 'atan', 'atan2', 'atanh', 'cos', 'cosh',
  'cot', 'coth', 'csc', 'csch', 'sec', 'sech', 'sin', 'sinh', 'tan', 'tanh',
  // units
  'unit', 'to', 'number',
  // relational and logical
  'compare', 'equal', 'larger', 'largerEq', 'smaller', 'smallerEq', 'unequal', 'and', 'not', 'or', 'xor',
  // matrices (every builder checks the size of what it would make before it makes it: language/math.ts)
  'column', 'concat', 'count', 'cross', 'ctranspose', 'cumsum', 'det', 'diag', 'diff', 'dot', 'flatten', 'identity', 'inv', 'kron',
  'lsolve', 'lusolve', 'matrix', 'norm', 'ones', 'range', 'reshape', 'resize', 'row', 'size', 'sort', 'squeeze', 'trace',
  'transpose', 'usolve', 'zeros', 'fft', 'ifft', 'polynomialRoot',
  // statistics and special functions
  'mad', 'max', 'mean', 'median', 'min', 'mode', 'prod', 'std', 'sum', 'variance', 'erf', 'gamma', 'factorial', 'combinations',
  'permutations',
  // tests
  'isInteger', 'isNaN', 'isNegative', 'isPositive', 'isZero',
] as const;

/** Every function a sheet may call. */
export const ALLOWED_FUNCTIONS: ReadonlySet<string> = new Set<string>([...MATHJS_FUNCTIONS, ...Object.keys(circuitFunctions)]);

/** Constants a sheet may read (besides its own names and units). */
export const ALLOWED_CONSTANTS: ReadonlySet<string> = new Set<string>([
  'pi', 'e', 'i', 'j', 'tau', 'phi', 'true', 'false', 'Infinity', 'NaN',
  // CODATA physical constants as mathjs defines them (checked in reference-checks/)
  'atomicMass', 'avogadro', 'bohrMagneton', 'bohrRadius', 'boltzmann', 'classicalElectronRadius', 'conductanceQuantum', 'coulomb',
  'coulombConstant', 'deuteronMass', 'efimovFactor', 'electricConstant', 'electronMass', 'elementaryCharge', 'faraday', 'fermiCoupling',
  'fineStructure', 'firstRadiation', 'gasConstant', 'gravitationConstant', 'gravity', 'hartreeEnergy', 'inverseConductanceQuantum',
  'klitzing', 'loschmidt', 'magneticConstant', 'magneticFluxQuantum', 'molarMass', 'molarMassC12', 'molarPlanckConstant', 'molarVolume',
  'neutronMass', 'nuclearMagneton', 'planckCharge', 'planckConstant', 'planckLength', 'planckMass', 'planckTemperature', 'planckTime',
  'protonMass', 'quantumOfCirculation', 'reducedPlanckConstant', 'rydberg', 'sackurTetrode', 'secondRadiation', 'speedOfLight',
  'stefanBoltzmann', 'thomsonCrossSection', 'vacuumImpedance', 'weakMixingAngle', 'wienDisplacement',
]);

/** Operators (by mathjs's function name) an expression may use. */
export const ALLOWED_OPERATORS: ReadonlySet<string> = new Set<string>([
  'add', 'subtract', 'multiply', 'divide', 'pow', 'unaryMinus', 'unaryPlus', 'mod', 'dotMultiply', 'dotDivide', 'dotPow', 'to',
  'smaller', 'smallerEq', 'larger', 'largerEq', 'equal', 'unequal', 'and', 'or', 'xor', 'not', 'factorial', 'transpose', 'ctranspose',
]);

/** Kinds of syntax an expression may hold (an assignment only as the whole line: language/expression.ts). */
export const ALLOWED_NODES: ReadonlySet<string> = new Set<string>([
  'AssignmentNode', 'ConstantNode', 'SymbolNode', 'OperatorNode', 'ParenthesisNode', 'FunctionNode', 'ArrayNode', 'IndexNode',
  'AccessorNode', 'RangeNode', 'ConditionalNode', 'RelationalNode',
]);
