import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp } from './support/test-app';
import { as, makeCaller, type Caller } from './support/sessions';

const sheet = (cells: unknown[]) => ({ format: 'ampwright.sheet/1', title: 'Probe', cells });

describe('POST /api/evaluate', () => {
  let app: INestApplication;
  let engineer: Caller;
  const post = () => as(app, engineer, 'post', '/api/evaluate');
  beforeAll(async () => {
    app = await createTestApp();
    engineer = await makeCaller(app, ['engineer']);
  });
  afterAll(async () => {
    await app?.close();
  });

  it('evaluates a sheet and returns values, LaTeX and checks', async () => {
    const res = await post()
      .send(
        sheet([
          { kind: 'calc', source: 'V = 230 V\nR = 46 ohm\nI = V / R' },
          { kind: 'check', condition: 'I <= 10 A', basis: 'probe' },
        ]),
      )
      .expect(200);
    expect(res.body.engineVersion).toMatch(/^\d+\.\d+\.\d+$/);
    expect(res.body.cells[0]).toMatchObject({ kind: 'calc', status: 'ok', values: { I: { si: 5, display: '5.000 A' } } });
    expect(res.body.cells[0].lines[2].tex.formula).toBe('I = \\frac{V}{R}');
    expect(res.body.cells[1]).toMatchObject({ kind: 'check', pass: true, utilization: 0.5 });
  });

  it('refuses a body that is not a sheet, naming each problem', async () => {
    const res = await post().send({ format: 'x', cells: 'none' }).expect(400);
    expect(res.body.code).toBe('VALIDATION_FAILED');
    expect(res.body.details.map((d: { field: string }) => d.field)).toEqual(expect.arrayContaining(['format', 'title', 'cells']));
  });

  it('stops a runaway evaluation at its deadline and stays healthy', async () => {
    const started = Date.now();
    // Under the size limit (316² < 100 000 elements) but some 20 matrix products: far past the 2 s deadline.
    const res = await post()
      .send(sheet([{ kind: 'calc', source: 'M = ones(316, 316)\nP = M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M * M' }]))
      .expect(422);
    expect(res.body.code).toBe('EVALUATION_TIMEOUT');
    expect(Date.now() - started).toBeLessThan(5000);
    const after = await post()
      .send(sheet([{ kind: 'calc', source: 'x = 1 + 1' }]))
      .expect(200);
    expect(after.body.cells[0].values.x.si).toBe(2);
  });

  it('answers an oversized matrix with a sentence, not a crash', async () => {
    const res = await post()
      .send(sheet([{ kind: 'calc', source: 'x = zeros(100000, 100000)' }]))
      .expect(200);
    expect(res.body.cells[0].errors[0].message).toMatch(/larger than the limit/);
  });
});
