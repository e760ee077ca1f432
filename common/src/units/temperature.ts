/**
 * Temperatures on a scale whose zero is not absolute zero: degC and degF. mathjs 15 keeps such a value on
 * its own scale (75 degC holds 75, not 348.15), and its comparisons and subtraction take the numbers as they
 * are: in plain mathjs 15.2.0, `75 degC < 300 K` is true and `75 degC - 20 degC` is 55 degC. The engine reads
 * them as the SI does (SI Brochure, 9th edition, 2019, section 2.3.1: t/°C = T/K − 273.15; from memory):
 * - a comparison of temperatures on different scales compares kelvin (`75 degC < 300 K` is false);
 * - one temperature on an offset scale minus another is a difference, in K (`75 degC - 20 degC` = 55 K);
 * - a value is shown on its own scale (75.00 °C), and its SI value is in kelvin (348.15).
 * Sums and products keep mathjs's reading (a degC value plus 10 K is 10 degrees warmer; a product uses the
 * number on the value's scale), which is what temperature-rise and resistance-correction formulas expect.
 */
import type { Unit as MathUnit } from 'mathjs';

interface UnitPart {
  unit: { name: string; value: unknown; offset: number };
  prefix: { name: string; value: number };
  power: number;
}

const partsOf = (u: MathUnit) => (u as unknown as { units: UnitPart[] }).units;

/** The single unit of a temperature on an offset scale (degC, degF), or undefined for any other value. */
export function offsetScaleOf(u: MathUnit): UnitPart | undefined {
  const parts = partsOf(u);
  return parts.length === 1 && parts[0].power === 1 && parts[0].unit.offset !== 0 ? parts[0] : undefined;
}

/** The value in kelvin of a temperature on an offset scale, as mathjs converts it (`to K`). */
export function kelvinOf(u: MathUnit): unknown {
  return (u.to('K') as unknown as { value: unknown }).value;
}

/** A temperature with a value on an offset scale (not the valueless degC of `75 degC` being made). */
function isOffsetTemperature(x: unknown): x is MathUnit {
  if (x === null || typeof x !== 'object' || (x as { isUnit?: boolean }).isUnit !== true) return false;
  return (x as { value: unknown }).value !== null && offsetScaleOf(x as MathUnit) !== undefined;
}

const isMatrix = (x: unknown): x is { valueOf(): unknown; map(f: (v: unknown) => unknown): unknown } =>
  x !== null && typeof x === 'object' && (x as { isMatrix?: boolean }).isMatrix === true;

/** The first element of a matrix or an array, or the value itself: the elements share one kind, as a table column's do. */
function sample(x: unknown): unknown {
  let v = x;
  for (;;) {
    if (Array.isArray(v)) v = v[0];
    else if (isMatrix(v)) v = v.valueOf();
    else return v;
  }
}

const holdsOffsetTemperature = (x: unknown) => isOffsetTemperature(sample(x));

/** The value with every temperature on an offset scale in it — itself, or a matrix's or array's elements — in kelvin. */
function inKelvin(x: unknown): unknown {
  if (isOffsetTemperature(x)) return x.to('K');
  if (Array.isArray(x)) return x.map(inKelvin);
  if (isMatrix(x)) return x.map((v) => inKelvin(v));
  return x;
}

/** Both sides in kelvin when either holds a temperature on an offset scale (comparing in kelvin is right whatever the scales); as they are otherwise. */
export function onOneScale(a: unknown, b: unknown): [unknown, unknown] {
  return holdsOffsetTemperature(a) || holdsOffsetTemperature(b) ? [inKelvin(a), inKelvin(b)] : [a, b];
}

/** One temperature on an offset scale minus another (the same scale or not; element by element in matrices), as a difference in K; undefined for anything else. */
export function temperatureDifference(a: unknown, b: unknown, subtract: (x: unknown, y: unknown) => unknown): unknown {
  return holdsOffsetTemperature(a) && holdsOffsetTemperature(b) ? subtract(inKelvin(a), inKelvin(b)) : undefined;
}

/** Where a calc line or a check collects what `noteOffsetProduct` finds; undefined elsewhere (a sweep's points). */
let sink: Set<string> | undefined;

/** Runs `fn`, gathering the notes of temperatures on an offset scale met in a product, quotient or power. */
export function collectingNotes<T>(fn: () => T): { value: T; notes: string[] } {
  const outer = sink;
  sink = new Set();
  try {
    const value = fn();
    return { value, notes: [...sink] };
  } finally {
    sink = outer;
  }
}

/**
 * Called by the language's multiply, divide and power: a temperature on the °C or °F scale counts there by
 * its number on that scale (mathjs's reading, which the copper formula (234.5 + t)/(234.5 + 20) relies on),
 * which is wrong for an absolute temperature such as the T of σT⁴: the line says so.
 */
export function noteOffsetProduct(a: unknown, b: unknown): void {
  if (!sink) return;
  const t = [sample(a), sample(b)].find(isOffsetTemperature);
  if (!t) return;
  const scale = offsetScaleOf(t)!.unit.name === 'degF' ? '°F' : '°C';
  sink.add(
    `a temperature on the ${scale} scale counts by its number on that scale in a product, quotient or power (20 ${scale} as 20, not as a temperature in kelvin); for an absolute temperature, as in σT⁴, convert it first: (T to K)`,
  );
}
