import { describe, expect, it } from 'vitest';
import type { CheckResult } from '../cells/types';
import { CELL_KINDS } from '../sheet/sheet-format';
import { KIND_LABELS } from './kinds';
import { checkPresentation } from './presentation';

const check = (pass: boolean | null, utilization: number | null, severity: 'mandatory' | 'advisory' = 'mandatory'): CheckResult =>
  ({
    kind: 'check',
    status: 'ok',
    errors: [],
    warnings: [],
    pass,
    utilization,
    margin: utilization === null ? null : 1 - utilization,
    severity,
  }) as CheckResult;

describe('the presentation shared by the screen and the package', () => {
  it('names every cell kind', () => {
    expect(Object.keys(KIND_LABELS).sort()).toEqual([...CELL_KINDS].sort());
  });

  it('bands utilisation: pass up to 90 %, caution above, fail above 100 % (common practice)', () => {
    expect(checkPresentation(check(true, 0.9)).utilisation).toMatchObject({ band: 'pass', fraction: 0.9, text: 'Utilisation 90.0 %, margin 10.0 %' });
    expect(checkPresentation(check(true, 0.95)).utilisation?.band).toBe('caution');
    expect(checkPresentation(check(false, 1.2)).utilisation).toMatchObject({ band: 'fail', fraction: 1 });
    expect(checkPresentation(check(true, 1)).utilisation?.band).toBe('caution');
  });

  it('says pass, fail or not evaluated, and whether the check is advisory', () => {
    expect(checkPresentation(check(true, null))).toEqual({ outcome: 'Pass', tone: 'pass', advisory: false });
    expect(checkPresentation(check(false, 1.1, 'advisory'))).toMatchObject({ outcome: 'Fail', tone: 'fail', advisory: true });
    expect(checkPresentation(check(null, null))).toMatchObject({ outcome: 'Not evaluated', tone: 'none' });
  });
});
