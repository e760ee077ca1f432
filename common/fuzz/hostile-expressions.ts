/**
 * Generators of hostile calc sources for fuzzing the language: deep nesting, huge and tiny numbers,
 * unit soup, attempts to escape the sandbox, huge matrices and odd unicode, mixed with ordinary
 * expressions so that the engine's normal paths are reached too.
 */
import fc from 'fast-check';

const NAMES = ['R', 'L', 'C', 'f', 'w', 'x', 'I', 'V_1', 'Z_c', 'j', 'i', 'pi', 'e'];
const UNITS = [
  'V',
  'A',
  'ohm',
  'kohm',
  'mH',
  'uF',
  'Hz',
  'kHz',
  'rad',
  'deg',
  's',
  'ms',
  'W',
  'kW',
  'var',
  'kvar',
  'VA',
  'J',
  'C',
  'F',
  'H',
  'S',
  'm',
  'kg',
  'K',
  'degC',
  'rad/s',
  'V/m',
  'qV',
  'QW',
  'bogus',
  'µF',
  'Ω',
];
const FUNCTIONS = [
  'sqrt',
  'abs',
  'arg',
  're',
  'im',
  'conj',
  'sin',
  'cos',
  'exp',
  'log',
  'max',
  'sum',
  'series',
  'parallel',
  'phasor',
  'rms',
  'rlc_impedance',
  'delay_angle',
  'resonant_frequency',
  'power_factor',
  'round',
  'ones',
  'zeros',
  'det',
  'inv',
];
const ESCAPES = [
  'import({x: 1})',
  'evaluate("1+1")',
  'parse("1")',
  'compile("1")',
  'createUnit("foo")',
  'simplify("x")',
  'derivative("x^2", "x")',
  'resolve(x)',
  'f(x) = x^2',
  'cos.constructor("return process")()',
  'x.constructor',
  '[].constructor.constructor("return 1")()',
  '__proto__',
  'x["constructor"]',
  'config({number: "BigNumber"})',
  'typed()',
  'chain(1)',
  'reviver',
  'Unit',
  'process.exit(1)',
  'require("fs")',
  'this',
  'globalThis',
  '"\\u0000"',
];
const UNICODE = ['\u202e', '\u200b', '\uFEFF', 'µ', 'Ω', '∠', '√', '²', '−', '×', '·', '🙂', '\u0301', '\uD800', 'ℎ', 'ﬁ', '\t', '\r'];

const num = fc.oneof(
  fc.constantFrom('0', '1', '-1', '1e308', '-1e308', '1e-308', '5e-324', '1e400', '1e-400', '0.1', '3.14159', '1e15', '9007199254740993', 'NaN', 'Infinity'),
  fc.double({ noNaN: false }).map((d) => String(d)),
  fc.integer().map(String),
);

const atom = fc.oneof(
  num,
  fc.constantFrom(...NAMES),
  fc.tuple(num, fc.constantFrom(...UNITS)).map(([n, u]) => `${n} ${u}`),
  fc.constantFrom(...ESCAPES),
  fc.constantFrom(...UNICODE),
);

/** An expression tree of bounded depth. */
const expr: fc.Arbitrary<string> = fc.letrec<{ e: string }>((tie) => ({
  e: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    atom,
    fc.tuple(tie('e'), fc.constantFrom('+', '-', '*', '/', '^', '==', '<=', ' to ', '.*', ' and ', ' mod '), tie('e')).map(([a, op, b]) => `${a}${op}${b}`),
    fc.tuple(fc.constantFrom(...FUNCTIONS), fc.array(tie('e'), { maxLength: 4 })).map(([f, args]) => `${f}(${args.join(', ')})`),
    tie('e').map((a) => `(${a})`),
    fc.array(tie('e'), { maxLength: 5 }).map((xs) => `[${xs.join(', ')}]`),
    fc.tuple(tie('e'), fc.constantFrom(...UNITS)).map(([a, u]) => `${a} to ${u}`),
  ),
})).e;

