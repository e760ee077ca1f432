import { describe, expect, it } from 'vitest';
import { evaluateSheet } from '../cells/evaluate-sheet';
import type { CalcResult } from '../cells/types';

const calc = (source: string) => evaluateSheet({ cells: [{ kind: 'calc', source }] }).cells[0] as CalcResult;
const errorOf = (source: string) => {
  const errors = calc(source).errors;
  expect(errors.length, `no error for ${source}`).toBeGreaterThan(0);
  return errors.map((e) => e.message).join(' | ');
};

describe('the language allows what it lists', () => {
  it('refuses allocation bombs before they allocate, with the size in the sentence', () => {
    expect(errorOf('y = size(resize([1], [100000000]))')).toMatch(/larger than the limit of 100,000 elements/);
    expect(errorOf('y = resize(sparse([1]), [1, 100000000])')).toMatch(/sparse is not part of the sheet language/);
    expect(errorOf('y = kron(ones(1000), ones(1000))')).toMatch(/larger than the limit/);
    expect(errorOf('y = diag(ones(50000))')).toMatch(/larger than the limit/);
    expect(errorOf('y = ones(50000, 1) .* ones(1, 50000)')).toMatch(/larger than the limit/);
    expect(errorOf('y = ones(50000, 1) * ones(1, 50000)')).toMatch(/larger than the limit/);
    expect(errorOf('y = ones(50000, 1) + ones(1, 50000)')).toMatch(/larger than the limit/);
    expect(errorOf('y = range("1:1000000000")')).toMatch(/larger than the limit/);
    expect(errorOf('y = setPowerset(1:40)')).toMatch(/setPowerset is not part of the sheet language/);
    expect(errorOf('y = concat(ones(60000), ones(60000))')).toMatch(/larger than the limit/);
  });

  it('stops 25 lines of concat doubling at the limit', () => {
    const source = ['a_0 = [1, 2, 3, 4]', ...Array.from({ length: 25 }, (_, k) => `a_${k + 1} = concat(a_${k}, a_${k})`)].join('\n');
    const result = calc(source);
    expect(result.errors[0].message).toMatch(/larger than the limit/);
    expect(result.errors[0].line).toBe(16); // 4 · 2^15 = 131 072 > 100 000
    const text = ['s_0 = "abcdefgh"', ...Array.from({ length: 25 }, (_, k) => `s_${k + 1} = concat(s_${k}, s_${k})`)].join('\n');
    expect(calc(text).errors[0].message).toMatch(/longer than the limit of 100,000/);
  });

  it('keeps the sizes that engineering work needs', () => {
    const ok = calc('a = resize([1, 2], [3])\nb = diag([1, 2, 3])\nc = ones(300, 1) .* ones(1, 300)\nd = kron([1, 2], [1, 1])\nn = size(range("1:10"))');
    expect(ok.errors).toEqual([]);
    expect(ok.values.c.display).toBeTruthy();
  });

  it('refuses method and property calls, and a value cannot be changed by a later line or cell', () => {
    expect(errorOf('a = [1, 2, 3]\nn = size(a.resize([1]))')).toMatch(
      /calling a method on a value \(\.resize\(…\)\) is not part of the sheet language: use the function form, for example resize\(x, …\)/,
    );
    expect(errorOf('a = [1, 2, 3]\nn = a.size')).toMatch(/reading a property of a value/);
    expect(errorOf('x = 2 V\ny = x.value')).toMatch(/reading a property of a value/);
    const sheet = evaluateSheet({
      cells: [
        { kind: 'calc', source: 'a = [1, 2, 3]\nn = size(a.resize([1]))' },
        { kind: 'calc', source: 's = sum(a)\nr = resize(a, [1])\nt = sum(a)' },
      ],
    });
    const second = sheet.cells[1] as CalcResult;
    expect(second.values.s.si).toBe(6);
    expect(second.values.r.si).toEqual([1]);
    expect(second.values.t.si).toBe(6);
  });

  it('refuses functions, constants and operators it does not list', () => {
    expect(errorOf('y = random()')).toMatch(/random is not part of the sheet language/);
    expect(errorOf('y = map([1, 2], sqrt)')).toMatch(/map is not part of the sheet language/);
    expect(errorOf('y = bitAnd(1, 3)')).toMatch(/bitAnd is not part of the sheet language/);
    expect(errorOf('y = 1 & 3')).toMatch(/the operator & is not part of the sheet language/);
    expect(errorOf('y = 8 >> 1')).toMatch(/the operator >> is not part of the sheet language/);
    expect(errorOf('y = {a: 1}')).toMatch(/an object \{ … \} is not part of the sheet language/);
    expect(errorOf('y = version')).toMatch(/version is not part of the sheet language/);
    expect(errorOf('y = sqrt')).toMatch(/sqrt is a function: call it/);
    expect(calc('y = speedOfLight\nz = 2 pi + e + tau').errors).toEqual([]);
  });
});
