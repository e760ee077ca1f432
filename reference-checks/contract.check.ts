/** The `npm run calc` command follows the contract of PRODUCT.md: JSON on stdout, SI values, exit codes. */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(__dirname, '..');
const calc = (file: string, env: Record<string, string> = {}) =>
  spawnSync('npm', ['run', '-s', 'calc', '--', file], { cwd: root, encoding: 'utf8', env: { ...process.env, ...env } });
const dir = mkdtempSync(join(tmpdir(), 'ampwright-calc-'));
const write = (name: string, content: unknown) => {
  const file = join(dir, name);
  writeFileSync(file, typeof content === 'string' ? content : JSON.stringify(content));
  return file;
};
const sheet = (cells: unknown[]) => ({ format: 'ampwright.sheet/1', title: 'Contract probe', cells });

describe('npm run calc', () => {
  it('prints SI values, {re, im} for complex ones, and exits 0 when all passes', () => {
    const out = calc(
      write(
        'ok.json',
        sheet([
          { kind: 'calc', source: 'Z = (3 + 4j) kohm\nI = 10 V / Z to mA\nk = 2' },
          { kind: 'check', condition: 'abs(I) <= 3 mA', basis: 'probe' },
        ]),
      ),
    );
    expect(out.status).toBe(0);
    const json = JSON.parse(out.stdout);
    expect(json.cells[0].values.Z).toEqual({ si: { re: 3000, im: 4000 }, display: '5.000 kΩ ∠ 53.1°' });
    expect(json.cells[0].values.I.si.re).toBeCloseTo(0.0012, 15);
    expect(json.cells[0].values.k).toEqual({ si: 2, display: '2.000' });
    expect(json.cells[1]).toEqual({ kind: 'check', status: 'ok', pass: true, utilization: expect.closeTo(2 / 3, 12), errors: [], warnings: [] });
  });

  it('exits 1 when a check does not pass', () => {
    const out = calc(
      write(
        'fail.json',
        sheet([
          { kind: 'calc', source: 'I = 5 A' },
          { kind: 'check', condition: 'I <= 4 A' },
        ]),
      ),
    );
    expect(out.status).toBe(1);
    expect(JSON.parse(out.stdout).cells[1].pass).toBe(false);
  });

  it('exits 1 with 1-based positions when a cell fails', () => {
    const out = calc(write('err.json', sheet([{ kind: 'calc', source: 'V = 1 V\nx = V + 2 A' }])));
    expect(out.status).toBe(1);
    expect(JSON.parse(out.stdout).cells[0].errors).toEqual([
      { line: 2, column: 7, message: 'cannot add a voltage and a current: the two sides have different dimensions' },
    ]);
  });

  it('stops a sheet at its deadline or memory cap, says why in every cell, and exits 1 (common practice: a bounded batch job)', () => {
    const runaway = 'M = ones(316, 316)\nP = M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M';
    const slow = calc(
      write(
        'slow.json',
        sheet([
          { kind: 'calc', source: runaway },
          { kind: 'note', text: 'after' },
        ]),
      ),
      { CALC_TIMEOUT_MS: '1500' },
    );
    expect(slow.status).toBe(1);
    const cells = JSON.parse(slow.stdout).cells;
    expect(cells.map((c: { kind: string }) => c.kind)).toEqual(['calc', 'note']);
    for (const c of cells) expect(c.errors[0].message).toMatch(/^Not evaluated: this sheet takes longer than CALC_TIMEOUT_MS allows \(1\.5 s\)/);
    const hog = Array.from({ length: 600 }, (_, k) => `a_${k} = ones(100000)`).join('\n');
    const big = calc(write('big.json', sheet([{ kind: 'calc', source: hog }])), { CALC_MEMORY_MB: '128' });
    expect(big.status).toBe(1);
    expect(JSON.parse(big.stdout).cells[0].errors[0].message).toMatch(/^Not evaluated: this sheet needs more memory than CALC_MEMORY_MB allows \(128 MB\)/);
  }, 30_000);

  it('exits 2 for a file that cannot be read or is not a sheet', () => {
    expect(calc(join(dir, 'missing.json')).status).toBe(2);
    expect(calc(write('junk.json', '{ not json')).status).toBe(2);
    expect(calc(write('wrong.json', { format: 'other' })).status).toBe(2);
  });
});

describe('templates', () => {
  const templates = readdirSync(join(root, 'templates')).filter((f) => f.endsWith('.json'));

  it('ships at least six templates', () => {
    expect(templates.length).toBeGreaterThanOrEqual(6);
  });

  it.each(templates)('%s evaluates through npm run calc with no error and every check passing', (file) => {
    const out = calc(join(root, 'templates', file));
    // The whole output arrives even when it is large (transients): it parses.
    const json = JSON.parse(out.stdout) as { cells: { status: string; errors: unknown[] }[] };
    for (const cell of json.cells) expect(cell.errors).toEqual([]);
    expect(out.status).toBe(0);
  });
});
