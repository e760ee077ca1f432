/**
 * The role matrix: every route of the API against every role and a signed-out caller. A route added
 * without an entry here fails the first test, so the matrix stays complete as the API grows.
 */
import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../src/core/roles';
import { ANY_ID, MATRIX, registeredRoutes, type Allowed } from './support/routes';
import { as, makeCaller, type Caller } from './support/sessions';
import { createTestApp } from './support/test-app';

const CALLERS: (Role | 'signed-out')[] = ['signed-out', 'owner', 'engineer', 'checker', 'approver', 'client'];

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
