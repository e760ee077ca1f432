import { describe, expect, it } from 'vitest';
import { evaluateSheet } from './evaluate-sheet';
import type { CalcResult, CheckResult } from './types';

const calc = (...sources: string[]) => evaluateSheet({ cells: sources.map((source) => ({ kind: 'calc' as const, source })) });
const cell = (r: ReturnType<typeof calc>, i = 0) => r.cells[i] as CalcResult;

describe('calc cells', () => {
  it('evaluates definitions in order with units and shows engineering prefixes', () => {
    const r = cell(calc('V = 230 V\nR = 18.4 kohm\nI = V / R'));
    expect(r.status).toBe('ok');
    expect(r.values.I.si).toBeCloseTo(0.0125, 12);
    expect(r.values.I.display).toBe('12.50 mA');
    expect(r.values.R.display).toBe('18.40 kΩ');
  });

  it('converts to the unit asked for and keeps SI in si', () => {
    const r = cell(calc('I = 0.0125 A to uA'));
    expect(r.values.I.display).toBe('12500 µA');
    expect(r.values.I.si).toBeCloseTo(0.0125, 15);
  });

  it('shows the units of heat and current density by their usual names, and any other as one unit (not kg·/·s³)', () => {
    // 1 W/m² = 1 kg/s³ (SI Brochure, 9th ed., table 4; from memory); mathjs simplifies a product to "kg / s^3".
    const r = cell(
      calc(
        'h = 10 W / (m^2 K) * 5 K\nk = 3 W / (m K)\nP = 25 W / m^2 * 2 m\nrho = 1.2 K / W * 1 m\nJ = 300 A / (100 mm^2)\nJ_2 = J to A/mm^2\nx = 2 kg / (s^3 A^2) * 3 m',
      ),
    );
    expect([r.values.h.display, r.values.k.display, r.values.P.display, r.values.rho.display, r.values.J.display]).toEqual([
      '50.00 W/m²',
      '3.000 W/(m·K)',
      '50.00 W/m',
      '1.200 K·m/W',
      '3.000e6 A/m²',
    ]);
    expect(r.values.J.si).toBeCloseTo(3e6, 6);
    expect(r.values.J_2.display).toBe('3.000 A/mm²');
    expect(r.values.x.display).toBe('6.000 (kg·m)/(s³·A²)');
  });

  it('warns where a temperature on the °C or °F scale meets a product, quotient or power, and nowhere else', () => {
    const r = cell(
      calc(
        'T = 75 degC\nq = 5.670374419e-8 W / (m^2 K^4) * T^4\nq_K = 5.670374419e-8 W / (m^2 K^4) * (T to K)^4\nR_T = 1 ohm * (1 + 0.00393 / K * (T - 20 degC))\nT_2 = T + 10 K\nk = 2 * 100 degF',
      ),
    );
    expect(r.warnings.map((w) => w.line)).toEqual([2, 6]);
    expect(r.warnings[0].message).toMatch(/^a temperature on the °C scale counts by its number on that scale .* convert it first: \(T to K\)$/);
    expect(r.warnings[1].message).toMatch(/°F scale/);
    // A table's column of such temperatures too.
    const column = evaluateSheet({
      cells: [
        { kind: 'table', columns: [{ name: 'T_a', unit: 'degC' }], rows: [[25], [40]] },
        { kind: 'calc', source: 'p = 2 * T_a\nd = T_a - 20 degC' },
      ],
    }).cells[1] as CalcResult;
    expect(column.warnings.map((w) => w.line)).toEqual([1]);
    // σT⁴ with T in kelvin: 5.670374419e-8 × 348.15⁴ W/m² (CODATA 2018 Stefan–Boltzmann constant).
    expect(r.values.q_K.si).toBeCloseTo(5.670374419e-8 * 348.15 ** 4, 9);
  });

  it('takes the comment as the line description', () => {
    const r = cell(calc('f = 50 Hz # supply frequency'));
    expect(r.lines[0].description).toBe('supply frequency');
  });

  it('uses the sheet significant digits', () => {
    const r = evaluateSheet({ settings: { significantDigits: 6 }, cells: [{ kind: 'calc', source: 'x = 2 / 3 V' }] });
    expect((r.cells[0] as CalcResult).values.x.display).toBe('666.667 mV');
  });

  it('reads i and j as the imaginary unit and shows complex values in polar and rectangular form', () => {
    const r = cell(calc('Z1 = (3 + 4j) ohm\nZ2 = (3 + 4i) ohm'));
    expect(r.values.Z1.si).toEqual({ re: 3, im: 4 });
    expect(r.values.Z2.si).toEqual({ re: 3, im: 4 });
    expect(r.values.Z1.display).toBe('5.000 Ω ∠ 53.1°');
    expect(r.values.Z1.displayAlt).toBe('(3.000 + j4.000) Ω');
  });

  it('lets the sheet put the rectangular form first', () => {
    const r = evaluateSheet({ settings: { complexForm: 'rectangular' }, cells: [{ kind: 'calc', source: 'Z = (3 - 4j) ohm' }] });
    expect((r.cells[0] as CalcResult).values.Z.display).toBe('(3.000 − j4.000) Ω');
  });

  it('supports phasors, conj, abs, arg, re and im on quantities with units', () => {
    const r = cell(calc('V = phasor(230 V, -30 deg)\nVc = conj(V)\nm = abs(V)\na = arg(V) to deg\nx = re(V)\ny = im(V)'));
    expect(r.status).toBe('ok');
    expect(r.values.m.si).toBeCloseTo(230, 10);
    expect(r.values.a.si).toBeCloseTo((-30 * Math.PI) / 180, 12);
    expect(r.values.x.si).toBeCloseTo(230 * Math.cos(Math.PI / 6), 10);
    expect(r.values.y.si).toBeCloseTo(-115, 10);
    expect(r.values.Vc.si).toMatchObject({ im: expect.closeTo(115, 10) });
  });

  it('converts between rms and peak values', () => {
    const r = cell(calc('V_pk = peak(230 V)\nV_rms = rms(V_pk)'));
    expect(r.values.V_pk.si).toBeCloseTo(230 * Math.SQRT2, 10);
    expect(r.values.V_rms.si).toBeCloseTo(230, 10);
  });

  it('treats var and VA as real units of power', () => {
    const r = cell(calc('Q = 50 kvar\nS = 62.5 kVA\nQ_W = Q to W'));
    expect(r.values.Q.si).toBe(50000);
    expect(r.values.Q.display).toBe('50.00 kvar');
    expect(r.values.Q_W.si).toBe(50000);
  });

  it('lets a unit name be a variable once defined, and typesets it as a variable', () => {
    const r = cell(calc('L = 40 mH\nC = 180 uF\nw0 = 1 / sqrt(L C)'));
    expect(r.values.w0.si).toBeCloseTo(1 / Math.sqrt(0.04 * 180e-6), 8);
    expect(r.values.w0.display).toMatch(/rad\/s$/);
    expect(r.lines[2].tex?.formula).toContain('L');
    expect(r.lines[2].tex?.formula).not.toContain('\\mathrm{L}');
  });

  it('accepts µ and u for micro', () => {
    const r = cell(calc('C1 = 180 µF\nC2 = 180 uF'));
    expect(r.values.C1.si).toBe(r.values.C2.si);
  });

  it('reports a dimension mismatch at the operator, with line and column', () => {
    const r = cell(calc('V = 230 V\nI = 10 A\nx = V + I'));
    expect(r.status).toBe('error');
    expect(r.errors).toEqual([{ line: 3, column: 7, message: 'cannot add a voltage and a current: the two sides have different dimensions' }]);
  });

  it('reports a syntax error with its column', () => {
    const r = cell(calc('x = (3 + 4'));
    expect(r.errors[0]).toMatchObject({ line: 1 });
    expect(r.errors[0].message).toMatch(/parenthesis|ends too early/);
  });

  it('says where a name used too early is defined', () => {
    const r = calc('P = V_s * I_s', 'V_s = 400 V\nI_s = 10 A');
    expect(cell(r).errors[0]).toEqual({
      line: 1,
      column: 5,
      message: 'V_s is used before it is defined: it is defined at cell 2, line 1; move this line below it',
    });
  });

  it('reads a unit name as the unit until the variable is defined, and warns', () => {
    const r = calc('q = 5 C', 'C = 180 uF');
    expect(cell(r).values.q.display).toBe('5.000 C');
    expect(cell(r).warnings[0].message).toMatch(/C here means the unit C; the variable C is only defined later, at cell 2, line 1/);
  });

  it('names an unknown name', () => {
    const r = cell(calc('x = 2 * Rq'));
    expect(r.errors[0]).toMatchObject({ line: 1, column: 9, message: expect.stringMatching(/unknown name Rq/) });
  });

  it('warns on a second definition and uses the new value below', () => {
    const r = calc('R = 10 ohm\nR = 12 ohm', 'x = R');
    expect(cell(r).warnings[0]).toMatchObject({ line: 2, message: expect.stringMatching(/R was defined before \(cell 1, line 1\)/) });
    expect(cell(r, 1).values.x.si).toBe(12);
  });

  it('says so when a name has no value because its line failed', () => {
    const r = calc('x = 1 V + 1 A', 'y = x * 2');
    expect(cell(r, 1).errors[0].message).toMatch(/x has no value because its definition failed \(cell 1, line 1\)/);
  });

  it('refuses lines that are not definitions', () => {
    const r = cell(calc('3 + 4'));
    expect(r.errors[0].message).toMatch(/name = expression/);
  });

  it('gives formula, working and result as LaTeX', () => {
    const r = cell(calc('R = 12 ohm\nX_L = 5 ohm\nZ = sqrt(R^2 + X_L^2)'));
    const tex = r.lines[2].tex!;
    expect(tex.formula).toContain('X_{L}');
    expect(tex.formula).toContain('\\sqrt');
    expect(tex.working).toContain('12.00\\,\\mathrm{\\Omega');
    expect(tex.result).toBe('Z = 13.00\\,\\mathrm{\\Omega}');
  });

  it('shows an angular frequency in rad/s', () => {
    const r = cell(calc('f = 50 Hz\nw = 2 pi f'));
    expect(r.values.w.display).toBe('314.2 rad/s');
    expect(r.values.f.display).toBe('50.00 Hz');
  });

  it('adds an inductive reactance from rad/s to a resistance (the radian is 1)', () => {
    const r = cell(calc('R = 12 ohm\nw = 314.159 rad/s\nZ = R + j w 40 mH'));
    expect(r.status).toBe('ok');
    expect(r.values.Z.si).toMatchObject({ re: 12, im: expect.closeTo(12.566, 3) });
  });
});

