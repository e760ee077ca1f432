/**
 * The trade's functions, callable in any expression. Each takes quantities with units (checked by
 * dimension) and returns one in coherent SI. Formulas and sources are listed in common/LANGUAGE.md;
 * the reference checks in reference-checks/ compare them with outside sources.
 */
import type { MathJsInstance } from 'mathjs';
import { frequencyKind, quantity, real, si, type Scalar } from '../units/quantities';

/** The language's instance, handed over by language/math.ts when it registers these functions (see units/quantities.ts). */
let math: MathJsInstance;
export function useInstance(instance: MathJsInstance): void {
  math = instance;
}

type C = { re: number; im: number };
const c = (x: Scalar): C => (typeof x === 'number' ? { re: x, im: 0 } : x);
const cadd = (a: C, b: C): C => ({ re: a.re + b.re, im: a.im + b.im });
const cinv = (a: C): C => {
  const d = a.re * a.re + a.im * a.im;
  if (d === 0) throw new Error('division by a zero impedance');
  return { re: a.re / d, im: -a.im / d };
};
const cmul = (a: C, b: C): C => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const cabs = (a: C) => Math.hypot(a.re, a.im);
const simplest = (a: C): Scalar => (a.im === 0 ? a.re : a);
const TWO_PI = 2 * Math.PI;

function positive(x: number, what: string): number {
  if (!(x > 0)) throw new Error(`${what} must be greater than zero`);
  return x;
}
function nonNegative(x: number, what: string): number {
  if (!(x >= 0)) throw new Error(`${what} must not be negative`);
  return x;
}

/** The impedances (or other like quantities) of the arguments, all of one dimension. */
function sameKind(args: unknown[], fn: string): { values: C[]; unit: unknown } {
  if (args.length < 2) throw new Error(`${fn} needs at least two values`);
  const first = args[0];
  for (const a of args.slice(1)) {
    if (math.isUnit(first) !== math.isUnit(a) || (math.isUnit(first) && !(first as { equalBase(u: unknown): boolean }).equalBase(a))) {
      throw new Error(`${fn} needs values of one kind (all impedances, for example)`);
    }
  }
  return { values: args.map((a) => c(math.isUnit(a) ? ((a as unknown as { value: Scalar }).value as Scalar) : (a as Scalar))), unit: first };
}

function like(template: unknown, value: C): unknown {
  if (!math.isUnit(template)) return value.im === 0 ? value.re : math.complex(value.re, value.im);
  const out = (template as { clone(): { value: unknown } }).clone();
  out.value = value.im === 0 ? value.re : math.complex(value.re, value.im);
  return out;
}

/** Angular frequency from a value in rad/s or s⁻¹; a value in Hz is refused (it would be 2π out). */
const omega = (w: unknown, what = 'w') => {
  if (frequencyKind(w) === 'cyclic') throw new Error(`${what} is an angular frequency in rad/s, but this value is a frequency in Hz: pass 2 pi times it`);
  return positive(real(w, 'frequency', `${what} (angular frequency)`), what);
};
/** Frequency from a value in Hz or s⁻¹; a value in rad/s is refused (it would be 2π out). */
const hz = (f: unknown, what = 'f') => {
  if (frequencyKind(f) === 'angular') throw new Error(`${what} is a frequency in Hz, but this value is an angular frequency in rad/s: pass it divided by 2 pi`);
  return positive(real(f, 'frequency', `${what} (frequency)`), what);
};

function rlcParts(R: unknown, L: unknown, Cap: unknown, w: unknown) {
  const r = nonNegative(real(R, 'impedance', 'R'), 'R');
  const l = positive(real(L, 'inductance', 'L'), 'L');
  const cap = positive(real(Cap, 'capacitance', 'C'), 'C');
  const om = omega(w);
  const S = om * l - 1 / (om * cap);
  const Z = Math.hypot(r, S);
  return { r, l, cap, om, S, Z };
}

