/**
 * Firms are sealed from each other. Firm A builds one of everything — project, sheet, cells, an
 * attachment, a template, a query, an issued revision with its package, notifications, members —
 * then a member of firm B holding every role (and a client of B) calls every route of the API that
 * names an id (support/routes.ts) with A's ids, and the routes that take ids in their body too. Each
 * answer is 404, says nothing of A's work, and afterwards A's work is exactly as it was.
 */
import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, makeCaller, type Caller } from './support/sessions';
import { MATRIX } from './support/routes';
import { createTestApp } from './support/test-app';

// The smallest well-formed PNG, by its published signature (ISO/IEC 15948, PNG file signature and IHDR).
const PNG = Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.from('0000000d49484452000000010000000108060000001f15c489', 'hex')]);
const SECRET = 'Kestrel-secret-feeder';

describe('another firm\'s ids', () => {
  let app: INestApplication;
  let aEngineer: Caller;
  let aChecker: Caller;
  let aApprover: Caller;
  let bAll: Caller;
  let bClient: Caller;
  const ids: Record<string, string> = {};
  let snapshot: () => Promise<unknown>;

  beforeAll(async () => {
    app = await createTestApp();
    aEngineer = await makeCaller(app, ['owner', 'engineer']);
    aChecker = await makeCaller(app, ['checker'], aEngineer.firm);
    aApprover = await makeCaller(app, ['approver'], aEngineer.firm);
    bAll = await makeCaller(app, ['owner', 'engineer', 'checker', 'approver']);
    bClient = await makeCaller(app, ['client'], bAll.firm);

    const project = (await as(app, aEngineer, 'post', '/api/projects').send({ jobNumber: 'X-1', title: `${SECRET} project`, clientOrganisation: 'A client', site: 'A site' }).expect(201)).body;
    const issued = (await as(app, aEngineer, 'post', `/api/projects/${project.id}/sheets`).send({ number: 'C-1', sheet: { format: 'ampwright.sheet/1', title: `${SECRET} sheet`, cells: [{ kind: 'calc', source: `R = 10 ohm # ${SECRET}` }, { kind: 'check', condition: 'R <= 20 ohm' }] } }).expect(201)).body;
    await as(app, aEngineer, 'post', `/api/sheets/${issued.id}/request-check`).send({ checkerId: aChecker.user.id, approverId: aApprover.user.id }).expect(200);
    const query = (await as(app, aChecker, 'post', `/api/sheets/${issued.id}/queries`).send({ cellId: issued.cells[0].id, text: `${SECRET} query` }).expect(201)).body;
    await as(app, aChecker, 'post', `/api/queries/${query.id}/close`).send({}).expect(200);
    await as(app, aChecker, 'post', `/api/sheets/${issued.id}/pass`).expect(200);
    await as(app, aApprover, 'post', `/api/sheets/${issued.id}/approve`).expect(200);
    const revision = (await as(app, aApprover, 'post', `/api/sheets/${issued.id}/issue`).expect(200)).body;
    // A second sheet, still being prepared, with an open query and an attachment.
    const sheet = (await as(app, aEngineer, 'post', `/api/projects/${project.id}/sheets`).send({ number: 'C-2', sheet: { format: 'ampwright.sheet/1', title: `${SECRET} draft`, cells: [{ kind: 'calc', source: `x = 1 # ${SECRET}` }, { kind: 'calc', source: 'y = 2' }] } }).expect(201)).body;
    await as(app, aEngineer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: aChecker.user.id }).expect(200);
    const openQuery = (await as(app, aChecker, 'post', `/api/sheets/${sheet.id}/queries`).send({ cellId: sheet.cells[0].id, text: `${SECRET} open query` }).expect(201)).body;
    const attachment = (await as(app, aEngineer, 'post', `/api/sheets/${sheet.id}/attachments`).attach('file', PNG, 'feeder.png').expect(201)).body;
    const template = (await as(app, aEngineer, 'post', '/api/templates').send({ sheetId: sheet.id, title: `${SECRET} template` }).expect(201)).body;
    const notification = (await as(app, aEngineer, 'get', '/api/notifications').expect(200)).body[0];
    const member = ((await as(app, aEngineer, 'get', '/api/members').expect(200)).body as { id: string; user: { email: string } }[]).find((m) => m.user.email === aChecker.user.email)!;
    Object.assign(ids, { project: project.id, sheet: sheet.id, issuedSheet: issued.id, cell: sheet.cells[0].id, query: openQuery.id, revision: revision.id, attachment: attachment.id, template: template.id, notification: notification.id, member: member.id });

    // What A sees of its own work, to compare after B's attempts.
    snapshot = async () => ({
      project: (await as(app, aEngineer, 'get', `/api/projects/${project.id}`).expect(200)).body,
      people: (await as(app, aEngineer, 'get', `/api/projects/${project.id}/people`).expect(200)).body,
      sheets: (await as(app, aEngineer, 'get', `/api/projects/${project.id}/sheets`).expect(200)).body,
      sheet: (await as(app, aEngineer, 'get', `/api/sheets/${sheet.id}`).expect(200)).body,
      issued: (await as(app, aEngineer, 'get', `/api/sheets/${issued.id}`).expect(200)).body,
      queries: (await as(app, aEngineer, 'get', `/api/sheets/${sheet.id}/queries`).expect(200)).body,
      attachments: (await as(app, aEngineer, 'get', `/api/sheets/${sheet.id}/attachments`).expect(200)).body,
      templates: (await as(app, aEngineer, 'get', '/api/templates').expect(200)).body,
      revision: (await as(app, aEngineer, 'get', `/api/revisions/${revision.id}`).expect(200)).body,
      members: (await as(app, aEngineer, 'get', '/api/members').expect(200)).body,
      notifications: (await as(app, aEngineer, 'get', '/api/notifications').expect(200)).body,
    });
  }, 60_000);
  afterAll(async () => {
    await app?.close();
  });

  /** A's id for each path parameter, by the resource the path names. */
  function fill(path: string): string {
    return path
      .replace(/^\/api\/projects\/:(id|projectId)/, `/api/projects/${ids.project}`)
      .replace('/api/sheets/:id', `/api/sheets/${path.includes('new-revision') || path.includes('revisions') || path.includes('diff') ? ids.issuedSheet : ids.sheet}`)
      .replace(':cellId', ids.cell)
      .replace('/api/queries/:id', `/api/queries/${ids.query}`)
      .replace('/api/revisions/:id', `/api/revisions/${ids.revision}`)
      .replace('/api/attachments/:id', `/api/attachments/${ids.attachment}`)
      .replace('/api/templates/:id', `/api/templates/${ids.template}`)
      .replace('/api/notifications/:id', `/api/notifications/${ids.notification}`)
      .replace('/api/members/:id', `/api/members/${ids.member}`);
  }

  /** A valid body for each route that takes one, so the answer is about the id, not the body. */
  const BODIES: Record<string, () => object> = {
    'PATCH /api/members/:id': () => ({ roles: ['engineer'] }),
    'PATCH /api/projects/:id': () => ({ title: 'Taken over' }),
    'PUT /api/projects/:id/members': () => ({ userIds: [bAll.user.id] }),
    'POST /api/projects/:projectId/sheets': () => ({ number: 'B-1', title: 'Intruder' }),
    'PATCH /api/sheets/:id': () => ({ version: 1, title: 'Taken over' }),
    'POST /api/sheets/:id/cells': () => ({ version: 1, position: 0, cell: { kind: 'calc', source: 'x = 666' } }),
    'PATCH /api/sheets/:id/cells/:cellId': () => ({ version: 1, cell: { kind: 'calc', source: 'x = 666' } }),
    'POST /api/sheets/:id/cells/:cellId/move': () => ({ version: 1, position: 1 }),
    'POST /api/sheets/:id/request-check': () => ({ checkerId: bAll.user.id }),
    'POST /api/sheets/:id/return': () => ({ note: 'Taken over' }),
    'POST /api/sheets/:id/queries': () => ({ cellId: ids.cell, text: 'Taken over' }),
    'POST /api/queries/:id/replies': () => ({ text: 'Taken over' }),
    'POST /api/queries/:id/close': () => ({ note: 'Taken over' }),
  };
  const QUERIES: Record<string, () => string> = {
    'DELETE /api/sheets/:id/cells/:cellId': () => '?version=1',
    'GET /api/sheets/:id/diff': () => `?from=${ids.revision}&to=draft`,
  };

  const routes = Object.keys(MATRIX).filter((r) => r.includes(':'));

  it('has a route of every kind of resource to try', () => {
    expect(routes.length).toBeGreaterThanOrEqual(40);
  });

  it.each(routes)('%s with firm A\'s ids: 404 to firm B, and nothing of A in the answer', async (route) => {
    const [method, path] = route.split(' ');
    const url = fill(path) + (QUERIES[route]?.() ?? '');
    expect(url, 'every parameter is filled').not.toMatch(/:\w+/);
    let req = as(app, bAll, method.toLowerCase() as 'get', url);
    if (route.endsWith('/import-csv')) req = req.field('version', '1').field('position', '0').attach('file', Buffer.from('h, I_h [A]\n1, 10\n'), 'harmonics.csv');
    else if (route.endsWith('/attachments') && method === 'POST') req = req.attach('file', PNG, 'intruder.png');
    else if (BODIES[route]) req = req.send(BODIES[route]());
    const res = await req;
    expect(res.status, `${route}: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`).toBe(404);
    expect(res.body.code).toBe('NOT_FOUND');
    expect(JSON.stringify(res.body)).not.toContain(SECRET);
    if (method === 'GET' && route.includes('/package')) {
      // A client of firm B may read packages, but not those of A's revisions.
      const client = await as(app, bClient, 'get', url);
      expect(client.status).toBe(404);
      expect(JSON.stringify(client.body)).not.toContain(SECRET);
    }
  });

  it('refuses A\'s ids inside firm B\'s own requests', async () => {
    const bProject = (await as(app, bAll, 'post', '/api/projects').send({ jobNumber: 'B-1', title: 'B project', clientOrganisation: 'B client', site: 'B site' }).expect(201)).body;
    const bSheet = (await as(app, bAll, 'post', `/api/projects/${bProject.id}/sheets`).send({ number: 'B-1', title: 'B sheet' }).expect(201)).body;
    const template = await as(app, bAll, 'post', '/api/templates').send({ sheetId: ids.sheet, title: 'Copied' }).expect(404);
    expect(JSON.stringify(template.body)).not.toContain(SECRET);
    await as(app, bAll, 'post', `/api/projects/${bProject.id}/sheets`).send({ number: 'B-2', templateId: ids.template }).expect(404);
    await as(app, bAll, 'get', `/api/sheets/${bSheet.id}/diff?from=${ids.revision}&to=draft`).expect(404);
    await as(app, bAll, 'patch', `/api/sheets/${bSheet.id}/cells/${ids.cell}`).send({ version: bSheet.version, cell: { kind: 'calc', source: 'x = 1' } }).expect(404);
    const team = await as(app, bAll, 'put', `/api/projects/${bProject.id}/members`).send({ userIds: [aEngineer.user.id] }).expect(400);
    expect(team.body.message).toMatch(/not a member of the firm/);
    const check = await as(app, bAll, 'post', `/api/sheets/${bSheet.id}/request-check`).send({ checkerId: aChecker.user.id }).expect(400);
    expect(JSON.stringify(check.body)).not.toContain(aChecker.user.email);
    // B's lists hold nothing of A.
    for (const path of ['/api/projects', '/api/templates', '/api/members', '/api/notifications', '/api/audit']) {
      expect(JSON.stringify((await as(app, bAll, 'get', path).expect(200)).body), path).not.toContain(SECRET);
    }
    expect(JSON.stringify((await as(app, bClient, 'get', '/api/portal/revisions').expect(200)).body)).not.toContain(SECRET);
  });

  it('leaves A\'s work exactly as it was', async () => {
    const before = await snapshot();
    // Run every attempt once more, then compare what A sees with what it saw before them.
    for (const route of routes) {
      const [method, path] = route.split(' ');
      let req = as(app, bAll, method.toLowerCase() as 'get', fill(path) + (QUERIES[route]?.() ?? ''));
      if (BODIES[route]) req = req.send(BODIES[route]());
      await req;
    }
    expect(await snapshot()).toEqual(before);
  });
});