describe('safety of expressions', () => {
  it.each(['x = import({})', 'x = evaluate("1+1")', 'x = createUnit("foo")', 'x = parse("1")', 'x = simplify("x")', 'x = config({})', 'x = typed("f", {})'])(
    'refuses %s',
    (source) => {
      const r = cell(calc(source));
      expect(r.status).toBe('error');
      expect(r.errors[0].message).toMatch(/not available in a sheet|unknown/);
    },
  );

  it('refuses a matrix larger than the size limit with a sentence', () => {
    const r = cell(calc('x = zeros(100000, 100000)'));
    expect(r.errors[0].message).toMatch(/larger than the limit/);
  });

  it('refuses function definitions', () => {
    const r = cell(calc('f(x) = x^2'));
    expect(r.errors[0].message).toMatch(/defining functions/);
  });
});

describe('check cells', () => {
  const check = (source: string, condition: string) =>
    evaluateSheet({
      cells: [
        { kind: 'calc', source },
        { kind: 'check', condition, basis: 'test' },
      ],
    }).cells[1] as CheckResult;

  it('passes a <= check with utilisation actual / limit', () => {
    const r = check('I = 27 A\nI_rated = 25 A', 'I <= 1.35 * I_rated');
    expect(r).toMatchObject({ status: 'ok', pass: true, utilization: expect.closeTo(0.8, 12) });
    expect(r.margin).toBeCloseTo(0.2, 12);
  });

  it('fails a >= check with utilisation limit / actual', () => {
    const r = check('pf = 0.85', 'pf >= 0.95');
    expect(r.pass).toBe(false);
    expect(r.utilization).toBeCloseTo(0.95 / 0.85, 12);
  });

  it('accepts a true/false condition without utilisation', () => {
    const r = check('a = 2', 'a > 1 and a < 3');
    expect(r).toMatchObject({ pass: true, utilization: null });
  });

  it('refuses a comparison of different dimensions, at the operator', () => {
    const r = check('V = 400 V\nI = 10 A', 'V <= I');
    expect(r.status).toBe('error');
    expect(r.errors[0]).toMatchObject({ column: 3, message: expect.stringMatching(/cannot compare a voltage and a current/) });
  });
});