export const circuitFunctions = {
  // Combination of impedances
  series: (...z: unknown[]) => {
    const { values, unit } = sameKind(z, 'series');
    return like(unit, values.reduce(cadd));
  },
  parallel: (...z: unknown[]) => {
    const { values, unit } = sameKind(z, 'parallel');
    return like(unit, cinv(values.map(cinv).reduce(cadd)));
  },

  // Reactance and impedance of one element at a frequency f (Hz)
  reactance_L: (L: unknown, f: unknown) => quantity(TWO_PI * hz(f) * positive(real(L, 'inductance', 'L'), 'L'), 'ohm'),
  reactance_C: (Cap: unknown, f: unknown) => quantity(1 / (TWO_PI * hz(f) * positive(real(Cap, 'capacitance', 'C'), 'C')), 'ohm'),
  impedance_L: (L: unknown, f: unknown) => quantity({ re: 0, im: TWO_PI * hz(f) * positive(real(L, 'inductance', 'L'), 'L') }, 'ohm'),
  impedance_C: (Cap: unknown, f: unknown) => quantity({ re: 0, im: -1 / (TWO_PI * hz(f) * positive(real(Cap, 'capacitance', 'C'), 'C')) }, 'ohm'),
  impedance_RLC: (R: unknown, L: unknown, Cap: unknown, f: unknown) => {
    const { r, S } = rlcParts(R, L, Cap, quantity(TWO_PI * hz(f), 'rad/s'));
    return quantity({ re: r, im: S }, 'ohm');
  },

  // Resonance and damping of a series RLC
  resonant_frequency: (L: unknown, Cap: unknown) =>
    quantity(1 / (TWO_PI * Math.sqrt(positive(real(L, 'inductance', 'L'), 'L') * positive(real(Cap, 'capacitance', 'C'), 'C'))), 'Hz'),
  natural_frequency: (L: unknown, Cap: unknown) =>
    quantity(1 / Math.sqrt(positive(real(L, 'inductance', 'L'), 'L') * positive(real(Cap, 'capacitance', 'C'), 'C')), 'rad/s'),
  q_factor: (R: unknown, L: unknown, Cap: unknown) =>
    (1 / positive(real(R, 'impedance', 'R'), 'R')) * Math.sqrt(positive(real(L, 'inductance', 'L'), 'L') / positive(real(Cap, 'capacitance', 'C'), 'C')),
  damping_ratio: (R: unknown, L: unknown, Cap: unknown) =>
    (nonNegative(real(R, 'impedance', 'R'), 'R') / 2) * Math.sqrt(positive(real(Cap, 'capacitance', 'C'), 'C') / positive(real(L, 'inductance', 'L'), 'L')),
  attenuation: (R: unknown, L: unknown) => quantity(nonNegative(real(R, 'impedance', 'R'), 'R') / (2 * positive(real(L, 'inductance', 'L'), 'L')), 's^-1'),
  damped_frequency: (R: unknown, L: unknown, Cap: unknown) => {
    const r = nonNegative(real(R, 'impedance', 'R'), 'R');
    const l = positive(real(L, 'inductance', 'L'), 'L');
    const cap = positive(real(Cap, 'capacitance', 'C'), 'C');
    const d = 1 / (l * cap) - (r / (2 * l)) ** 2;
    if (!(d > 0)) throw new Error('the circuit does not oscillate (it is critically damped or overdamped), so it has no damped frequency');
    return quantity(Math.sqrt(d), 'rad/s');
  },
  critical_resistance: (L: unknown, Cap: unknown) =>
    quantity(2 * Math.sqrt(positive(real(L, 'inductance', 'L'), 'L') / positive(real(Cap, 'capacitance', 'C'), 'C')), 'ohm'),

  // Steady periodic response of a series RLC driven by E0 sin(w t)
  rlc_reactance: (L: unknown, Cap: unknown, w: unknown) => {
    const l = positive(real(L, 'inductance', 'L'), 'L');
    const cap = positive(real(Cap, 'capacitance', 'C'), 'C');
    const om = omega(w);
    return quantity(om * l - 1 / (om * cap), 'ohm');
  },
  rlc_impedance: (R: unknown, L: unknown, Cap: unknown, w: unknown) => quantity(rlcParts(R, L, Cap, w).Z, 'ohm'),
  rlc_amplitude: (E0: unknown, R: unknown, L: unknown, Cap: unknown, w: unknown) => {
    const { Z } = rlcParts(R, L, Cap, w);
    if (Z === 0) throw new Error('the impedance is zero (R = 0 at resonance): there is no steady periodic current');
    return quantity(real(E0, 'voltage', 'E0') / Z, 'A');
  },
  delay_angle: (R: unknown, L: unknown, Cap: unknown, w: unknown) => {
    const { r, S } = rlcParts(R, L, Cap, w);
    return quantity(Math.atan2(S, r), 'rad');
  },
  time_lag: (R: unknown, L: unknown, Cap: unknown, w: unknown) => {
    const { r, S, om } = rlcParts(R, L, Cap, w);
    return quantity(Math.atan2(S, r) / om, 's');
  },
  rlc_current: (t: unknown, E0: unknown, R: unknown, L: unknown, Cap: unknown, w: unknown) => {
    const { r, S, Z, om } = rlcParts(R, L, Cap, w);
    if (Z === 0) throw new Error('the impedance is zero (R = 0 at resonance): there is no steady periodic current');
    const time = real(t, 'time', 't');
    return quantity((real(E0, 'voltage', 'E0') / Z) * Math.sin(om * time - Math.atan2(S, r)), 'A');
  },

  // Power
  complex_power: (V: unknown, I: unknown) => {
    const i = c(si(rmsOnly(I, 'I'), 'current', 'I'));
    return quantity(simplest(cmul(c(si(rmsOnly(V, 'V'), 'voltage', 'V')), { re: i.re, im: -i.im })), 'VA');
  },
  apparent_power: (V: unknown, I: unknown) => quantity(cabs(c(si(rmsOnly(V, 'V'), 'voltage', 'V'))) * cabs(c(si(rmsOnly(I, 'I'), 'current', 'I'))), 'VA'),
  real_power: (V: unknown, I: unknown) => {
    const i = c(si(rmsOnly(I, 'I'), 'current', 'I'));
    return quantity(cmul(c(si(rmsOnly(V, 'V'), 'voltage', 'V')), { re: i.re, im: -i.im }).re, 'W');
  },
  reactive_power: (V: unknown, I: unknown) => {
    const i = c(si(rmsOnly(I, 'I'), 'current', 'I'));
    return quantity(cmul(c(si(rmsOnly(V, 'V'), 'voltage', 'V')), { re: i.re, im: -i.im }).im, 'var');
  },
  power_factor: (...args: unknown[]) => {
    if (args.length === 1) {
      const z = complexOf(args[0]);
      if (cabs(z) === 0) throw new Error('power_factor of a zero quantity is undefined');
      return z.re / cabs(z);
    }
    if (args.length !== 2) throw new Error('power_factor takes a complex power or impedance, or P and S');
    const p = real(args[0], 'power', 'P');
    const s = magnitudeOnly(args[1], 'S');
    return p / positive(s, 'S');
  },
  power_factor_sense: (x: unknown) => {
    const im = complexOf(x).im;
    return im > 0 ? 'lagging' : im < 0 ? 'leading' : 'unity';
  },

  // Three-phase relations (balanced)
  line_voltage: (Vph: unknown) => quantity(Math.sqrt(3) * real(Vph, 'voltage', 'V_ph'), 'V'),
  phase_voltage: (Vll: unknown) => quantity(real(Vll, 'voltage', 'V_LL') / Math.sqrt(3), 'V'),
  power_3ph: (Vll: unknown, I: unknown, pf: unknown) => {
    const p = real(pf, 'none', 'pf');
    if (p < -1 || p > 1) throw new Error('pf must lie between −1 and 1');
    return quantity(Math.sqrt(3) * real(Vll, 'voltage', 'V_LL') * real(I, 'current', 'I_L') * p, 'W');
  },
  apparent_power_3ph: (Vll: unknown, I: unknown) => quantity(Math.sqrt(3) * real(Vll, 'voltage', 'V_LL') * real(I, 'current', 'I_L'), 'VA'),
  line_current_3ph: (S: unknown, Vll: unknown) => quantity(magnitudeOnly(S, 'S') / (Math.sqrt(3) * positive(real(Vll, 'voltage', 'V_LL'), 'V_LL')), 'A'),

  // Capacitor banks
  bank_reactive_power: (Cap: unknown, V: unknown, f: unknown) =>
    quantity(TWO_PI * hz(f) * positive(real(Cap, 'capacitance', 'C'), 'C') * real(V, 'voltage', 'V') ** 2, 'var'),
  bank_capacitance: (Q: unknown, V: unknown, f: unknown) =>
    quantity(positive(real(Q, 'power', 'Q'), 'Q') / (TWO_PI * hz(f) * positive(real(V, 'voltage', 'V'), 'V') ** 2), 'F'),
  resonance_order: (Ssc: unknown, Qc: unknown) => Math.sqrt(positive(real(Ssc, 'power', 'S_sc'), 'S_sc') / positive(real(Qc, 'power', 'Q_c'), 'Q_c')),
  resonance_order_tr: (Str: unknown, zPercent: unknown, Qc: unknown, Ssc?: unknown) => {
    const str = positive(real(Str, 'power', 'S_tr'), 'S_tr');
    const z = positive(real(zPercent, 'none', 'z_percent'), 'z_percent');
    const qc = positive(real(Qc, 'power', 'Q_c'), 'Q_c');
    // Source and transformer reactances add: 1/S_sc,bus = 1/S_sc + z%/(100·S_tr). Without S_sc the source is infinite.
    const source = Ssc === undefined ? 0 : 1 / positive(real(Ssc, 'power', 'S_sc'), 'S_sc');
    return Math.sqrt(1 / ((source + z / (100 * str)) * qc));
  },
  tuning_order: (p: unknown) => {
    const x = real(p, 'none', 'p');
    if (!(x > 0 && x < 1)) throw new Error('p (the reactor as a fraction of the capacitor reactance) must lie between 0 and 1');
    return 1 / Math.sqrt(x);
  },
  detuned_voltage_rise: (p: unknown) => {
    const x = real(p, 'none', 'p');
    if (!(x >= 0 && x < 1)) throw new Error('p must lie between 0 and 1');
    return 1 / (1 - x);
  },

  // Per-unit
  per_unit: (x: unknown, base: unknown) => {
    const r = math.divide(x as number, base as number) as unknown;
    if (math.isUnit(r)) throw new Error('per_unit needs a value and a base of one kind');
    return r;
  },
  base_impedance: (Vbase: unknown, Sbase: unknown) =>
    quantity(real(Vbase, 'voltage', 'V_base') ** 2 / positive(real(Sbase, 'power', 'S_base'), 'S_base'), 'ohm'),
  base_current_3ph: (Sbase: unknown, Vbase: unknown) =>
    quantity(real(Sbase, 'power', 'S_base') / (Math.sqrt(3) * positive(real(Vbase, 'voltage', 'V_base'), 'V_base')), 'A'),

  // Phasors and waveforms
  phasor: (mag: unknown, angle: unknown) => phasor(mag, angle),
  polar: (mag: unknown, angle: unknown) => phasor(mag, angle),
  rms: (peakValue: unknown) => sinusoid(peakValue, 'rms', (x) => math.divide(x as number, Math.SQRT2)),
  peak: (rmsValue: unknown) => markPeak(sinusoid(rmsValue, 'peak', (x) => math.multiply(x as number, Math.SQRT2))),
  total_rms: (spectrum: unknown) => {
    const { first, magnitudes } = harmonics(spectrum, 'total_rms');
    return like(first, { re: rootSumSquare(magnitudes), im: 0 });
  },
  thd: (spectrum: unknown) => {
    const { magnitudes: h } = harmonics(spectrum, 'thd', 50);
    if (h.length < 2) throw new Error('thd needs the fundamental and at least one harmonic: [V_1, V_2, V_3, …]');
    if (h[0] === 0) throw new Error('thd is relative to the fundamental, which is zero here');
    return rootSumSquare(h.slice(1)) / h[0];
  },
  tdd: (spectrum: unknown, IL: unknown) => {
    const { first, magnitudes: h } = harmonics(spectrum, 'tdd', 50);
    real(math.abs(first as never), 'current', 'the spectrum of tdd');
    return rootSumSquare(h.slice(1)) / positive(real(IL, 'current', 'I_L'), 'I_L');
  },
};

