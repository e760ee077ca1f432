import type { INestApplication } from '@nestjs/common';

/**
 * Every route of the API with who may call it: the role matrix (role-matrix.test.ts) checks each
 * against every role, and the cross-firm test (cross-firm.test.ts) calls each one that names an id
 * with another firm's ids. A route added without an entry here fails the role matrix's first test.
 */
import type { Role } from '../../src/core/roles';

export type Allowed = 'public' | 'signed-in' | Role[];
export const MEMBERS: Role[] = ['owner', 'engineer', 'checker', 'approver'];
export const ANY_ID = '00000000-0000-4000-8000-000000000000';

/** "METHOD /path" → who may call it. */
export const MATRIX: Record<string, Allowed> = {
  // The API's own description and its reader (core/openapi.ts), open to anyone.
  'GET /api/docs': 'public',
  'GET /api/docs/': 'public',
  'GET /api/docs/LICENSE': 'public',
  'GET /api/docs/docs/swagger-ui-init.js': 'public',
  'GET /api/docs/index.html': 'public',
  'GET /api/docs/json': 'public',
  'GET /api/docs/swagger-ui-init.js': 'public',
  'GET /api/docs/yaml': 'public',
  'GET /api/health': 'public',
  'GET /api/health/live': 'public',
  'GET /api/health/ready': 'public',
  // Metrics: no session; loopback only unless METRICS_TOKEN is set (metrics.controller.ts), and tests call from loopback.
  'GET /api/metrics': 'public',
  'POST /api/evaluate': MEMBERS,
  'POST /api/auth/register': 'public',
  'POST /api/auth/register/confirm': 'public',
  'POST /api/auth/login': 'public',
  'POST /api/auth/logout': 'signed-in',
  'GET /api/auth/me': 'signed-in',
  'PATCH /api/auth/me': 'signed-in',
  'POST /api/auth/forgot-password': 'public',
  'POST /api/auth/reset-password': 'public',
  'POST /api/invitations': ['owner'],
  'GET /api/invitations': ['owner'],
  'DELETE /api/invitations/:id': ['owner'],
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
  'PUT /api/sheets/:id/co-preparers': ['owner', 'engineer'],
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
  'POST /api/sheets/:id/return-to-checker': ['approver', 'owner'],
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
  'GET /api/firm/package-settings': ['owner'],
  'PUT /api/firm/package-settings': ['owner'],
  'POST /api/firm/certificate': ['owner'],
};

/** Ids of one firm's resources, by the kind of resource a path names. */
export interface ResourceIds {
  project: string;
  /** A sheet being prepared. */
  sheet: string;
  /** A sheet with an issued revision (for the revision, diff and new-revision routes). */
  issuedSheet: string;
  cell: string;
  query: string;
  revision: string;
  attachment: string;
  template: string;
  notification: string;
  member: string;
  invitation: string;
}

/** A route's path with each parameter replaced by the id of the resource it names. */
export function fillIds(path: string, ids: ResourceIds): string {
  const sheet = /new-revision|revisions|diff/.test(path) ? ids.issuedSheet : ids.sheet;
  return path
    .replace(/^\/api\/projects\/:(id|projectId)/, `/api/projects/${ids.project}`)
    .replace('/api/sheets/:id', `/api/sheets/${sheet}`)
    .replace(':cellId', ids.cell)
    .replace('/api/queries/:id', `/api/queries/${ids.query}`)
    .replace('/api/revisions/:id', `/api/revisions/${ids.revision}`)
    .replace('/api/attachments/:id', `/api/attachments/${ids.attachment}`)
    .replace('/api/templates/:id', `/api/templates/${ids.template}`)
    .replace('/api/notifications/:id', `/api/notifications/${ids.notification}`)
    .replace('/api/members/:id', `/api/members/${ids.member}`)
    .replace('/api/invitations/:id', `/api/invitations/${ids.invitation}`);
}

/** A valid body for each route of a signed-in member that takes one (`userId`: someone of the caller's firm). */
export function validBodies(ids: ResourceIds, userId: string): Record<string, object> {
  return {
    'POST /api/evaluate': { format: 'ampwright.sheet/1', title: 'Probe', cells: [{ kind: 'calc', source: 'x = 1' }] },
    'PATCH /api/members/:id': { roles: ['checker'] },
    'POST /api/templates': { sheetId: ids.sheet, title: 'A template' },
    'POST /api/projects': { jobNumber: 'F-1', title: 'Fuzz', clientOrganisation: 'Client', site: 'Site' },
    'PATCH /api/projects/:id': { title: 'Renamed' },
    'PUT /api/projects/:id/members': { userIds: [userId] },
    'POST /api/projects/:projectId/sheets': { number: 'F-1', title: 'New sheet' },
    'PATCH /api/sheets/:id': { version: 1, title: 'Renamed' },
    'PUT /api/sheets/:id/co-preparers': { userIds: [userId] },
    'POST /api/sheets/:id/cells': { version: 1, position: 0, cell: { kind: 'calc', source: 'x = 1' } },
    'PATCH /api/sheets/:id/cells/:cellId': { version: 1, cell: { kind: 'calc', source: 'x = 1' } },
    'POST /api/sheets/:id/cells/:cellId/move': { version: 1, position: 1 },
    'POST /api/sheets/:id/request-check': { checkerId: userId },
    'POST /api/sheets/:id/return': { note: 'Please look again' },
    'POST /api/sheets/:id/return-to-checker': { note: 'Please check again' },
    'POST /api/sheets/:id/queries': { cellId: ids.cell, text: 'Where from?' },
    'POST /api/queries/:id/replies': { text: 'From the datasheet' },
    'POST /api/queries/:id/close': { note: 'Agreed' },
    'POST /api/invitations': { email: 'someone@invited.example', roles: ['engineer'] },
    'PATCH /api/auth/me': { name: 'Renamed person' },
    'PUT /api/firm/package-settings': { queryRegister: false },
  };
}

/** Every route the app registers under /api, as `METHOD /api/path/:param`. */
export function registeredRoutes(app: INestApplication): string[] {
  const express = app.getHttpAdapter().getInstance() as { router: { stack: { route?: { path: string; methods: Record<string, boolean> } }[] } };
  return express.router.stack
    .filter((layer) => layer.route && layer.route.path.startsWith('/api/') && !layer.route.path.includes('{*'))
    .flatMap((layer) =>
      Object.keys(layer.route!.methods)
        .filter((m) => m !== '_all')
        .map((m) => `${m.toUpperCase()} ${layer.route!.path}`),
    );
}
