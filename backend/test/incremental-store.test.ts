/**
 * A save writes only the results of the cells it re-evaluated when the evaluation process reused the
 * cache of the version the change was made to, and the stored results are that version's. With two
 * evaluation processes a firm runs one evaluation at a time, so the next save waits for the slow one and
 * runs in the process holding its cache: it reuses that cache although the slow save's results were never
 * stored (the next save had moved the sheet on). Then every cell's results must be written.
 */
import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { as, makeCaller, type Caller } from './support/sessions';
import { expectStoredAsFresh } from './support/stored-results';
import { createTestApp } from './support/test-app';

// Before the app's modules are imported: the configuration is read when they are.
const processes = vi.hoisted(() => {
  const before = process.env.EVALUATION_PROCESSES;
  process.env.EVALUATION_PROCESSES = '2';
  return before;
});

describe('results stored by a save that reuses the cache of a save whose results were not stored', () => {
  let app: INestApplication;
  let engineer: Caller;
  let projectId: string;

  beforeAll(async () => {
    app = await createTestApp();
    engineer = await makeCaller(app, ['engineer']);
    projectId = (
      await as(app, engineer, 'post', '/api/projects')
        .send({ jobNumber: 'J-1201', title: 'Incremental', clientOrganisation: 'Test client', site: 'Test site' })
        .expect(201)
    ).body.id;
  });
  afterAll(async () => {
    await app?.close();
    if (processes === undefined) delete process.env.EVALUATION_PROCESSES;
    else process.env.EVALUATION_PROCESSES = processes;
  });

  it("stores the results of cells a save did not re-evaluate when an earlier save's results were never stored", async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({
        number: 'C-111',
        sheet: {
          format: 'ampwright.sheet/1',
          title: 'Skipped',
          cells: [
            { kind: 'calc', source: 'a = 1' },
            { kind: 'calc', source: 'b = 2 * a' },
          ],
        },
      })
      .expect(201);
    const id = created.body.id;
    const cellId = created.body.cells[0].id;
    // The first save changes a (so b) and is slow; the second, based on it, keeps a = 5, so b is not
    // evaluated again — yet its stored result is still that of a = 1, since the first save's were not stored.
    const slow = as(app, engineer, 'patch', `/api/sheets/${id}/cells/${cellId}`)
      .send({ version: 1, cell: { kind: 'calc', source: 'a = 5\nM = ones(130, 130)\nP = M * M * M * M * M * M' } })
      .then((r) => r);
    let seen = 1;
    for (let k = 0; k < 100 && seen < 2; k++) seen = (await as(app, engineer, 'get', `/api/sheets/${id}`).expect(200)).body.version;
    await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${cellId}`)
      .send({ version: 2, cell: { kind: 'calc', source: 'a = 5' } })
      .expect(200);
    expect((await slow).status).toBe(200);
    const now = await expectStoredAsFresh(app, engineer, id);
    expect(now.cells[1].results.values.b.si).toBe(10);
  });
});
