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
import { PNG } from './support/firm';
import { fillIds, MATRIX, validBodies, type ResourceIds } from './support/routes';
import { createTestApp } from './support/test-app';
import { buildFirm } from './support/firm';

const SECRET = 'Kestrel-secret-feeder';

describe("another firm's ids", () => {
  let app: INestApplication;
  let aEngineer: Caller;
  let aChecker: Caller;
  let bAll: Caller;
  let bClient: Caller;
  let ids: ResourceIds;
  let snapshot: () => Promise<unknown>;

  beforeAll(async () => {
    app = await createTestApp();
    ({ engineer: aEngineer, checker: aChecker, ids } = await buildFirm(app, SECRET));
    bAll = await makeCaller(app, ['owner', 'engineer', 'checker', 'approver']);
    bClient = await makeCaller(app, ['client'], bAll.firm);
    const project = { id: ids.project };
    const sheet = { id: ids.sheet };
    const issued = { id: ids.issuedSheet };
    const revision = { id: ids.revision };

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
      invitations: (await as(app, aEngineer, 'get', '/api/invitations').expect(200)).body,
      notifications: (await as(app, aEngineer, 'get', '/api/notifications').expect(200)).body,
    });
  }, 60_000);
  afterAll(async () => {
    await app?.close();
  });

  /** Valid bodies, so that each answer is about the id and not the body. */
  const body = (route: string): object | undefined => validBodies(ids, bAll.user.id)[route];
  const QUERIES: Record<string, () => string> = {
    'DELETE /api/sheets/:id/cells/:cellId': () => '?version=1',
    'GET /api/sheets/:id/diff': () => `?from=${ids.revision}&to=draft`,
  };

  const routes = Object.keys(MATRIX).filter((r) => r.includes(':'));

  it('has a route of every kind of resource to try', () => {
    expect(routes.length).toBeGreaterThanOrEqual(40);
  });

  it.each(routes)("%s with firm A's ids: 404 to firm B, and nothing of A in the answer", async (route) => {
    const [method, path] = route.split(' ');
    const url = fillIds(path, ids) + (QUERIES[route]?.() ?? '');
    expect(url, 'every parameter is filled').not.toMatch(/:\w+/);
    let req = as(app, bAll, method.toLowerCase() as 'get', url);
    if (route.endsWith('/import-csv'))
      req = req.field('version', '1').field('position', '0').attach('file', Buffer.from('h, I_h [A]\n1, 10\n'), 'harmonics.csv');
    else if (route.endsWith('/attachments') && method === 'POST') req = req.attach('file', PNG, 'intruder.png');
    else if (body(route)) req = req.send(body(route)!);
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

  it("refuses A's ids inside firm B's own requests", async () => {
    const bProject = (
      await as(app, bAll, 'post', '/api/projects').send({ jobNumber: 'B-1', title: 'B project', clientOrganisation: 'B client', site: 'B site' }).expect(201)
    ).body;
    const bSheet = (await as(app, bAll, 'post', `/api/projects/${bProject.id}/sheets`).send({ number: 'B-1', title: 'B sheet' }).expect(201)).body;
    const template = await as(app, bAll, 'post', '/api/templates').send({ sheetId: ids.sheet, title: 'Copied' }).expect(404);
    expect(JSON.stringify(template.body)).not.toContain(SECRET);
    await as(app, bAll, 'post', `/api/projects/${bProject.id}/sheets`).send({ number: 'B-2', templateId: ids.template }).expect(404);
    await as(app, bAll, 'get', `/api/sheets/${bSheet.id}/diff?from=${ids.revision}&to=draft`).expect(404);
    await as(app, bAll, 'patch', `/api/sheets/${bSheet.id}/cells/${ids.cell}`)
      .send({ version: bSheet.version, cell: { kind: 'calc', source: 'x = 1' } })
      .expect(404);
    const team = await as(app, bAll, 'put', `/api/projects/${bProject.id}/members`)
      .send({ userIds: [aEngineer.user.id] })
      .expect(400);
    expect(team.body.message).toMatch(/not a member of the firm/);
    const check = await as(app, bAll, 'post', `/api/sheets/${bSheet.id}/request-check`).send({ checkerId: aChecker.user.id }).expect(400);
    expect(JSON.stringify(check.body)).not.toContain(aChecker.user.email);
    // B's lists hold nothing of A.
    for (const path of ['/api/projects', '/api/templates', '/api/members', '/api/notifications', '/api/audit']) {
      expect(JSON.stringify((await as(app, bAll, 'get', path).expect(200)).body), path).not.toContain(SECRET);
    }
    expect(JSON.stringify((await as(app, bClient, 'get', '/api/portal/revisions').expect(200)).body)).not.toContain(SECRET);
  });

  it("leaves A's work exactly as it was", async () => {
    const before = await snapshot();
    // Run every attempt once more, then compare what A sees with what it saw before them.
    for (const route of routes) {
      const [method, path] = route.split(' ');
      let req = as(app, bAll, method.toLowerCase() as 'get', fillIds(path, ids) + (QUERIES[route]?.() ?? ''));
      if (body(route)) req = req.send(body(route)!);
      await req;
    }
    expect(await snapshot()).toEqual(before);
  });
});
