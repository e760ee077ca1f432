// `npm run bench` (engine part): prints each figure with the reference measured in the same run.
// Times are the best of many runs. Targets: a 300-line sheet ≤ 1.3 × bare mathjs; a one-cell edit of a kept 100-cell sheet
// ≤ 0.1 × its fresh evaluation; a 10 000-point sweep ≤ 5 × a hand loop;
// the numeric transient within 1e-6 of the analytic one.
import { createRequire } from 'node:module';
const require = createRequire(import.meta.url);
const engine = require('../dist/index.js');
const { create, all } = require('mathjs');

// Best of many runs, in interleaved rounds so that both sides of a ratio see the same machine state.
function time(fn, { minMs = 500, minRuns = 5 } = {}) {
  for (let k = 0; k < 3; k++) fn(); // warm up
  let best = Infinity;
  let runs = 0;
  const start = performance.now();
  while (runs < minRuns || performance.now() - start < minMs) {
    const t0 = performance.now();
    fn();
    best = Math.min(best, performance.now() - t0);
    runs++;
  }
  return best;
}
function compare(fn, ref, rounds = 4) {
  let a = Infinity;
  let b = Infinity;
  for (let r = 0; r < rounds; r++) {
    a = Math.min(a, time(fn));
    b = Math.min(b, time(ref));
  }
  return [a, b];
}

const row = (name, ms, refName, refMs, target) => {
  const ratio = ms / refMs;
  console.log(
    `${name.padEnd(44)} ${ms.toFixed(2).padStart(9)} ms   ${refName.padEnd(26)} ${refMs.toFixed(2).padStart(9)} ms   ratio ${ratio.toFixed(2).padStart(6)}  (target ≤ ${target})`,
  );
};

// 1. A 300-line sheet: 30 cells of 10 lines of series-RLC working.
const block = (k) => [
  `R_${k} = ${10 + k} ohm`,
  `L_${k} = ${20 + k} mH`,
  `C_${k} = ${100 + k} uF`,
  `f_${k} = 50 Hz`,
  `w_${k} = 2 pi f_${k}`,
  `S_${k} = w_${k} L_${k} - 1 / (w_${k} C_${k})`,
  `Z_${k} = sqrt(R_${k}^2 + S_${k}^2)`,
  `I_${k} = 230 V / Z_${k} to mA`,
  `phi_${k} = atan(S_${k} / R_${k})`,
  `P_${k} = (I_${k})^2 R_${k} to W`,
];
const cells = Array.from({ length: 30 }, (_, k) => ({ kind: 'calc', source: block(k).join('\n') }));
const statements = cells.flatMap((c) => c.source.split('\n'));
const bare = create(all);
const [sheetMs, bareMs] = compare(
  () => engine.evaluateSheet({ cells }),
  () => {
    const scope = new Map();
    for (const s of statements) bare.compile(s).evaluate(scope);
  },
);
row('300-line sheet, full evaluation', sheetMs, 'bare mathjs compile+eval', bareMs, '1.3');

// 1b. A one-cell edit of a kept 100-cell sheet (a save's evaluation): the edited cell and its check evaluated
// afresh, the 98 others reused from the kept evaluation after their inputs are found unchanged.
const branch = (c, r) => ({
  kind: 'calc',
  source: `R_${c} = ${r} ohm\nX_${c} = ${2 * c + 1} ohm\nZ_${c} = sqrt(R_${c}^2 + X_${c}^2)\nI_${c} = 230 V / Z_${c} to A`,
});
const hundred = Array.from({ length: 50 }, (_, c) => [branch(c, c + 1), { kind: 'check', condition: `I_${c} <= 300 A` }]).flat();
let kept = engine.evaluateSheet({ cells: hundred }).cache;
let n = 0;
const [editMs, freshMs] = compare(
  () => {
    const edited = hundred.slice();
    edited[0] = branch(0, 1 + (++n % 50));
    kept = engine.evaluateSheet({ cells: edited }, kept).cache;
  },
  () => engine.evaluateSheet({ cells: hundred }),
);
row('100-cell sheet, one-cell edit at the top', editMs, 'fresh evaluation', freshMs, '0.1');

// 2. A 10 000-point sweep of the complex current of a series RLC.
const sweepSheet = {
  cells: [
    { kind: 'calc', source: 'R = 10 ohm\nL = 50 mH\nC = 100 uF\nE0 = 100 V' },
    { kind: 'sweep', variable: 'f', from: '1 Hz', to: '1 kHz', points: 10000, spacing: 'log', outputs: ['E0 / (R + j (2 pi f L - 1 / (2 pi f C)))'] },
  ],
};
const [sweepMs, handMs] = compare(
  () => engine.evaluateSheet(sweepSheet),
  () => {
    const out = new Array(10000);
    for (let k = 0; k < 10000; k++) {
      const f = 1 * 1000 ** (k / 9999);
      const w = 2 * Math.PI * f;
      const x = w * 0.05 - 1 / (w * 100e-6);
      const d = 100 + x * x;
      out[k] = { re: (100 * 10) / d, im: (-100 * x) / d };
    }
    return out;
  },
);
row('10 000-point sweep, complex RLC current', sweepMs, 'hand-written TS loop', handMs, '5');

// 3. Numeric transient (odex) against the analytic solution, 10 000 output points.
const p = { R: 5, L: 0.05, C: 100e-6, q0: 1e-3, i0: 0.5 };
const E = (t) => 100 * Math.sin(2 * Math.PI * 50 * t + Math.PI / 6);
const a = engine.analyticSolution(p, { kind: 'sine', E0: 100, omega: 2 * Math.PI * 50, theta: Math.PI / 6 });
let numeric;
const transientMs = time(() => (numeric = engine.numericSolution(p, E, 0.2, 10000)), { minMs: 1000, minRuns: 3 });
const analyticMs = time(() => numeric.t.map(a.i), { minMs: 300 });
const peak = Math.max(...numeric.i.map(Math.abs));
const err = Math.max(...numeric.t.map((t, k) => Math.abs(numeric.i[k] - a.i(t)))) / peak;
row('transient, numeric, 10 000 points', transientMs, 'analytic, same points', analyticMs, '—');
console.log(`${'transient, numeric vs analytic'.padEnd(44)} max relative error ${err.toExponential(2)}   (target ≤ 1e-6)`);