/** A complex power or impedance (or a real one) as a complex number in SI. */
function complexOf(x: unknown): C {
  return c(math.isUnit(x) ? ((x as unknown as { value: Scalar }).value as Scalar) : (x as Scalar));
}

const rootSumSquare = (xs: number[]) => Math.sqrt(xs.reduce((acc, x) => acc + x * x, 0));

/** A real magnitude where a complex value would be ambiguous (|S| of a complex power must be asked for). */
function magnitudeOnly(x: unknown, what: string): number {
  const v = si(x, 'power', what);
  if (typeof v !== 'number')
    throw new Error(`${what} must be the apparent power |S|, a real value in VA; this one is a complex power: pass abs(${what}) if its magnitude is meant`);
  return nonNegative(v, what);
}

/** rms and peak convert one sinusoid; a spectrum has a total rms (total_rms), not one per element. */
function sinusoid(x: unknown, fn: string, convert: (x: unknown) => unknown): unknown {
  if (math.isMatrix(x) || Array.isArray(x)) {
    throw new Error(
      `${fn} converts the value of one sinusoid; for a spectrum use total_rms(v) (the square root of the sum of squares), or write v ${fn === 'rms' ? '/' : '*'} sqrt(2) to convert every element`,
    );
  }
  return convert(x);
}

