/**
 * The package worker's decisions, with the repository, the store and the PDF replaced: what a run writes
 * when it keeps its claim, loses it, or fails. Two real workers racing one job against MariaDB are in
 * test/package-jobs.test.ts.
 */
import type { EntityManager, MikroORM } from '@mikro-orm/core';
import type { ConfigService } from '@nestjs/config';
import { Logger } from '@nestjs/common';
import { describe, expect, it, vi } from 'vitest';
import { currentRequestId } from '../core/middleware/request-id';
import { packageJobDuration, packageJobs } from '../metrics/metrics';
import type { Environment } from '../config/environment';
import type { ObjectStoreService } from '../files/object-store.service';
import type { RevisionsService } from '../review/revisions.service';
import type { CertificatesService } from './certificates.service';
import { PackageJob } from './entities/package-job.entity';
import { PackagesService } from './packages.service';

/** A claimed job on its `attempts`th attempt, and the service over fakes; `holds` says whether each heartbeat still holds the claim. */
function setup(options: { claimed?: boolean; attempts?: number; holds?: boolean; finalWrites?: number; make?: () => Promise<Buffer> } = {}) {
  const revision = { id: 'r-1', code: 'A', sheet: { id: 's-1', number: 'E-101' } };
  const job = { id: 'j-1', attempts: options.attempts ?? 1, revision, requestId: 'issue-req-7' };
  const jobs = {
    failAbandoned: vi.fn(async () => undefined),
    claim: vi.fn(async () => options.claimed ?? true),
    beat: vi.fn(async () => options.holds ?? true),
  };
  const em: Record<string, unknown> = {
    getRepository: vi.fn((entity: unknown) => (entity === PackageJob ? jobs : undefined)),
    findOneOrFail: vi.fn(async () => job),
    nativeUpdate: vi.fn(async () => options.finalWrites ?? 1),
    transactional: vi.fn(async (work: (em: unknown) => Promise<void>) => work(em)),
  };
  em.fork = () => em;
  em.getContext = () => em;
  const orm = { em } as unknown as MikroORM;
  const store = { put: vi.fn(async () => undefined), delete: vi.fn(async () => undefined) };
  const service = new PackagesService(
    orm,
    em as unknown as EntityManager,
    store as unknown as ObjectStoreService,
    {} as CertificatesService,
    {} as RevisionsService,
    { get: () => 'false' } as unknown as ConfigService<Environment, true>,
  );
  vi.spyOn(service, 'make').mockImplementation(options.make ?? (async () => Buffer.from('%PDF-1.7 package')));
  return { service, jobs, em, store };
}

describe('PackagesService', () => {
  it('fails the abandoned jobs first, then claims; with nothing claimed it loads no job and makes nothing', async () => {
    const { service, jobs, em } = setup({ claimed: false });
    expect(await service.tick()).toBe(false);
    expect(jobs.failAbandoned.mock.invocationCallOrder[0]).toBeLessThan(jobs.claim.mock.invocationCallOrder[0]);
    expect(em.findOneOrFail).not.toHaveBeenCalled();
    expect(service.make).not.toHaveBeenCalled();
  });

  it('stores the package and records it and the job in one transaction, under its claim token', async () => {
    const { service, store, em } = setup();
    expect(await service.tick()).toBe(true);
    expect(store.put).toHaveBeenCalledTimes(1);
    const [key] = store.put.mock.calls[0] as unknown as [string];
    expect(key).toMatch(/^packages\/s-1\/A-r-1-[0-9a-f-]{36}\.pdf$/);
    const updates = (em.nativeUpdate as ReturnType<typeof vi.fn>).mock.calls;
    expect(updates[0][1]).toMatchObject({ id: 'j-1', status: 'running', claimToken: expect.any(String) });
    expect(updates[0][2]).toMatchObject({ status: 'done', claimToken: null });
    expect(updates[1][2]).toMatchObject({ pdfObjectKey: key, pdfSha256: expect.stringMatching(/^[0-9a-f]{64}$/) });
    expect(store.delete).not.toHaveBeenCalled();
  });

  it('runs the job on behalf of the request that queued it: its lines carry that request id', async () => {
    const { service } = setup();
    const seen: (string | undefined)[] = [];
    vi.spyOn(Logger.prototype, 'log').mockImplementation(() => seen.push(currentRequestId()));
    await service.tick();
    expect(seen).toEqual(['issue-req-7']);
    expect(currentRequestId()).toBeUndefined();
    vi.restoreAllMocks();
  });

  it('writes nothing when its claim was taken over before storing: no file, no record, no failure', async () => {
    const { service, store, em } = setup({ holds: false });
    await service.tick();
    expect(store.put).not.toHaveBeenCalled();
    expect(em.nativeUpdate).not.toHaveBeenCalled();
  });

  it('removes its own file when the claim is lost at the final write', async () => {
    const { service, store } = setup({ finalWrites: 0 });
    await service.tick();
    expect(store.put).toHaveBeenCalledTimes(1);
    expect(store.delete).toHaveBeenCalledWith((store.put.mock.calls[0] as unknown as [string])[0]);
  });

  it('queues a failed build again with its reason, and fails it for good after the last attempt', async () => {
    const broken = async () => {
      throw new Error('the certificate could not be opened');
    };
    const early = setup({ attempts: 1, make: broken });
    await early.service.tick();
    expect((early.em.nativeUpdate as ReturnType<typeof vi.fn>).mock.calls[0][2]).toMatchObject({
      status: 'queued',
      error: 'the certificate could not be opened',
      claimToken: null,
    });
    const last = setup({ attempts: 3, make: broken });
    await last.service.tick();
    expect((last.em.nativeUpdate as ReturnType<typeof vi.fn>).mock.calls[0][2]).toMatchObject({
      status: 'failed',
      error: 'failed after 3 attempts: the certificate could not be opened',
    });
  });

  it("counts each run's outcome and time for the metrics: done, retried, failed, taken over", async () => {
    const count = async (outcome: string) => (await packageJobs.get()).values.find((v) => v.labels.outcome === outcome)?.value ?? 0;
    const timed = async (outcome: string) =>
      (await packageJobDuration.get()).values.find((v) => v.metricName === 'ampwright_package_job_duration_seconds_count' && v.labels.outcome === outcome)
        ?.value ?? 0;
    const before = { done: await count('done'), retried: await count('retried'), failed: await count('failed'), over: await count('taken-over') };
    const doneTimes = await timed('done');
    const broken = async () => {
      throw new Error('the store is down');
    };
    await setup().service.tick();
    await setup({ attempts: 1, make: broken }).service.tick();
    await setup({ attempts: 3, make: broken }).service.tick();
    await setup({ holds: false }).service.tick();
    expect(await count('done')).toBe(before.done + 1);
    expect(await count('retried')).toBe(before.retried + 1);
    expect(await count('failed')).toBe(before.failed + 1);
    expect(await count('taken-over')).toBe(before.over + 1);
    expect(await timed('done')).toBe(doneTimes + 1);
  });
});