/** Calls that would build something huge if their size were not checked before allocating. */
export const ALLOCATION_BOMBS = fc.oneof(
  fc.integer({ min: 1e4, max: 2e9 }).map((n) => `resize([1], [${n}])`),
  fc.integer({ min: 1e4, max: 2e9 }).map((n) => `resize(sparse([1]), [1, ${n}])`),
  fc.integer({ min: 300, max: 1e5 }).map((n) => `kron(ones(${n}), ones(${n}))`),
  fc.integer({ min: 300, max: 1e5 }).map((n) => `diag(ones(${n}))`),
  fc.integer({ min: 300, max: 1e5 }).map((n) => `ones(${n}, 1) .* ones(1, ${n})`),
  fc.integer({ min: 300, max: 1e5 }).map((n) => `ones(${n}, 1) * ones(1, ${n})`),
  fc.integer({ min: 300, max: 1e5 }).map((n) => `ones(${n}, 1) + ones(1, ${n})`),
  fc.integer({ min: 1e5, max: 2e9 }).map((n) => `range("1:${n}")`),
  fc.integer({ min: 1e5, max: 2e9 }).map((n) => `size(1:${n})`),
  fc.integer({ min: 20, max: 60 }).map((n) => `setPowerset(1:${n})`),
  fc.constantFrom('concat(ones(60000), ones(60000))', 'matrix("sparse")', 'random(1e6)', 'bignumber(2)^1e9', 'map(ones(3), sqrt)'),
);

/** Method and property calls on values, which would mutate them or reach their prototype. */
export const METHOD_CALLS = fc.oneof(
  fc
    .constantFrom(...NAMES)
    .chain((n) =>
      fc.constantFrom(`${n}.resize([1])`, `${n}.toString()`, `${n}.value`, `${n}.clone()`, `${n}.set([1], 5)`, `${n}.units`, `size(${n}.resize([1]))`),
    ),
  fc.constantFrom('[1, 2, 3].resize([1])', '(2 V).to("mV")', 'sqrt.signatures', 'ones(3).map(sqrt)', '{a: 1}.a'),
);

/** Shapes that target limits directly. */
const extreme = fc.oneof(
  fc.integer({ min: 100, max: 5000 }).map((n) => `${'('.repeat(n)}1${')'.repeat(n)}`),
  fc.integer({ min: 2, max: 400 }).map((n) => Array.from({ length: n }, () => '2').join('^')),
  fc.integer({ min: 10, max: 3000 }).map((n) => `zeros(${n}, ${n})`),
  fc.integer({ min: 10, max: 1e6 }).map((n) => `ones(${n}) * 2 V`),
  fc.integer({ min: 50, max: 3000 }).map((n) => Array.from({ length: n }, (_, k) => `${k} ${UNITS[k % UNITS.length]}`).join(' + ')),
  fc.integer({ min: 1, max: 2000 }).map((n) => `"${'a'.repeat(n * 50)}"`),
  fc.string({ unit: 'binary', maxLength: 200 }),
  fc.string({ unit: 'grapheme', maxLength: 200 }),
  ALLOCATION_BOMBS,
  METHOD_CALLS,
);

/** A sheet that doubles a value line after line (a string or a matrix): each line must stop at the limit. */
export const doublingSheet = fc.tuple(fc.constantFrom('"abcdefgh"', '[1, 2, 3, 4]', 'ones(2, 2)'), fc.integer({ min: 10, max: 40 })).map(([start, n]) => ({
  cells: [{ kind: 'calc' as const, source: [`a_0 = ${start}`, ...Array.from({ length: n }, (_, k) => `a_${k + 1} = concat(a_${k}, a_${k})`)].join('\n') }],
}));

/** A calc line (`name = expression`, sometimes broken on purpose) and a check condition. */
export const hostileSource = fc
  .tuple(
    fc.constantFrom(...NAMES, 'y', 'z', '_', '1x', 'to', 'pi', 'sqrt', ''),
    fc.oneof({ weight: 4, arbitrary: expr }, { weight: 1, arbitrary: extreme }),
    fc.option(fc.constantFrom('# note', ' to mA', ' to', '=', ' # ∠ ok'), { nil: '' }),
  )
  .map(([name, e, tail]) => `${name} = ${e}${tail}`);

export const hostileSheet = fc.tuple(fc.array(hostileSource, { minLength: 1, maxLength: 4 }), fc.oneof(expr, extreme)).map(([lines, condition]) => ({
  cells: [
    { kind: 'calc' as const, source: `R = 5 ohm\nL = 10 mH\nC = 100 uF\nf = 50 Hz\nw = 2 pi f\nx = 2 A\n${lines.join('\n')}` },
    { kind: 'check' as const, condition },
  ],
}));

