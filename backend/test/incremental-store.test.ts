/**
 * A save writes only the results of the cells its evaluation process evaluated afresh when the process
 * held the evaluation of the sheet as stored. A save that loses to another (409) was evaluated all the
 * same, and its process keeps that evaluation: the next save must not take it for the stored sheet's,
 * or the cells it did not evaluate again would keep results of a sheet that was never stored. A one-cell
 * edit is sent to that process as the cell alone, and only when it keeps the stored sheet's evaluation.
 */
import { EntityManager } from '@mikro-orm/core';
import type { INestApplication } from '@nestjs/common';
import request from 'supertest';
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

  it('stores every result that differs from those of the sheet stored, after a save that lost kept its evaluation', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({
        number: 'C-111',
        sheet: {
          format: 'ampwright.sheet/1',
          title: 'Lost save',
          cells: [
            { kind: 'calc', source: 'a = 1' },
            { kind: 'calc', source: 'b = 2 * a' },
          ],
        },
      })
      .expect(201);
    const id = created.body.id;
    const cellId = created.body.cells[0].id;
    // Two saves of version 1: a slow one (a = 5) and a quick one (a = 7). The firm runs one evaluation at a
    // time, so both are evaluated — in the process that keeps the sheet's evaluation — and one write wins.
    const edit = (source: string) =>
      as(app, engineer, 'patch', `/api/sheets/${id}/cells/${cellId}`)
        .send({ version: 1, cell: { kind: 'calc', source } })
        .then((r) => r);
    const [slow, quick] = await Promise.all([edit('a = 5\nM = ones(130, 130)\nP = M * M * M * M * M * M'), edit('a = 7')]);
    expect([slow.status, quick.status].sort()).toEqual([200, 409]);
    const [won, lost] =
      slow.status === 200
        ? ['a = 5\nM = ones(130, 130)\nP = M * M * M * M * M * M', 'a = 7']
        : ['a = 7', 'a = 5\nM = ones(130, 130)\nP = M * M * M * M * M * M'];
    expect((await as(app, engineer, 'get', `/api/sheets/${id}`).expect(200)).body.cells[0].fields.source).toBe(won);
    // The next save writes the losing save's text: every cell of it matches what that process kept, yet b's
    // stored result is that of the winner's a, so b's result must be written too.
    await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${cellId}`)
      .send({ version: 2, cell: { kind: 'calc', source: lost } })
      .expect(200);
    const now = await expectStoredAsFresh(app, engineer, id);
    expect(now.cells[1].results.values.b.si).toBe(lost === 'a = 7' ? 14 : 10);
  });

  it('writes only the results that differ when the process holds the evaluation of the sheet as stored', async () => {
    const cells = Array.from({ length: 6 }, (_, k) => ({ kind: 'calc', source: k ? `v${k} = v${k - 1} + 1` : 'v0 = 1' }));
    cells.push({ kind: 'calc', source: 'w = 3' });
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({ number: 'C-112', sheet: { format: 'ampwright.sheet/1', title: 'Partial', cells } })
      .expect(201);
    const id = created.body.id;
    let version = created.body.version;
    for (const source of ['w = 4', 'w = 5']) {
      const saved = await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${created.body.cells[6].id}`)
        .send({ version, cell: { kind: 'calc', source } })
        .expect(200);
      version = saved.body.version;
      // The answer carries the cells whose results were written: the edited cell alone (no other reads w).
      expect(saved.body.changed.map((c: { id: string }) => c.id)).toEqual([created.body.cells[6].id]);
    }
    // Edit the head of the chain: every cell that reads it is evaluated and written.
    const saved = await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${created.body.cells[0].id}`)
      .send({ version, cell: { kind: 'calc', source: 'v0 = 10' } })
      .expect(200);
    // The edited cell whole; the five that read it with their new results only.
    expect(saved.body.changed.map((c: { id: string }) => c.id)).toEqual([created.body.cells[0].id]);
    expect(saved.body.reevaluated.map((c: { id: string }) => c.id)).toEqual(created.body.cells.slice(1, 6).map((c: { id: string }) => c.id));
    const now = await expectStoredAsFresh(app, engineer, id);
    expect(now.cells[5].results.values.v5.si).toBe(15);
    expect(now.cells[6].results.values.w.si).toBe(5);
  });

  /** How many saves each path has stored, from the app's metrics. */
  async function saves(): Promise<{ oneCell: number; wholeSheet: number }> {
    const text = (await request(app.getHttpServer()).get('/api/metrics').expect(200)).text;
    const count = (path: string) => Number(new RegExp(`ampwright_sheet_saves_total\\{path="${path}"\\} (\\d+)`).exec(text)?.[1] ?? 0);
    return { oneCell: count('one-cell'), wholeSheet: count('whole-sheet') };
  }

  it('sends a one-cell edit as that cell alone when the process keeps the stored sheet, and the whole sheet when it does not', async () => {
    const created = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({
        number: 'C-113',
        sheet: {
          format: 'ampwright.sheet/1',
          title: 'One cell',
          cells: [
            { kind: 'calc', source: 'a = 2 V' },
            { kind: 'calc', source: 'b = a / 4 ohm' },
            { kind: 'check', condition: 'b <= 1 A', basis: 'common practice' },
          ],
        },
      })
      .expect(201);
    const id = created.body.id;
    const [a, b, check] = created.body.cells.map((c: { id: string }) => c.id);
    const before = await saves();
    // The sheet's creation left its evaluation in a process, named by the fingerprint stored with the results.
    const first = await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${a}`)
      .send({ version: 1, cell: { kind: 'calc', source: 'a = 6 V' } })
      .expect(200);
    expect(await saves()).toEqual({ ...before, oneCell: before.oneCell + 1 });
    expect(first.body.changed.map((c: { id: string }) => c.id)).toEqual([a]);
    expect(first.body.reevaluated.map((c: { id: string }) => c.id)).toEqual([b, check]);
    expect(first.body.reevaluated[1].results).toMatchObject({ kind: 'check', pass: false });
    let now = await expectStoredAsFresh(app, engineer, id);
    expect(now.cells[1].results.values.b.si).toBe(1.5);
    // A stored fingerprint no process keeps (as when another instance saved last): the whole sheet is sent,
    // and every cell's results are written.
    const em = app.get(EntityManager).fork();
    await em.getConnection().execute("update sheet set results_fingerprint = 'not-kept' where id = ?", [id]);
    const second = await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${b}`)
      .send({ version: 2, cell: { kind: 'calc', source: 'b = a / 12 ohm' } })
      .expect(200);
    expect(await saves()).toEqual({ oneCell: before.oneCell + 1, wholeSheet: before.wholeSheet + 1 });
    expect(second.body.reevaluated.map((c: { id: string }) => c.id)).toEqual([a, check]);
    now = await expectStoredAsFresh(app, engineer, id);
    expect(now.cells[2].results).toMatchObject({ kind: 'check', pass: true });
    // No stored fingerprint at all (results stored before fingerprints were): the whole sheet again, after
    // which the one-cell path serves.
    await em.getConnection().execute('update sheet set results_fingerprint = null where id = ?', [id]);
    await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${a}`)
      .send({ version: 3, cell: { kind: 'calc', source: 'a = 8 V' } })
      .expect(200);
    await as(app, engineer, 'patch', `/api/sheets/${id}/cells/${a}`)
      .send({ version: 4, cell: { kind: 'calc', source: 'a = 24 V' } })
      .expect(200);
    expect(await saves()).toEqual({ oneCell: before.oneCell + 2, wholeSheet: before.wholeSheet + 2 });
    now = await expectStoredAsFresh(app, engineer, id);
    expect(now.cells[1].results.values.b.si).toBe(2);
  });
});
