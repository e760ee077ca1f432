/**
 * Independent checking (common practice, as in PRODUCT.md's roles): the checker is neither the preparer
 * nor anyone who edited the revision; the approver is neither of those nor the checker. Edits come only
 * from the preparer and the co-preparers the preparer names, who then cannot check or approve. A save
 * cannot land on a sheet that has just left the editable states.
 */
import { EntityManager } from '@mikro-orm/core';
import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, makeCaller, type Caller } from './support/sessions';
import { createTestApp } from './support/test-app';

describe('independent checking', () => {
  let app: INestApplication;
  let preparer: Caller;
  let colleague: Caller;
  let checker: Caller;
  let checkerApprover: Caller;
  let approver: Caller;
  let projectId: string;
  let n = 0;

  beforeAll(async () => {
    app = await createTestApp();
    preparer = await makeCaller(app, ['engineer']);
    colleague = await makeCaller(app, ['engineer', 'checker', 'approver'], preparer.firm);
    checker = await makeCaller(app, ['checker'], preparer.firm);
    checkerApprover = await makeCaller(app, ['checker', 'approver'], preparer.firm);
    approver = await makeCaller(app, ['approver'], preparer.firm);
    projectId = (
      await as(app, preparer, 'post', '/api/projects').send({ jobNumber: 'I-1', title: 'Independence', clientOrganisation: 'C', site: 'S' }).expect(201)
    ).body.id;
  });
  afterAll(async () => {
    await app?.close();
  });

  const newSheet = async () =>
    (
      await as(app, preparer, 'post', `/api/projects/${projectId}/sheets`)
        .send({ number: `I-${++n}`, sheet: { format: 'ampwright.sheet/1', title: 'Branch', cells: [{ kind: 'calc', source: 'x = 1' }] } })
        .expect(201)
    ).body;
  const edit = (who: Caller, sheet: { id: string; cells: { id: string }[] }, version: number, source: string) =>
    as(app, who, 'patch', `/api/sheets/${sheet.id}/cells/${sheet.cells[0].id}`).send({ version, cell: { kind: 'calc', source } });

  it('lets only the preparer and named co-preparers edit', async () => {
    const sheet = await newSheet();
    const refused = await edit(colleague, sheet, sheet.version, 'x = 2').expect(403);
    expect(refused.body).toMatchObject({ code: 'NOT_PREPARER', message: expect.stringMatching(/^Only this sheet's preparers change it/) });
    // Only the preparer names co-preparers.
    await as(app, colleague, 'put', `/api/sheets/${sheet.id}/co-preparers`)
      .send({ userIds: [colleague.user.id] })
      .expect(403);
    const named = await as(app, preparer, 'put', `/api/sheets/${sheet.id}/co-preparers`)
      .send({ userIds: [colleague.user.id] })
      .expect(200);
    expect(named.body.coPreparers).toEqual([{ id: colleague.user.id, name: 'Test person' }]);
    await edit(colleague, sheet, named.body.version, 'x = 2').expect(200);
    // A co-preparer must be an engineer of the firm.
    const notEngineer = await as(app, preparer, 'put', `/api/sheets/${sheet.id}/co-preparers`)
      .send({ userIds: [checker.user.id] })
      .expect(400);
    expect(notEngineer.body.details[0].field).toBe('userIds');
  });

  it('refuses as checker or approver anyone who prepared or edited the revision, even after they leave the list', async () => {
    const sheet = await newSheet();
    const named = await as(app, preparer, 'put', `/api/sheets/${sheet.id}/co-preparers`)
      .send({ userIds: [colleague.user.id] })
      .expect(200);
    const saved = await edit(colleague, sheet, named.body.version, 'x = 3').expect(200);
    const asChecker = await as(app, preparer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: colleague.user.id }).expect(400);
    expect(asChecker.body).toMatchObject({ code: 'NOT_INDEPENDENT', details: [{ field: 'checkerId' }] });
    const asApprover = await as(app, preparer, 'post', `/api/sheets/${sheet.id}/request-check`)
      .send({ checkerId: checker.user.id, approverId: colleague.user.id })
      .expect(400);
    expect(asApprover.body).toMatchObject({ code: 'NOT_INDEPENDENT', details: [{ field: 'approverId' }] });
    // Taken off the list, the colleague still edited this revision.
    const cleared = await as(app, preparer, 'put', `/api/sheets/${sheet.id}/co-preparers`).send({ userIds: [] }).expect(200);
    expect(cleared.body.coPreparers).toEqual([]);
    expect(cleared.body.authorIds).toEqual(expect.arrayContaining([preparer.user.id, colleague.user.id]));
    await edit(colleague, sheet, saved.body.version, 'x = 4').expect(403);
    await as(app, preparer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: colleague.user.id }).expect(400);
    await as(app, preparer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(200);
  });

  it('refuses one person as both checker and approver, at the request and at approval', async () => {
    const sheet = await newSheet();
    const both = await as(app, preparer, 'post', `/api/sheets/${sheet.id}/request-check`)
      .send({ checkerId: checkerApprover.user.id, approverId: checkerApprover.user.id })
      .expect(400);
    expect(both.body).toMatchObject({ code: 'NOT_INDEPENDENT', message: expect.stringMatching(/cannot also approve it/) });
    await as(app, preparer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checkerApprover.user.id }).expect(200);
    await as(app, checkerApprover, 'post', `/api/sheets/${sheet.id}/pass`).expect(200);
    const self = await as(app, checkerApprover, 'post', `/api/sheets/${sheet.id}/approve`).expect(400);
    expect(self.body.code).toBe('NOT_INDEPENDENT');
    await as(app, approver, 'post', `/api/sheets/${sheet.id}/approve`).expect(200);
    const issued = await as(app, approver, 'post', `/api/sheets/${sheet.id}/issue`).expect(200);
    expect(issued.body.code).toBe('A');
  });

  it('never lets a save land on a sheet whose check has just passed', async () => {
    for (let round = 0; round < 4; round++) {
      const sheet = await newSheet();
      const asked = await as(app, preparer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(200);
      const [save, pass] = await Promise.all([
        edit(preparer, sheet, asked.body.version, `x = ${round + 10}`),
        as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`),
      ]);
      expect(pass.status).toBe(200);
      const em = app.get(EntityManager).fork();
      const [row] = await em
        .getConnection()
        .execute<{ checked_at: Date; changed_at: Date }[]>('select s.checked_at, c.changed_at from sheet s join cell c on c.sheet_id = s.id where s.id = ?', [
          sheet.id,
        ]);
      if (save.status === 200) expect(new Date(row.changed_at).getTime()).toBeLessThanOrEqual(new Date(row.checked_at).getTime());
      else expect([409]).toContain(save.status);
      const now = (await as(app, preparer, 'get', `/api/sheets/${sheet.id}`).expect(200)).body;
      expect(now.state).toBe('checked');
      await edit(preparer, sheet, now.version, 'x = 99').expect(409);
    }
  });

  it('issues only what was checked: a fresh evaluation that differs from the stored results refuses the issue and names the cells', async () => {
    const sheet = await newSheet();
    await as(app, preparer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(200);
    await as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`).expect(200);
    await as(app, approver, 'post', `/api/sheets/${sheet.id}/approve`).expect(200);
    // The stored results drift from what this engine gives (as if they had been computed by another version).
    const em = app.get(EntityManager).fork();
    const cellId = sheet.cells[0].id;
    const [row] = await em.getConnection().execute<{ results: string | object }[]>('select results from cell where id = ?', [cellId]);
    const results = typeof row.results === 'string' ? JSON.parse(row.results) : row.results;
    results.values.x.si = 2;
    await em.getConnection().execute('update cell set results = ? where id = ?', [JSON.stringify(results), cellId]);
    const refused = await as(app, approver, 'post', `/api/sheets/${sheet.id}/issue`).expect(409);
    expect(refused.body).toMatchObject({
      code: 'RESULTS_CHANGED',
      message: expect.stringMatching(/^The sheet cannot be issued: evaluated afresh, cell 1 gives results other than those the checker saw/),
      details: [{ field: 'cells[0]' }],
    });
    expect((await as(app, approver, 'get', `/api/sheets/${sheet.id}`).expect(200)).body.state).toBe('approved');
    // The way out: back to the checker, evaluated afresh; checked and approved again, it is issued.
    await as(app, checker, 'post', `/api/sheets/${sheet.id}/return-to-checker`).send({}).expect(403);
    const back = await as(app, approver, 'post', `/api/sheets/${sheet.id}/return-to-checker`).send({ note: 'Results changed since the check' }).expect(200);
    expect(back.body.state).toBe('with-checker');
    expect(back.body.cells[0].results.values.x.si).toBe(1);
    await as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`).expect(200);
    await as(app, approver, 'post', `/api/sheets/${sheet.id}/approve`).expect(200);
    expect((await as(app, approver, 'post', `/api/sheets/${sheet.id}/issue`).expect(200)).body.code).toBe('A');
  });
});
