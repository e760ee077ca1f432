/**
 * Durability: the app killed with SIGKILL in the middle of a burst of cell saves, then restarted,
 * has every save it acknowledged in MariaDB. The app runs as a separate process (dist/main.js) on a
 * port of its own, against the test database.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { join } from 'node:path';
import type { INestApplication } from '@nestjs/common';
import { EntityManager } from '@mikro-orm/core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCaller, type Caller } from './support/sessions';
import { createTestApp } from './support/test-app';

const PORT = 3390;
const BASE = `http://127.0.0.1:${PORT}`;

function startApp(): ChildProcess {
  return spawn(process.execPath, [join(__dirname, '..', 'dist', 'main.js')], {
    env: { ...process.env, APP_PORT: String(PORT), STATIC_DIR: '', LOG_REQUESTS: 'false', PACKAGE_WORKER: 'false' },
    stdio: 'ignore',
  });
}

async function ready(): Promise<void> {
  const until = Date.now() + 60_000;
  while (Date.now() < until) {
    try {
      if ((await fetch(`${BASE}/api/health`)).ok) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error('the app did not start');
}

describe('durability', () => {
  let app: INestApplication;
  let engineer: Caller;
  let child: ChildProcess | undefined;

  beforeAll(async () => {
    app = await createTestApp();
    engineer = await makeCaller(app, ['engineer']);
  });
  afterAll(async () => {
    child?.kill('SIGKILL');
    await app?.close();
  });

  const call = (path: string, method: string, body?: unknown) =>
    fetch(`${BASE}/api${path}`, { method, headers: { cookie: engineer.cookie, 'x-ampwright-csrf': engineer.csrf, 'content-type': 'application/json' }, body: body ? JSON.stringify(body) : undefined });

  it('keeps every acknowledged save when the app is killed -9 during a burst of saves', async () => {
    child = startApp();
    await ready();
    const project = await (await call('/projects', 'POST', { jobNumber: 'D-1', title: 'Durability', clientOrganisation: 'C', site: 'S' })).json();
    const cells = Array.from({ length: 8 }, (_, k) => ({ kind: 'calc', source: `x_${k} = 0` }));
    const sheet = await (await call(`/projects/${project.id}/sheets`, 'POST', { number: 'D-1', sheet: { format: 'ampwright.sheet/1', title: 'Burst', cells } })).json();
    // Eight writers, one per cell, each saving as fast as it can; the app is killed part-way.
    const acknowledged = new Map<string, number>();
    let version = sheet.version as number;
    let killed = false;
    const writer = async (k: number) => {
      const cellId = sheet.cells[k].id as string;
      for (let n = 1; n < 1000 && !killed; n++) {
        try {
          const res = await call(`/sheets/${sheet.id}/cells/${cellId}`, 'PATCH', { version, cell: { kind: 'calc', source: `x_${k} = ${n}` } });
          if (res.status === 200) {
            version = Math.max(version, (await res.json()).version);
            acknowledged.set(cellId, n);
          } else if (res.status === 409) {
            version = Math.max(version, (await res.json()).current?.version ?? version);
          }
        } catch {
          return; // the app is gone
        }
      }
    };
    const burst = Promise.all(Array.from({ length: 8 }, (_, k) => writer(k)));
    await new Promise((r) => setTimeout(r, 2500));
    child.kill('SIGKILL');
    killed = true;
    await burst;
    expect(acknowledged.size).toBeGreaterThan(0);

    child = startApp();
    await ready();
    const em = app.get(EntityManager).fork();
    const rows = await em.getConnection().execute<{ id: string; fields: string }[]>('select id, fields from cell where sheet_id = ?', [sheet.id]);
    for (const [cellId, n] of acknowledged) {
      const row = rows.find((r) => r.id === cellId)!;
      const fields = typeof row.fields === 'string' ? JSON.parse(row.fields) : row.fields;
      // What is stored is the acknowledged save or a later one (a save may land without its answer arriving).
      const stored = Number(/= (\d+)$/.exec(fields.source)![1]);
      expect(stored, `cell ${cellId}`).toBeGreaterThanOrEqual(n);
    }
    const after = await (await call(`/sheets/${sheet.id}`, 'GET')).json();
    expect(after.cells).toHaveLength(8);
  }, 120_000);
});
