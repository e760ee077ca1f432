/**
 * Packages: the job that makes a revision's signed PDF (run by a worker that polls the job table, so
 * it is off the request path and any app instance can take it), downloads for members and clients,
 * the client portal's list, and public verification of an uploaded PDF.
 */
import { createHash, randomUUID } from 'node:crypto';
import { hostname } from 'node:os';
import { EntityManager, MikroORM, RequestContext } from '@mikro-orm/core';
import { BeforeApplicationShutdown, Injectable, Logger, OnApplicationBootstrap } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { PackageStatusDto, PortalRevisionDto, VerdictDto } from '@ampwright/common';
import { Attachment } from '../attachments/entities/attachment.entity';
import type { Environment } from '../config/environment';
import { ErrorCode, PackageException, RequestException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { currentRequestId, withRequestId } from '../core/middleware/request-id';
import { ObjectStoreService } from '../files/object-store.service';
import { packageJobDuration, packageJobs } from '../metrics/metrics';
import { ProjectPerson } from '../projects/entities/project.entity';
import { Revision } from '../review/entities/revision.entity';
import type { RevisionSnapshot } from '../review/revisions.service';
import { RevisionsService } from '../review/revisions.service';
import { CertificatesService } from './certificates.service';
import { PackageJob } from './entities/package-job.entity';
import { buildPackageInWorker } from './build-in-worker';
import { REVISION_KEY } from './package-pdf';
import { PackageErrorCode } from '@ampwright/common';

export type PackageStatus = PackageStatusDto;
export type PortalRevision = PortalRevisionDto;
export type Verdict = VerdictDto;

/** Runs of one job before it is failed with its reason. */
const MAX_ATTEMPTS = 3;
/** How often a run refreshes its heartbeat, and after how long without one its job is taken over. */
const HEARTBEAT_MS = 5_000;
const STALE_HEARTBEAT_MS = 30_000;

/** A run whose claim was taken over by another: it stops and writes nothing. */
class ClaimLost extends Error {}

@Injectable()
export class PackagesService implements OnApplicationBootstrap, BeforeApplicationShutdown {
  private readonly logger = new Logger(PackagesService.name);
  private readonly instance = `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
  private timer?: NodeJS.Timeout;
  private busy = false;
  private stopped = false;

  constructor(
    private readonly orm: MikroORM,
    private readonly em: EntityManager,
    private readonly store: ObjectStoreService,
    private readonly certificates: CertificatesService,
    private readonly revisions: RevisionsService,
    private readonly config: ConfigService<Environment, true>,
  ) {}

  onApplicationBootstrap(): void {
    if (this.config.get('PACKAGE_WORKER', { infer: true }) !== 'true') return;
    this.timer = setInterval(() => void this.tick(), 500);
    this.timer.unref();
  }

  /** On a clean stop: let the job in hand finish (up to 30 s), then hand back any job still held. */
  async beforeApplicationShutdown(): Promise<void> {
    this.stopped = true;
    clearInterval(this.timer);
    const until = Date.now() + 30_000;
    while (this.busy && Date.now() < until) await new Promise((r) => setTimeout(r, 100));
    await this.orm.em
      .fork()
      .nativeUpdate(PackageJob, { lockedBy: this.instance, status: 'running' }, { status: 'queued', lockedBy: null, claimToken: null })
      .catch(() => undefined);
  }

  /**
   * Takes the oldest waiting job, or one whose run stopped sending heartbeats (its instance died), and
   * makes its package. A job past its last attempt is failed with the reason instead of run again.
   * With `revisionId`, only that revision's job is considered.
   */
  async tick(revisionId?: string): Promise<boolean> {
    if (this.busy || this.stopped) return false;
    this.busy = true;
    try {
      return await RequestContext.create(this.orm.em, async () => {
        const jobs = this.em.getRepository(PackageJob);
        await jobs.failAbandoned(STALE_HEARTBEAT_MS / 1000, MAX_ATTEMPTS, revisionId);
        const token = randomUUID();
        if (!(await jobs.claim(token, this.instance, STALE_HEARTBEAT_MS / 1000, MAX_ATTEMPTS, revisionId))) return false;
        const job = await this.em.findOneOrFail(
          PackageJob,
          { claimToken: token },
          { populate: ['revision', 'revision.sheet', 'revision.sheet.project', 'revision.sheet.project.firm'] },
        );
        // On behalf of the request that queued it: its log lines carry that request's id.
        await withRequestId(job.requestId, () => this.run(job, token));
        return true;
      });
    } catch (err) {
      this.logger.error(`package worker: ${(err as Error).stack ?? err}`);
      return false;
    } finally {
      this.busy = false;
    }
  }

  /** Whether this run still holds its claim (and refreshes its heartbeat). */
  private async beat(jobId: string, token: string): Promise<boolean> {
    return this.orm.em.fork().getRepository(PackageJob).beat(jobId, token);
  }

  /**
   * Makes, stores and records one package under a claim. The object key is unique to the claim, so no
   * run overwrites another's file; the job and the revision's hash are written in one transaction, only
   * while the claim still holds (affected rows checked), so the recorded hash is always the stored file's.
   */
  private async run(job: PackageJob, token: string): Promise<void> {
    const revision = job.revision;
    let percent = 0;
    const progress = (fraction: number) => {
      const next = Math.round(fraction * 80);
      if (next > percent + 9) {
        percent = next;
        void this.orm.em
          .fork()
          .nativeUpdate(PackageJob, { id: job.id, claimToken: token }, { percent })
          .catch(() => undefined);
      }
    };
    let lost = false;
    const heartbeat = setInterval(
      () =>
        void this.beat(job.id, token).then(
          (held) => (lost ||= !held),
          () => undefined,
        ),
      HEARTBEAT_MS,
    );
    const key = `packages/${revision.sheet.id}/${revision.code}-${revision.id}-${token}.pdf`;
    let stored = false;
    const started = process.hrtime.bigint();
    const finished = (outcome: 'done' | 'failed' | 'retried' | 'taken-over') => {
      packageJobs.inc({ outcome });
      packageJobDuration.observe({ outcome }, Number(process.hrtime.bigint() - started) / 1e9);
    };
    try {
      const pdf = await this.make(revision, progress);
      if (lost || !(await this.beat(job.id, token))) throw new ClaimLost();
      await this.store.put(key, pdf, 'application/pdf');
      stored = true;
      const sha = createHash('sha256').update(pdf).digest('hex');
      await this.em.transactional(async (em) => {
        const done = await em.nativeUpdate(
          PackageJob,
          { id: job.id, claimToken: token, status: 'running' },
          { status: 'done', percent: 100, error: null, lockedBy: null, claimToken: null },
        );
        if (done !== 1) throw new ClaimLost();
        const recorded = await em.nativeUpdate(Revision, { id: revision.id, pdfSha256: null }, { pdfSha256: sha, pdfObjectKey: key });
        if (recorded !== 1) throw new ClaimLost();
      });
      finished('done');
      this.logger.log(`package of ${revision.sheet.number} revision ${revision.code} made (${pdf.length} bytes, sha256 ${sha.slice(0, 12)}…)`);
    } catch (err) {
      if (stored) await this.store.delete(key).catch(() => undefined);
      if (err instanceof ClaimLost) {
        finished('taken-over');
        this.logger.warn(`package of revision ${revision.id}: another run took the job over; this one wrote nothing`);
        return;
      }
      const last = job.attempts >= MAX_ATTEMPTS;
      finished(last ? 'failed' : 'retried');
      const reason = (err as Error).message.slice(0, 400);
      this.logger.warn(`package of revision ${revision.id} failed (attempt ${job.attempts}): ${reason}`);
      await this.em.nativeUpdate(
        PackageJob,
        { id: job.id, claimToken: token },
        { status: last ? 'failed' : 'queued', error: last ? `failed after ${job.attempts} attempts: ${reason}` : reason, lockedBy: null, claimToken: null },
      );
    } finally {
      clearInterval(heartbeat);
    }
  }

  /** The signed PDF of a revision. The same snapshot always gives the same document before signing. */
  async make(revision: Revision, onProgress?: (f: number) => void): Promise<Buffer> {
    const snapshot = revision.snapshot as unknown as RevisionSnapshot;
    const history = (await this.revisions.summaries(revision.sheet.id)).filter((r) => r.number <= revision.number);
    const stored = await this.em.find(Attachment, { id: { $in: snapshot.attachments.map((a) => a.id) } });
    const attachments = await Promise.all(
      snapshot.attachments.map(async (a) => {
        const row = stored.find((s) => s.id === a.id);
        const body = row ? await this.store.get(row.objectKey) : Buffer.alloc(0);
        return { ...a, body };
      }),
    );
    const cert = await this.certificates.forSigning(revision.sheet.project.firm);
    const who = { firm: snapshot.firm, reason: `Issue of ${snapshot.sheetNumber} revision ${snapshot.revision.code}` };
    return buildPackageInWorker(
      { revisionId: revision.id, snapshot, history, attachments, onProgress },
      { p12: new Uint8Array(cert.p12), password: cert.password, who },
    );
  }

  private async findRevision(auth: AuthContext, id: string): Promise<Revision> {
    const isClient = auth.roles.includes('client');
    const where = isClient
      ? {
          id,
          sheet: { project: { id: { $in: (await this.em.find(ProjectPerson, { user: auth.user.id, standing: 'client' })).map((c) => c.project.id) } } },
        }
      : { id, sheet: { project: { firm: auth.firm.id } } };
    const r = await this.em.findOne(Revision, where, { populate: ['sheet', 'sheet.project'] });
    if (!r) throw new RequestException(ErrorCode.NotFound, 'No such revision.');
    return r;
  }

  async status(auth: AuthContext, revisionId: string): Promise<PackageStatus> {
    const r = await this.findRevision(auth, revisionId);
    const job = await this.em.findOne(PackageJob, { revision: r });
    // A client sees whether the package is ready, never the firm's internal error text.
    const error = job?.error ? (auth.roles.includes('client') ? 'The package could not be made yet; the issuing firm has been told.' : job.error) : null;
    return { status: job?.status ?? 'none', percent: job?.percent ?? 0, error, pdfSha256: r.pdfSha256 ?? null };
  }

  /** Puts a failed (or missing) job back in the queue; a job waiting or being made is left alone. */
  async retry(auth: AuthContext, revisionId: string): Promise<PackageStatus> {
    const r = await this.findRevision(auth, revisionId);
    if (r.pdfSha256) throw new RequestException(ErrorCode.Conflict, 'The package of this revision is made already; it is never made again.');
    const job = await this.em.findOne(PackageJob, { revision: r });
    if (!job) {
      await this.em.persist(new PackageJob(r, currentRequestId())).flush();
    } else {
      const requeued = await this.em.nativeUpdate(
        PackageJob,
        { id: job.id, status: 'failed' },
        { status: 'queued', attempts: 0, error: null, claimToken: null, lockedBy: null, requestId: currentRequestId() ?? null },
      );
      if (requeued !== 1)
        throw new RequestException(ErrorCode.Conflict, 'The package of this revision is waiting or being made: only a failed one is tried again.');
    }
    this.em.clear();
    return this.status(auth, revisionId);
  }

  async download(auth: AuthContext, revisionId: string): Promise<{ body: Buffer; fileName: string; sha256: string }> {
    const r = await this.findRevision(auth, revisionId);
    if (!r.pdfObjectKey || !r.pdfSha256)
      throw new PackageException(PackageErrorCode.NotReady, 'The package of this revision is still being made; try again in a moment.');
    const body = await this.store.get(r.pdfObjectKey);
    return { body, fileName: `${r.sheet.project.jobNumber}-${r.sheet.number}-rev${r.code}.pdf`.replace(/[^A-Za-z0-9._-]/g, '_'), sha256: r.pdfSha256 };
  }

  /** For a client: the issued revisions of the projects they were invited to, nothing else. */
  async portal(auth: AuthContext): Promise<PortalRevision[]> {
    const projectIds = (await this.em.find(ProjectPerson, { user: auth.user.id, standing: 'client' })).map((c) => c.project.id);
    if (!projectIds.length) return [];
    const rows = await this.em.find(
      Revision,
      { sheet: { project: { $in: projectIds } } },
      { populate: ['sheet', 'sheet.project', 'preparedBy', 'checkedBy', 'approvedBy'], orderBy: { issuedAt: 'desc' } },
    );
    return rows.map((r) => ({
      ...this.revisions.toSummary(r),
      sheetId: r.sheet.id,
      sheetNumber: r.sheet.number,
      sheetTitle: (r.snapshot as unknown as RevisionSnapshot).sheet.title,
      projectId: r.sheet.project.id,
      jobNumber: r.sheet.project.jobNumber,
      projectTitle: r.sheet.project.title,
      packageReady: !!r.pdfSha256,
    }));
  }

  /**
   * Whether an uploaded PDF is a package this service issued, unchanged. A file whose SHA-256 is an
   * issued package's is unaltered; one that names a revision but differs was altered; anything else is
   * not ours. Nothing is said about work that was not issued.
   */
  async verify(file: { buffer: Buffer; size: number } | undefined): Promise<Verdict> {
    if (!file || file.size === 0)
      throw new RequestException(ErrorCode.ValidationFailed, 'Choose a PDF file to check.', { details: [{ field: 'file', message: 'no file was sent' }] });
    if (!file.buffer.subarray(0, 1024).toString('latin1').includes('%PDF-')) {
      throw new RequestException(ErrorCode.UnsupportedMediaType, 'This file is not a PDF, so it cannot be one of our packages.', {
        details: [{ field: 'file', message: 'not a PDF' }],
      });
    }
    const sha = createHash('sha256').update(file.buffer).digest('hex');
    const match = await this.em.findOne(Revision, { pdfSha256: sha }, { populate: ['sheet', 'sheet.project', 'sheet.project.firm'] });
    if (match) {
      const snap = match.snapshot as unknown as RevisionSnapshot;
      return {
        verdict: 'unaltered',
        project: match.sheet.project.title,
        jobNumber: match.sheet.project.jobNumber,
        sheet: match.sheet.number,
        sheetTitle: snap.sheet.title,
        revision: match.code,
        issuedAt: match.issuedAt.toISOString(),
        firm: match.sheet.project.firm.name,
      };
    }
    const named = new RegExp(`${REVISION_KEY}[:(\\s]+([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})`).exec(file.buffer.toString('latin1'));
    if (named && (await this.em.count(Revision, { id: named[1], pdfSha256: { $ne: null } }))) {
      return {
        verdict: 'altered',
        message:
          'This file claims to be one of our packages, but it is not the file we issued: it was altered after signing (or damaged). Do not rely on it; ask the issuing firm for the original.',
      };
    }
    return { verdict: 'unknown', message: 'This PDF is not a package issued by this service.' };
  }
}
