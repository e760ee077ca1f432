import type { Unit as MathUnit } from 'mathjs';
import { isUnit, math } from '../language/math';
import { dimensionsOf, dropRidingAngle, frequencyKind, withoutAngle } from '../units/quantities';
import { kindOf } from '../language/errors';

const ANGLE_UNITS = /^(rad|deg|grad|cycle|arcsec|arcmin|mrad|urad)$/;

/**
 * Converts a value to the unit asked for with `to`. A plain number shown in deg or rad is taken as
 * radians; a radian riding along with other dimensions is dropped (rad·s shown in ms).
 */
export function convertTo(value: unknown, target: string): unknown {
  let targetUnit: MathUnit;
  try {
    targetUnit = math.unit(target) as MathUnit;
  } catch {
    throw new Error(`${target} is not a unit this language knows`);
  }
  if (typeof value === 'number' && ANGLE_UNITS.test(target)) return (math.unit(value, 'rad') as MathUnit).to(target);
  if (!isUnit(value)) {
    if (typeof value === 'number' && dimensionsOf(targetUnit).every((d) => d === 0)) return value;
    throw new Error(`cannot show ${kindOf(value)} in ${target}`);
  }
  const from = dimensionsOf(value);
  const to = dimensionsOf(targetUnit);
  const same = (a: number[], b: number[]) => a.every((x, i) => x === b[i]);
  if (same(from, to)) return (value as MathUnit).to(target);
  const kinds = [frequencyKind(value), frequencyKind(targetUnit)];
  if (kinds.includes('angular') && kinds.includes('cyclic')) {
    throw new Error(
      kinds[0] === 'angular'
        ? `this is an angular frequency (rad/s), not a frequency: divide by 2 pi to show it in ${target}`
        : `this is a frequency (Hz), not an angular frequency: multiply by 2 pi to show it in ${target}`,
    );
  }
  if (same(withoutAngle(from), withoutAngle(to))) {
    const bare = dropRidingAngle(value as MathUnit);
    const angle = to[7] - dimensionsOf(bare)[7];
    const adjusted = angle === 0 ? bare : (math.multiply(bare, math.pow(math.unit(1, 'rad'), angle)) as MathUnit);
    return adjusted.to(target);
  }
  throw new Error(`cannot show ${kindOf(value)} in ${target}, which is ${kindOf(targetUnit)}`);
}