/** Values that fit each kind of element (most of the time), or not. */
const FITTING: Record<string, string[][]> = {
  resistor: [['10 ohm', '0.5 ohm', '1 kohm', '1e-6 ohm', '1e6 ohm']],
  inductor: [['1 mH', '20 mH', '1 uH', '10 H']],
  capacitor: [['10 uF', '100 uF', '1 nF', '1 F']],
  source: [
    ['230 V', 'phasor(230 V, -30 deg)', '11 kV'],
    ['', '0.1 ohm', '0.1 ohm + j 1 ohm', 'j 2 ohm', '-j 1 ohm'],
  ],
  supply: [
    ['400 V', '11 kV'],
    ['250 MVA', '10 MVA'],
    ['10', '0', '1e6'],
  ],
  transformer: [['1.6 MVA'], ['6 %', '0 %', '120 %'], ['8', '0'], ['400 V']],
  injection: [['[1, 5, 7]'], ['[10 A, 2 A, 1 A]', '[0 A, 2 A, 1 A]'], ['', '[0 deg, 30 deg, 10 deg]']],
  switch: [['5 ms', '0 s', '1 s', '-1 s']],
};
const hostileValue = fc.oneof(fc.constantFrom('', '0', '-1 ohm', '1e308 ohm', 'R + 1', 'x'), expr, extreme);
const NETWORK_KINDS = ['resistor', 'inductor', 'capacitor', 'source', 'supply', 'transformer', 'injection', 'switch'] as const;
const networkElement = fc.constantFrom(...NETWORK_KINDS).chain((kind) =>
  fc.record({
    // Numbered in order below; now and then a bad or repeated name.
    name: fc.oneof({ weight: 12, arbitrary: fc.constant('') }, { weight: 1, arbitrary: fc.constantFrom('A', 'x_1', 'E1', '') }),
    kind: fc.constant(kind),
    a: fc.oneof({ weight: 9, arbitrary: fc.constantFrom('A', 'B', 'C', 'gnd') }, { weight: 1, arbitrary: fc.constantFrom('Ax', '') }),
    b: fc.constantFrom('A', 'B', 'C', 'gnd', 'gnd'),
    values: fc.tuple(
      ...FITTING[kind].map((pool) => fc.oneof({ weight: 12, arbitrary: fc.constantFrom(...pool) }, { weight: 1, arbitrary: hostileValue })),
    ) as fc.Arbitrary<string[]>,
  }),
);

/** A network cell with a few elements between a few nodes, any analysis, and a check of one of its names below. */
export const hostileNetworkSheet = fc
  .tuple(
    fc.array(networkElement, { minLength: 1, maxLength: 7 }),
    fc.constantFrom('steady', 'scan', 'harmonics', 'transient'),
    fc.record({
      frequency: fc.oneof(
        { weight: 8, arbitrary: fc.constantFrom('50 Hz', '60 Hz') },
        { weight: 1, arbitrary: fc.constantFrom('0 Hz', '2 pi 50 Hz', '50', '') },
      ),
      node: fc.constantFrom('A', 'B', 'A', 'B', 'gnd', 'Z'),
      from: fc.oneof({ weight: 8, arbitrary: fc.constant('10 Hz') }, { weight: 1, arbitrary: fc.constantFrom('0 Hz', '2 kHz') }),
      to: fc.oneof({ weight: 8, arbitrary: fc.constant('2.5 kHz') }, { weight: 1, arbitrary: fc.constantFrom('10 Hz', '1e12 Hz') }),
      points: fc.integer({ min: 2, max: 3000 }),
      span: fc.oneof({ weight: 8, arbitrary: fc.constantFrom('10 ms', '40 ms') }, { weight: 1, arbitrary: fc.constantFrom('0 s', '1 s', '1e9 s') }),
    }),
  )
  .map(([elements, analysis, settings]) => ({
    cells: [
      { kind: 'calc' as const, source: 'R = 5 ohm' },
      {
        kind: 'network' as const,
        reference: 'gnd',
        analysis,
        ...settings,
        elements: elements.map((e, k) => ({ ...e, name: e.name || `E${k + 1}` })),
      },
      { kind: 'check' as const, condition: 'THD_A <= 5 %' },
    ],
  }));
