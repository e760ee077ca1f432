/**
 * Package jobs that cannot drift: two workers racing on one job (the first's heartbeat made to look
 * stopped, so the second takes it over) end with one recorded SHA-256 equal to the stored file's, and
 * the verification page calls that file unaltered. Retry is only for a failed job.
 */
import { createHash } from 'node:crypto';
import { EntityManager, MikroORM } from '@mikro-orm/core';
import type { INestApplication } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { ObjectStoreService } from '../src/files/object-store.service';
import { CertificatesService } from '../src/packages/certificates.service';
import { PackagesService } from '../src/packages/packages.service';
import { RevisionsService } from '../src/review/revisions.service';
import { as, makeCaller, type Caller } from './support/sessions';
import { createTestApp } from './support/test-app';

// No background worker in this file's app: the test drives the workers itself. Set before the app module
// is imported, since its configuration is read then.
const before = vi.hoisted(() => {
  const value = process.env.PACKAGE_WORKER;
  process.env.PACKAGE_WORKER = 'false';
  return value;
});

describe('package jobs', () => {
  let app: INestApplication;
  let engineer: Caller;
  let checker: Caller;
  let approver: Caller;
  let projectId: string;
  let n = 0;

  beforeAll(async () => {
    app = await createTestApp();
    engineer = await makeCaller(app, ['engineer']);
    checker = await makeCaller(app, ['checker'], engineer.firm);
    approver = await makeCaller(app, ['approver'], engineer.firm);
    projectId = (await as(app, engineer, 'post', '/api/projects').send({ jobNumber: 'J-1', title: 'Jobs', clientOrganisation: 'C', site: 'S' }).expect(201))
      .body.id;
  });
  afterAll(async () => {
    await app?.close();
    if (before === undefined) delete process.env.PACKAGE_WORKER;
    else process.env.PACKAGE_WORKER = before;
  });

  const issue = async (): Promise<string> => {
    const sheet = (
      await as(app, engineer, 'post', `/api/projects/${projectId}/sheets`)
        .send({ number: `J-${++n}`, sheet: { format: 'ampwright.sheet/1', title: 'Job', cells: [{ kind: 'calc', source: 'V = 230 V\nI = V / 46 ohm' }] } })
        .expect(201)
    ).body;
    await as(app, engineer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(200);
    await as(app, checker, 'post', `/api/sheets/${sheet.id}/pass`).expect(200);
    await as(app, approver, 'post', `/api/sheets/${sheet.id}/approve`).expect(200);
    return (await as(app, approver, 'post', `/api/sheets/${sheet.id}/issue`).expect(200)).body.id;
  };
  const worker = () =>
    new PackagesService(
      app.get(MikroORM),
      app.get(EntityManager),
      app.get(ObjectStoreService),
      app.get(CertificatesService),
      app.get(RevisionsService),
      app.get(ConfigService),
    );
  const sql = <T>(query: string, params: unknown[] = []) => app.get(EntityManager).fork().getConnection().execute<T>(query, params);

  it('keeps the recorded SHA-256 equal to the stored file when a second worker takes over a running job', async () => {
    const revisionId = await issue();
    const [a, b] = [worker(), worker()];
    // The first worker is held after laying out its package, as a stalled instance would be, until the
    // second has finished: then it tries to record its own file.
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    const slow = a as unknown as { make: (...args: unknown[]) => Promise<Buffer> };
    const make = slow.make.bind(a);
    vi.spyOn(slow, 'make').mockImplementation(async (...args: unknown[]) => {
      const pdf = await make(...args);
      await gate;
      return pdf;
    });
    const first = a.tick(revisionId);
    // Wait for the first worker's claim, then make its heartbeat look stopped, as if its instance had died.
    let claim: { claim_token: string } | undefined;
    for (let k = 0; k < 100 && !claim; k++) {
      [claim] = await sql<{ claim_token: string }[]>("select claim_token from package_job where revision_id = ? and status = 'running'", [revisionId]);
      if (!claim) await new Promise((r) => setTimeout(r, 20));
    }
    expect(claim).toBeDefined();
    await sql('update package_job set heartbeat_at = now(3) - interval 1 hour where revision_id = ?', [revisionId]);
    expect(await b.tick(revisionId)).toBe(true);
    release();
    expect(await first).toBe(true);

    const [job] = await sql<{ status: string; attempts: number; claim_token: string | null }[]>(
      'select status, attempts, claim_token from package_job where revision_id = ?',
      [revisionId],
    );
    expect(job).toMatchObject({ status: 'done', attempts: 2, claim_token: null });
    const [rev] = await sql<{ pdf_sha256: string; pdf_object_key: string }[]>('select pdf_sha256, pdf_object_key from revision where id = ?', [revisionId]);
    // The file recorded is the second run's (its key carries its claim), and it is exactly the stored one.
    expect(rev.pdf_object_key).not.toContain(claim!.claim_token);
    const stored = await app.get(ObjectStoreService).get(rev.pdf_object_key);
    expect(createHash('sha256').update(stored).digest('hex')).toBe(rev.pdf_sha256);
    // The first run stored nothing under its own key.
    await expect(app.get(ObjectStoreService).get(rev.pdf_object_key.replace(/-[0-9a-f-]{36}\.pdf$/, `-${claim!.claim_token}.pdf`))).rejects.toThrow();
    const verdict = await as(app, undefined, 'post', '/api/verify').attach('file', stored, 'package.pdf').expect(200);
    expect(verdict.body.verdict).toBe('unaltered');
  }, 120_000);

  it('fails a job after its last attempt with the reason, and retries only a failed job', async () => {
    const revisionId = await issue();
    const retry = () => as(app, approver, 'post', `/api/revisions/${revisionId}/package/retry`);
    // Queued: not retried.
    expect((await retry().expect(409)).body.message).toMatch(/only a failed one is tried again/);
    // Three runs whose instances died: the next look fails it with the reason instead of running it again.
    await sql("update package_job set status = 'running', attempts = 3, heartbeat_at = now(3) - interval 1 hour, claim_token = 'gone' where revision_id = ?", [
      revisionId,
    ]);
    expect(await worker().tick(revisionId)).toBe(false);
    const failed = (await as(app, approver, 'get', `/api/revisions/${revisionId}/package/status`).expect(200)).body;
    expect(failed).toMatchObject({ status: 'failed', error: 'stopped after 3 attempts: the instance making it stopped answering' });
    // Failed: retried, and made.
    expect((await retry().expect(200)).body.status).toBe('queued');
    expect(await worker().tick(revisionId)).toBe(true);
    expect((await as(app, approver, 'get', `/api/revisions/${revisionId}/package/status`).expect(200)).body.status).toBe('done');
    expect((await retry().expect(409)).body.message).toMatch(/made already/);
  }, 120_000);
});
