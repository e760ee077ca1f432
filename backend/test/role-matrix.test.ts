/**
 * The role matrix: every route of the API against every role and a signed-out caller. A route added
 * without an entry here fails the first test, so the matrix stays complete as the API grows.
 */
import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../src/core/roles';
import { as, makeCaller, type Caller } from './support/sessions';
import { createTestApp } from './support/test-app';

type Allowed = 'public' | 'signed-in' | Role[];
const MEMBERS: Role[] = ['owner', 'engineer', 'checker', 'approver'];
const ANY_ID = '00000000-0000-4000-8000-000000000000';

/** "METHOD /path" → who may call it. */
const MATRIX: Record<string, Allowed> = {
  'GET /api/health': 'public',
  'POST /api/evaluate': MEMBERS,
  'POST /api/auth/register': 'public',
  'POST /api/auth/login': 'public',
  'POST /api/auth/logout': 'signed-in',
  'GET /api/auth/me': 'signed-in',
  'PATCH /api/auth/me': 'signed-in',
  'POST /api/auth/forgot-password': 'public',
  'POST /api/auth/reset-password': 'public',
  'POST /api/invitations': ['owner'],
  'GET /api/invitations': ['owner'],
  'GET /api/invitations/preview': 'public',
  'POST /api/invitations/accept': 'public',
  'GET /api/members': MEMBERS,
  'PATCH /api/members/:id': ['owner'],
  'DELETE /api/members/:id': ['owner'],
  'GET /api/audit': ['owner'],
  'GET /api/templates': MEMBERS,
  'POST /api/templates': ['owner', 'engineer'],
  'DELETE /api/templates/:id': ['owner', 'engineer'],
  'GET /api/projects': 'signed-in',
  'POST /api/projects': ['owner', 'engineer'],
  'GET /api/projects/:id': MEMBERS,
  'PATCH /api/projects/:id': ['owner', 'engineer'],
  'DELETE /api/projects/:id': ['owner'],
  'GET /api/projects/:id/people': MEMBERS,
  'PUT /api/projects/:id/members': ['owner', 'engineer'],
  'GET /api/projects/:projectId/sheets': MEMBERS,
  'POST /api/projects/:projectId/sheets': ['owner', 'engineer'],
  'GET /api/sheets/:id': MEMBERS,
  'GET /api/sheets/:id/export': MEMBERS,
  'PATCH /api/sheets/:id': ['owner', 'engineer'],
  'DELETE /api/sheets/:id': ['owner', 'engineer'],
  'POST /api/sheets/:id/cells': ['owner', 'engineer'],
  'PATCH /api/sheets/:id/cells/:cellId': ['owner', 'engineer'],
  'POST /api/sheets/:id/cells/:cellId/move': ['owner', 'engineer'],
  'POST /api/sheets/:id/cells/import-csv': ['owner', 'engineer'],
  'DELETE /api/sheets/:id/cells/:cellId': ['owner', 'engineer'],
  'GET /api/sheets/:id/attachments': MEMBERS,
  'POST /api/sheets/:id/attachments': ['owner', 'engineer'],
  'GET /api/attachments/:id/download': MEMBERS,
  'DELETE /api/attachments/:id': ['owner', 'engineer'],
  'POST /api/sheets/:id/request-check': ['owner', 'engineer'],
  'POST /api/sheets/:id/return': ['checker'],
  'POST /api/sheets/:id/pass': ['checker'],
  'POST /api/sheets/:id/approve': ['approver'],
  'POST /api/sheets/:id/issue': ['approver'],
  'POST /api/sheets/:id/new-revision': ['owner', 'engineer'],
  'GET /api/sheets/:id/queries': MEMBERS,
  'POST /api/sheets/:id/queries': ['checker'],
  'POST /api/queries/:id/replies': ['owner', 'engineer', 'checker'],
  'POST /api/queries/:id/close': ['checker'],
  'PUT /api/sheets/:id/cells/:cellId/agreement': ['checker'],
  'DELETE /api/sheets/:id/cells/:cellId/agreement': ['checker'],
  'GET /api/sheets/:id/revisions': MEMBERS,
  'GET /api/revisions/:id': MEMBERS,
  'GET /api/sheets/:id/diff': MEMBERS,
  'GET /api/sheets/:id/history': MEMBERS,
  'GET /api/notifications': 'signed-in',
  'POST /api/notifications/read-all': 'signed-in',
  'POST /api/notifications/:id/read': 'signed-in',
  'GET /api/revisions/:id/package/status': [...MEMBERS, 'client'],
  'POST /api/revisions/:id/package/retry': ['owner', 'approver'],
  'GET /api/revisions/:id/package': [...MEMBERS, 'client'],
  'GET /api/portal/revisions': ['client'],
  'POST /api/verify': 'public',
  'GET /api/firm/certificate': ['owner'],
  'POST /api/firm/certificate': ['owner'],
};

const CALLERS: (Role | 'signed-out')[] = ['signed-out', 'owner', 'engineer', 'checker', 'approver', 'client'];

function registeredRoutes(app: INestApplication): string[] {
  const express = app.getHttpAdapter().getInstance() as { router: { stack: { route?: { path: string; methods: Record<string, boolean> } }[] } };
  return express.router.stack
    .filter((layer) => layer.route && layer.route.path.startsWith('/api/') && !layer.route.path.includes('{*'))
    .flatMap((layer) => Object.keys(layer.route!.methods).filter((m) => m !== '_all').map((m) => `${m.toUpperCase()} ${layer.route!.path}`));
}

function mayCall(allowed: Allowed, caller: Role | 'signed-out'): boolean {
  if (allowed === 'public') return true;
  if (caller === 'signed-out') return false;
  if (allowed === 'signed-in') return true;
  return allowed.includes(caller);
}

describe('role matrix', () => {
  let app: INestApplication;
  const sessions = new Map<Role, Caller>();

  beforeAll(async () => {
    app = await createTestApp();
  });
  afterAll(async () => {
    await app?.close();
  });

  it('covers every route the app registers, and nothing it does not', () => {
    const routes = registeredRoutes(app).sort();
    expect(routes).toEqual(Object.keys(MATRIX).sort());
  });

  const cases = Object.entries(MATRIX).flatMap(([route, allowed]) => CALLERS.map((caller) => [route, caller, mayCall(allowed, caller)] as const));

  it.each(cases)('%s as %s: allowed = %s', async (route, caller, allowed) => {
    const [method, path] = route.split(' ');
    let who: Caller | undefined;
    if (caller !== 'signed-out') {
      // A fresh session per call: a logout must not end the next case's session.
      who = await makeCaller(app, [caller], sessions.get(caller)?.firm);
      sessions.set(caller, who);
    }
    const res = await as(app, who, method.toLowerCase() as 'get', path.replace(/:\w+/g, ANY_ID));
    if (allowed) {
      expect([401, 403], `${route} as ${caller}: ${res.status} ${JSON.stringify(res.body)}`).not.toContain(res.status);
    } else {
      expect(res.status, `${route} as ${caller}`).toBe(caller === 'signed-out' ? 401 : 403);
    }
  });
});
