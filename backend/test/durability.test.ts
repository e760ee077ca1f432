/**
 * Durability: the app killed with SIGKILL in the middle of a burst of cell saves, then restarted,
 * has every save it acknowledged in MariaDB. The app runs as a separate process (dist/main.js) on a
 * port of its own, against the test database.
 */
import { execFileSync, type ChildProcess } from 'node:child_process';
import { join } from 'node:path';
import type { INestApplication } from '@nestjs/common';
import { EntityManager } from '@mikro-orm/core';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { ready as readyAt, startApp as startAppProcess } from './support/app-process';
import { makeCaller, type Caller } from './support/sessions';
import { savedResults } from './support/stored-results';
import { createTestApp } from './support/test-app';

const PORT = 3390;
const BASE = `http://127.0.0.1:${PORT}`;

const startApp = (port = PORT, worker = false) => startAppProcess(port, { worker });
const ready = (base = BASE) => readyAt(base);

// This file's in-process app makes no packages. Set before the app module is imported, since its
// configuration is read then (vi.stubEnv in beforeAll would come too late).
const packageWorkerBefore = vi.hoisted(() => {
  const value = process.env.PACKAGE_WORKER;
  process.env.PACKAGE_WORKER = 'false';
  return value;
});

describe('durability', () => {
  let app: INestApplication;
  let engineer: Caller;
  let child: ChildProcess | undefined;

  beforeAll(async () => {
    // This file's in-process app makes no packages, so a package made here was made by a spawned instance.
    app = await createTestApp();
    engineer = await makeCaller(app, ['engineer']);
  });
  afterAll(async () => {
    child?.kill('SIGKILL');
    await app?.close();
    if (packageWorkerBefore === undefined) delete process.env.PACKAGE_WORKER;
    else process.env.PACKAGE_WORKER = packageWorkerBefore;
  });

  const call = (path: string, method: string, body?: unknown) =>
    fetch(`${BASE}/api${path}`, {
      method,
      headers: { cookie: engineer.cookie, 'x-ampwright-csrf': engineer.csrf, 'content-type': 'application/json' },
      body: body ? JSON.stringify(body) : undefined,
    });

  /** A project of its own with one sheet of `cells`, made through the spawned instance. */
  const newSheet = async (number: string, title: string, cells: unknown[]) => {
    const project = await (await call('/projects', 'POST', { jobNumber: number, title, clientOrganisation: 'C', site: 'S' })).json();
    return (await call(`/projects/${project.id}/sheets`, 'POST', { number, sheet: { format: 'ampwright.sheet/1', title, cells } })).json();
  };

  it('keeps every acknowledged save when the app is killed -9 during a burst of saves', async () => {
    child = startApp();
    await ready();
    const sheet = await newSheet(
      'D-1',
      'Burst',
      Array.from({ length: 8 }, (_, k) => ({ kind: 'calc', source: `x_${k} = 0` })),
    );
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
      const row = rows.find((r: { id: string }) => r.id === cellId)!;
      const fields = typeof row.fields === 'string' ? JSON.parse(row.fields) : row.fields;
      // What is stored is the acknowledged save or a later one (a save may land without its answer arriving).
      const stored = Number(/= (\d+)$/.exec(fields.source)![1]);
      expect(stored, `cell ${cellId}`).toBeGreaterThanOrEqual(n);
    }
    const after = await (await call(`/sheets/${sheet.id}`, 'GET')).json();
    expect(after.cells).toHaveLength(8);
  }, 120_000);

  it('answers the save in flight, evaluated, when stopped cleanly (SIGTERM), then exits', async () => {
    child?.kill('SIGKILL');
    // A deadline far past this sheet's evaluation (about a second), so only the stop can cut it short.
    child = startAppProcess(PORT, { env: { EVALUATION_TIMEOUT_MS: '60000' } });
    await ready();
    const sheet = await newSheet('D-4', 'Clean stop', [{ kind: 'calc', source: 'x = 1 V' }]);
    const slow = `M = ones(316, 316)\nP = ${Array(8).fill('M').join(' * ')}\nx = 5 V`;
    const saving = call(`/sheets/${sheet.id}/cells/${sheet.cells[0].id}`, 'PATCH', { version: sheet.version, cell: { kind: 'calc', source: slow } });
    await new Promise((r) => setTimeout(r, 400));
    const exited = new Promise<string>((resolve) => child!.once('exit', (code, signal) => resolve(signal ?? `exit code ${code}`)));
    child.kill('SIGTERM');
    const saved = await saving;
    expect(saved.status).toBe(200);
    const results = savedResults(await saved.json(), sheet.cells[0].id) as { values: Record<string, { si: number }>; errors: unknown[] };
    // Evaluated, not stored with "the server is stopping" in place of its values.
    expect(results.errors).toEqual([]);
    expect(results.values.x.si).toBe(5);
    // Nest's shutdown hooks, done, raise the signal again (the process ends as killed by SIGTERM, not by a crash).
    expect(await exited).toBe('SIGTERM');
    child = undefined;
  }, 120_000);

  it('reports itself unhealthy while MariaDB is down, recovers by itself when it returns, and loses nothing acknowledged', async () => {
    child?.kill('SIGKILL');
    child = startApp();
    await ready();
    const sheet = await newSheet('D-2', 'Outage', [{ kind: 'calc', source: 'x = 1' }]);
    const saved = await call(`/sheets/${sheet.id}/cells/${sheet.cells[0].id}`, 'PATCH', { version: sheet.version, cell: { kind: 'calc', source: 'x = 2' } });
    expect(saved.status).toBe(200);
    const version = (await saved.json()).version;

    // Stop our MariaDB (a clean shutdown through its socket), as an operator or a crash would.
    execFileSync('mariadb-admin', ['--no-defaults', `--socket=${join(__dirname, '..', '..', '.data', 'run', 'mysqld.sock')}`, '-uroot', 'shutdown']);
    const health = await fetch(`${BASE}/api/health`);
    expect(health.status).toBe(503);
    expect((await health.json()).checks.database).toBe('down');
    // Not ready (a load balancer leaves it out), yet alive (nothing to restart).
    expect((await fetch(`${BASE}/api/health/ready`)).status).toBe(503);
    expect((await fetch(`${BASE}/api/health/live`)).status).toBe(200);
    // A save while it is down is refused, not acknowledged.
    const refused = await call(`/sheets/${sheet.id}/cells/${sheet.cells[0].id}`, 'PATCH', { version, cell: { kind: 'calc', source: 'x = 3' } });
    expect(refused.status).toBeGreaterThanOrEqual(500);

    const { startMariadb } = await import('../scripts/lib/provision.mjs');
    await startMariadb();
    const until = Date.now() + 60_000;
    let healthy = false;
    while (!healthy && Date.now() < until) {
      healthy = (await fetch(`${BASE}/api/health`)).status === 200;
      if (!healthy) await new Promise((r) => setTimeout(r, 500));
    }
    expect(healthy).toBe(true);
    const after = await (await call(`/sheets/${sheet.id}`, 'GET')).json();
    expect(after.cells[0].fields.source).toBe('x = 2');
    const again = await call(`/sheets/${sheet.id}/cells/${sheet.cells[0].id}`, 'PATCH', { version: after.version, cell: { kind: 'calc', source: 'x = 4' } });
    expect(again.status).toBe(200);
  }, 180_000);

  it('runs as two instances on one MariaDB: a session and a package job move between them', async () => {
    child?.kill('SIGKILL');
    const a = startApp(3391, false);
    const b = startApp(3392, true);
    try {
      await Promise.all([ready('http://127.0.0.1:3391'), ready('http://127.0.0.1:3392')]);
      const checker = await makeCaller(app, ['checker'], engineer.firm);
      const approver = await makeCaller(app, ['approver'], engineer.firm);
      const on = (port: number, who: Caller, path: string, method = 'GET', body?: unknown) =>
        fetch(`http://127.0.0.1:${port}/api${path}`, {
          method,
          headers: { cookie: who.cookie, 'x-ampwright-csrf': who.csrf, 'content-type': 'application/json' },
          body: body ? JSON.stringify(body) : undefined,
        });
      // The same session cookie works on both instances (sessions live in MariaDB).
      for (const port of [3391, 3392]) expect((await (await on(port, engineer, '/auth/me')).json()).user.id).toBe(engineer.user.id);
      // A sheet issued through A; its package is made by B's worker (A runs none) and read through A.
      const project = await (
        await on(3391, engineer, '/projects', 'POST', { jobNumber: 'D-3', title: 'Two instances', clientOrganisation: 'C', site: 'S' })
      ).json();
      const sheet = await (
        await on(3392, engineer, `/projects/${project.id}/sheets`, 'POST', {
          number: 'D-3',
          sheet: { format: 'ampwright.sheet/1', title: 'Shared', cells: [{ kind: 'calc', source: 'x = 1 V' }] },
        })
      ).json();
      expect((await on(3391, engineer, `/sheets/${sheet.id}/request-check`, 'POST', { checkerId: checker.user.id })).status).toBe(200);
      expect((await on(3392, checker, `/sheets/${sheet.id}/pass`, 'POST')).status).toBe(200);
      expect((await on(3391, approver, `/sheets/${sheet.id}/approve`, 'POST')).status).toBe(200);
      const revision = await (await on(3391, approver, `/sheets/${sheet.id}/issue`, 'POST')).json();
      const until = Date.now() + 60_000;
      let status = { status: 'queued' };
      while (status.status !== 'done' && Date.now() < until) {
        await new Promise((r) => setTimeout(r, 500));
        status = await (await on(3391, approver, `/revisions/${revision.id}/package/status`)).json();
      }
      expect(status.status).toBe('done');
      const pdf = await on(3391, approver, `/revisions/${revision.id}/package`);
      expect(pdf.status).toBe(200);
      expect(
        Buffer.from(await pdf.arrayBuffer())
          .subarray(0, 5)
          .toString(),
      ).toBe('%PDF-');
    } finally {
      a.kill('SIGKILL');
      b.kill('SIGKILL');
    }
  }, 180_000);
});
