/**
 * How results are presented, decided once for the screen and the signed package: the names of the cell
 * kinds, a check's outcome and its utilisation band. Pure (types only), so the browser can use it.
 */
import type { CellKind } from '../sheet/sheet-format';
import type { CheckResult } from '../cells/types';

/** Every kind's name; a new kind does not compile until it has one. */
export const KIND_LABELS: Record<CellKind, string> = {
  note: 'Note',
  calc: 'Calculation',
  check: 'Check',
  sweep: 'Sweep',
  transient: 'Transient',
  table: 'Table',
  figure: 'Figure',
};

export const kindLabel = (kind: string) => KIND_LABELS[kind as CellKind] ?? kind;

/** pass: within the limit with room; caution: above 90 % of it; fail: over it; none: not evaluated. */
export type Tone = 'pass' | 'caution' | 'fail' | 'none';

export interface CheckPresentation {
  outcome: 'Pass' | 'Fail' | 'Not evaluated';
  tone: Tone;
  advisory: boolean;
  utilisation?: { fraction: number; band: Tone; text: string };
}

/** Utilisation above this fraction of the limit is shown as a caution (common practice). */
export const CAUTION_UTILISATION = 0.9;

export function checkPresentation(r: CheckResult): CheckPresentation {
  const outcome = r.pass === true ? 'Pass' : r.pass === false ? 'Fail' : 'Not evaluated';
  const tone: Tone = r.pass === true ? 'pass' : r.pass === false ? 'fail' : 'none';
  const u = r.utilization;
  return {
    outcome,
    tone,
    advisory: r.severity === 'advisory',
    ...(u !== null && u !== undefined
      ? {
          utilisation: {
            fraction: Math.min(1, Math.max(0, u)),
            band: u > 1 ? 'fail' : u > CAUTION_UTILISATION ? 'caution' : 'pass',
            text: `Utilisation ${(u * 100).toFixed(1)} %${r.margin !== null && r.margin !== undefined ? `, margin ${(r.margin * 100).toFixed(1)} %` : ''}`,
          },
        }
      : {}),
  };
}
