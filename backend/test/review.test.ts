import { EntityManager } from '@mikro-orm/core';
import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { canonicalJson } from '@ampwright/common';
import { createHash } from 'node:crypto';
import { as, makeCaller, type Caller } from './support/sessions';
import { createTestApp, waitForMail } from './support/test-app';

describe('checking and revisions', () => {
  let app: INestApplication;
  let engineer: Caller;
  let checker: Caller;
  let checker2: Caller;
  let approver: Caller;
  let engineerChecker: Caller;
  let projectId: string;

  beforeAll(async () => {
    app = await createTestApp();
    engineer = await makeCaller(app, ['engineer']);
    checker = await makeCaller(app, ['checker'], engineer.firm);
    checker2 = await makeCaller(app, ['checker'], engineer.firm);
    approver = await makeCaller(app, ['approver'], engineer.firm);
    engineerChecker = await makeCaller(app, ['engineer', 'checker', 'approver'], engineer.firm);
    const res = await as(app, engineer, 'post', '/api/projects')
      .send({ jobNumber: 'R-1', title: 'Review', clientOrganisation: 'Client', site: 'Site' })
      .expect(201);
    projectId = res.body.id;
  });
  afterAll(async () => {
    await app?.close();
  });

  async function newSheet(number: string) {
    const res = await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
      .send({
        number,
        sheet: {
          format: 'ampwright.sheet/1',
          title: `Sheet ${number}`,
          cells: [
            { kind: 'calc', source: 'R = 10 ohm\nX = 5 ohm\nZ = sqrt(R^2 + X^2)' },
            { kind: 'calc', source: 'I = 100 V / Z to A' },
            { kind: 'check', condition: 'I <= 10 A' },
          ],
        },
      })
      .expect(201);
    return res.body as { id: string; cells: { id: string }[] };
  }

  it('runs the whole review: check asked, queries raised and answered, check passed, approved, issued as A', async () => {
    const sheet = await newSheet('C-1');
    const [c1, c2] = sheet.cells.map((c) => c.id);

    // The checker and the approver cannot be the preparer.
    const self = await as(app, engineer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: engineer.user.id }).expect(400);
    expect(self.body.message).toMatch(/prepared or edited this revision, so cannot check it/);
    const notChecker = await as(app, engineer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: approver.user.id }).expect(400);
    expect(notChecker.body.details[0].field).toBe('checkerId');

    const asked = await as(app, engineer, 'post', `/api/sheets/${sheet.id}/request-check`)
      .send({ checkerId: checker.user.id, approverId: approver.user.id })
      .expect(200);
    expect(asked.body).toMatchObject({ state: 'with-checker', checker: { id: checker.user.id }, approver: { id: approver.user.id }, revisionCode: 'A' });
    const mail = await waitForMail(checker.user.email, (m) => m.subject.startsWith('Check requested'));
    expect(mail.text).toContain(engineer.firm.name);

    // Someone else's check is not theirs to pass or query.
    const other = await as(app, checker2, 'post', `/api/sheets/${sheet.id}/pass`).expect(403);
    expect(other.body.message).toMatch(/Only the sheet's assigned checker/);
    await as(app, checker2, 'post', `/api/sheets/${sheet.id}/queries`).send({ cellId: c1, text: 'x' }).expect(403);

    const q1 = (await as(app, checker, 'post', `/api/sheets/${sheet.id}/queries`).send({ cellId: c1, line: 2, text: 'Where does X come from?' }).expect(201))
      .body;
    const q2 = (await as(app, checker, 'post', `/api/sheets/${sheet.id}/queries`).send({ cellId: c2, text: 'Is 100 V the right source?' }).expect(201)).body;
    expect(q1).toMatchObject({ status: 'open', line: 2, cellId: c1, revisionNumber: 1 });
    const badLine = await as(app, checker, 'post', `/api/sheets/${sheet.id}/queries`).send({ cellId: c1, line: 9, text: 'x' }).expect(400);
    expect(badLine.body.message).toMatch(/has 3 lines; there is no line 9/);
    await waitForMail(engineer.user.email, (m) => m.subject.startsWith('Query raised'));
    expect((await as(app, engineer, 'get', `/api/sheets/${sheet.id}`)).body.openQueries).toBe(2);
    const projects = (await as(app, engineer, 'get', '/api/projects')).body as { id: string; openQueries: number }[];
    expect(projects.find((p) => p.id === projectId)!.openQueries).toBe(2);

    // The check cannot pass with open queries.
    const blocked = await as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`).expect(409);
    expect(blocked.body.message).toBe('The check cannot pass while 2 queries are not closed.');

    // The checker agrees a cell; the preparer's edit withdraws the agreement and marks the cell.
    await as(app, checker, 'put', `/api/sheets/${sheet.id}/cells/${c1}/agreement`).expect(204);
    expect((await as(app, engineer, 'get', `/api/sheets/${sheet.id}`)).body.cells[0].agreedBy).toBe('Test person');
    const answered = await as(app, engineer, 'post', `/api/queries/${q1.id}/replies`).send({ text: 'From the cable datasheet; now noted.' }).expect(201);
    expect(answered.body.status).toBe('answered');
    const v = (await as(app, engineer, 'get', `/api/sheets/${sheet.id}`)).body.version;
    await as(app, engineer, 'patch', `/api/sheets/${sheet.id}/cells/${c1}`)
      .send({ version: v, cell: { kind: 'calc', source: 'R = 10 ohm\nX = 5 ohm   # cable datasheet\nZ = sqrt(R^2 + X^2)' } })
      .expect(200);
    const afterEdit = (await as(app, checker, 'get', `/api/sheets/${sheet.id}`)).body;
    expect(afterEdit.cells[0]).toMatchObject({ agreedBy: null, changedAfterAgreement: true });

    // The checker may not edit the sheet they check, even holding the engineer role elsewhere.
    await as(app, engineer, 'post', `/api/queries/${q2.id}/replies`).send({ text: 'Yes: 100 V is the test source.' }).expect(201);
    await as(app, checker, 'post', `/api/queries/${q1.id}/close`).send({ note: 'Agreed.' }).expect(200);
    await as(app, checker, 'post', `/api/queries/${q2.id}/close`).send({}).expect(200);
    const closedReply = await as(app, engineer, 'post', `/api/queries/${q2.id}/replies`).send({ text: 'more' }).expect(409);
    expect(closedReply.body.message).toMatch(/closed/);

    // Issuing an unchecked sheet is out of turn.
    const early = await as(app, approver, 'post', `/api/sheets/${sheet.id}/issue`).expect(409);
    expect(early.body.message).toMatch(/You cannot issue a revision: the sheet is with the checker/);

    await as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`).expect(200);
    await waitForMail(engineer.user.email, (m) => m.subject.startsWith('Check passed'));
    await as(app, approver, 'post', `/api/sheets/${sheet.id}/approve`).expect(200);
    // From approval on the sheet is read-only.
    const ro = await as(app, engineer, 'patch', `/api/sheets/${sheet.id}/cells/${c1}`)
      .send({ version: 99, cell: { kind: 'calc', source: 'R = 1 ohm' } })
      .expect(409);
    expect(ro.body.message).toMatch(/approved and can no longer be edited/);

    const issued = (await as(app, approver, 'post', `/api/sheets/${sheet.id}/issue`).expect(200)).body;
    expect(issued).toMatchObject({ code: 'A', number: 1, preparedBy: 'Test person', checkedBy: 'Test person', approvedBy: 'Test person' });
    await waitForMail(approver.user.email, (m) => m.subject === 'Issued: C-1 revision A');

    // The snapshot: the sheet file, results, engine version, the query register; its hash is of its canonical JSON.
    const full = (await as(app, checker, 'get', `/api/revisions/${issued.id}`).expect(200)).body;
    expect(full.snapshot.sheet.cells).toHaveLength(3);
    expect(full.snapshot.results[0].values.Z.si).toBeCloseTo(Math.sqrt(125), 10);
    expect(full.snapshot.queries.map((q: { status: string }) => q.status)).toEqual(['closed', 'closed']);
    expect(full.snapshot.queries[0].messages.map((m: { text: string }) => m.text)).toEqual([
      'Where does X come from?',
      'From the cable datasheet; now noted.',
      'Agreed.',
    ]);
    expect(createHash('sha256').update(canonicalJson(full.snapshot)).digest('hex')).toBe(issued.snapshotSha256);

    // The history lists every state change and query with who and when.
    const history = (await as(app, engineer, 'get', `/api/sheets/${sheet.id}/history`).expect(200)).body as { type: string }[];
    expect(history.map((h) => h.type)).toEqual([
      'check-requested',
      'query-raised',
      'query-raised',
      'cell-agreed',
      'query-replied',
      'agreement-withdrawn',
      'query-replied',
      'query-closed',
      'query-closed',
      'check-passed',
      'sheet-approved',
      'revision-issued',
    ]);

    // In-app notifications went to the people concerned.
    const notes = (await as(app, engineer, 'get', '/api/notifications').expect(200)).body as { kind: string }[];
    expect(notes.map((n) => n.kind)).toEqual(expect.arrayContaining(['query-raised', 'check-passed', 'sheet-approved', 'revision-issued']));

    // The next revision starts as a draft of A; one input changed; the diff shows it and every result that follows.
    const draft = (await as(app, engineer, 'post', `/api/sheets/${sheet.id}/new-revision`).expect(200)).body;
    expect(draft).toMatchObject({ state: 'being-prepared', revisionCode: 'B', openQueries: 0 });
    expect(draft.cells.map((c: { id: string }) => c.id)).toEqual(sheet.cells.map((c) => c.id));
    await as(app, engineer, 'patch', `/api/sheets/${sheet.id}/cells/${c1}`)
      .send({ version: draft.version, cell: { kind: 'calc', source: 'R = 20 ohm\nX = 5 ohm   # cable datasheet\nZ = sqrt(R^2 + X^2)' } })
      .expect(200);
    const diff = (await as(app, engineer, 'get', `/api/sheets/${sheet.id}/diff?from=${issued.id}&to=draft`).expect(200)).body;
    expect(diff.from).toBe('A');
    expect(diff.cells.map((c: { status: string }) => c.status)).toEqual(['changed', 'changed', 'changed']);
    expect(diff.cells[0].results.map((r: { name: string }) => r.name).sort()).toEqual(['R', 'Z']);
    expect(diff.cells[1].inputs).toEqual([]);
    expect(diff.cells[1].results.map((r: { name: string }) => r.name)).toEqual(['I']);
    await as(app, engineer, 'get', `/api/sheets/${sheet.id}/diff?from=../etc&to=draft`).expect(400);
  });

  it('keeps an issued revision immutable: the database refuses an update or a delete', async () => {
    const sheet = await newSheet('C-2');
    await as(app, engineer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(200);
    await as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`).expect(200);
    await as(app, approver, 'post', `/api/sheets/${sheet.id}/approve`).expect(200);
    const issued = (await as(app, approver, 'post', `/api/sheets/${sheet.id}/issue`).expect(200)).body;
    const conn = app.get(EntityManager).getConnection();
    await expect(conn.execute('update revision set snapshot_sha256 = ? where id = ?', ['0'.repeat(64), issued.id])).rejects.toThrow(/immutable/);
    await expect(conn.execute('update revision set snapshot = ? where id = ?', ['{}', issued.id])).rejects.toThrow(/immutable/);
    await expect(conn.execute('delete from revision where id = ?', [issued.id])).rejects.toThrow(/cannot be deleted/);
    // The package hash may be set once, never changed.
    await conn.execute('update revision set pdf_sha256 = ? where id = ?', ['a'.repeat(64), issued.id]);
    await expect(conn.execute('update revision set pdf_sha256 = ? where id = ?', ['b'.repeat(64), issued.id])).rejects.toThrow(/immutable/);
    const again = (await as(app, engineer, 'get', `/api/revisions/${issued.id}`).expect(200)).body;
    expect(again.snapshotSha256).toBe(issued.snapshotSha256);
    // A sheet with an issued revision cannot be deleted.
    await as(app, engineer, 'post', `/api/sheets/${sheet.id}/new-revision`).expect(200);
    const del = await as(app, engineer, 'delete', `/api/sheets/${sheet.id}`).expect(409);
    expect(del.body.message).toMatch(/issued revisions/);
  });

  it("refuses out-of-turn actions with the reason, and the sheet's checker editing it", async () => {
    const sheet = await newSheet('C-3');
    const notYet = await as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`).expect(409);
    expect(notYet.body.message).toMatch(/the sheet is being prepared/);
    await as(app, approver, 'post', `/api/sheets/${sheet.id}/approve`).expect(409);
    const notPreparer = await as(app, engineerChecker, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(403);
    expect(notPreparer.body.message).toMatch(/Only the sheet's preparer/);
    await as(app, engineer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: engineerChecker.user.id }).expect(200);
    const v = (await as(app, engineer, 'get', `/api/sheets/${sheet.id}`)).body.version;
    const edit = await as(app, engineerChecker, 'patch', `/api/sheets/${sheet.id}/cells/${sheet.cells[0].id}`)
      .send({ version: v, cell: { kind: 'calc', source: 'R = 1 ohm' } })
      .expect(403);
    expect(edit.body.message).toMatch(/checker or approver, so you do not edit it/);
    // The preparer may still edit while the sheet is with the checker.
    await as(app, engineer, 'patch', `/api/sheets/${sheet.id}/cells/${sheet.cells[0].id}`)
      .send({ version: v, cell: { kind: 'calc', source: 'R = 11 ohm\nX = 5 ohm\nZ = sqrt(R^2 + X^2)' } })
      .expect(200);
  });

  it('lets exactly one of two simultaneous moves of a sheet happen, leaving a consistent state', async () => {
    for (let round = 0; round < 3; round++) {
      const sheet = await newSheet(`C-4${round}`);
      await as(app, engineer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(200);
      const [pass, back] = await Promise.all([
        as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`),
        as(app, checker, 'post', `/api/sheets/${sheet.id}/return`).send({}),
      ]);
      expect([pass.status, back.status].sort()).toEqual([200, 409]);
      const state = (await as(app, engineer, 'get', `/api/sheets/${sheet.id}`)).body.state;
      expect(state).toBe(pass.status === 200 ? 'checked' : 'being-prepared');
      const history = (await as(app, engineer, 'get', `/api/sheets/${sheet.id}/history`)).body as { type: string }[];
      expect(history.map((h) => h.type)).toEqual(['check-requested', pass.status === 200 ? 'check-passed' : 'sheet-returned']);
    }
  });

  it('shows another firm nothing of the review', async () => {
    const outsider = await makeCaller(app, ['owner', 'engineer', 'checker', 'approver']);
    const sheet = await newSheet('C-5');
    await as(app, outsider, 'get', `/api/sheets/${sheet.id}/queries`).expect(404);
    await as(app, outsider, 'get', `/api/sheets/${sheet.id}/revisions`).expect(404);
    await as(app, outsider, 'get', `/api/sheets/${sheet.id}/history`).expect(404);
    await as(app, outsider, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(404);
  });

  it('seeds the demo with sheet C-106 issued as revision A through the real review, its hash verifying', async () => {
    const conn = app.get(EntityManager).getConnection();
    const rows = await conn.execute<{ code: string; snapshot: string; snapshot_sha256: string }[]>(
      "select r.code, r.snapshot, r.snapshot_sha256 from revision r join sheet s on s.id = r.sheet_id join project p on p.id = s.project_id where p.job_number = 'NE-2417' and s.number = 'C-106'",
    );
    expect(rows.map((r: { code: string }) => r.code)).toEqual(['A']);
    const snapshot = typeof rows[0].snapshot === 'string' ? JSON.parse(rows[0].snapshot) : rows[0].snapshot;
    expect(createHash('sha256').update(canonicalJson(snapshot)).digest('hex')).toBe(rows[0].snapshot_sha256);
    expect(snapshot.people).toEqual({ preparedBy: expect.any(String), checkedBy: 'Priya Okonkwo', approvedBy: 'Hal Vermeulen' });
  });
});