/**
 * The magnitudes of a spectrum [X_1, X_2, …] (rms, order h at position h), all of one kind, as SI numbers,
 * with its first element (for its unit); at most `maxOrder` orders where a definition counts only those.
 */
function harmonics(spectrum: unknown, fn: string, maxOrder = Infinity): { first: unknown; magnitudes: number[] } {
  if (!(math.isMatrix(spectrum) || Array.isArray(spectrum)))
    throw new Error(`${fn} takes a spectrum: the rms values [X_1, X_2, X_3, …] of the fundamental and each harmonic`);
  const values = ((math.isMatrix(spectrum) ? (spectrum as { toArray(): unknown[] }).toArray() : spectrum) as unknown[]).flat(Infinity) as unknown[];
  if (values.length === 0) throw new Error(`${fn} needs at least one value`);
  if (values.length > maxOrder) throw new Error(`${fn} counts harmonics up to the ${maxOrder}th (IEEE Std 519-2014, 3.1): give at most ${maxOrder} values`);
  const first = values[0];
  const magnitudes = values.map((x) => {
    if (math.isUnit(first) !== math.isUnit(x) || (math.isUnit(first) && !(first as { equalBase(u: unknown): boolean }).equalBase(x))) {
      throw new Error(`${fn} needs a spectrum of one kind (all voltages or all currents)`);
    }
    return cabs(complexOf(x));
  });
  return { first, magnitudes };
}

/** A value made by peak() is marked, so that a function taking rms values can refuse it. */
const PEAK = Symbol('peak value');
function markPeak<T>(x: T): T {
  if (x && typeof x === 'object') (x as unknown as Record<symbol, boolean>)[PEAK] = true;
  return x;
}
export function isPeakValue(x: unknown): boolean {
  return Boolean(x && typeof x === 'object' && (x as Record<symbol, boolean>)[PEAK]);
}

/** The power functions take rms phasors; a value marked as a peak is refused. */
function rmsOnly(x: unknown, what: string): unknown {
  if (isPeakValue(x)) throw new Error(`${what} must be an rms value; this one is a peak made by peak(): pass rms of it, or the rms value itself`);
  return x;
}

/** An angle in radians from a plain number (radians) or a quantity in rad or deg. */
export function angleValue(angle: unknown, what = 'angle'): number {
  if (typeof angle === 'number') return angle;
  if (math.isUnit(angle)) {
    const d = (angle as unknown as { dimensions: number[] }).dimensions;
    if (d.every((x, i) => x === (i === 7 ? 1 : 0))) return (angle as unknown as { value: number }).value;
  }
  throw new Error(`${what} must be an angle (in rad or deg) or a plain number of radians`);
}

function phasor(mag: unknown, angle: unknown): unknown {
  const a = angleValue(angle);
  const rotation = math.complex(Math.cos(a), Math.sin(a));
  const out = math.multiply(mag as number, rotation);
  return isPeakValue(mag) ? markPeak(out) : out;
}

export type CircuitFunctionName = keyof typeof circuitFunctions;
export const CIRCUIT_FUNCTION_NAMES = Object.keys(circuitFunctions) as CircuitFunctionName[];
