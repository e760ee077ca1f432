import { EntityRepository } from '@mikro-orm/mariadb';
import type { PackageJob } from './entities/package-job.entity';

const affected = (res: unknown) => (res as { affectedRows?: number }).affectedRows ?? 0;

/**
 * The SQL of the package jobs: claims and heartbeats are conditional UPDATEs (affected rows say who won),
 * so any number of app instances share the queue without a lock held across them.
 */
export class PackageJobRepository extends EntityRepository<PackageJob> {
  /** Fails the jobs whose run stopped sending heartbeats after their last attempt, with the reason. */
  async failAbandoned(staleSeconds: number, maxAttempts: number, revisionId?: string): Promise<void> {
    await this.em.execute(
      `update package_job set status = 'failed', claim_token = null, locked_by = null, updated_at = now(3),
              error = concat('stopped after ', attempts, ' attempts: the instance making it stopped answering')
        where status = 'running' and heartbeat_at < now(3) - interval ? second and attempts >= ? and (? is null or revision_id = ?)`,
      [staleSeconds, maxAttempts, revisionId ?? null, revisionId ?? null],
      'run',
    );
  }

  /** Claims the oldest waiting job, or one whose run went silent, under `token`; whether one was claimed. */
  async claim(token: string, instance: string, staleSeconds: number, maxAttempts: number, revisionId?: string): Promise<boolean> {
    const res = await this.em.execute(
      `update package_job set status = 'running', claim_token = ?, locked_by = ?, locked_at = now(3), heartbeat_at = now(3), attempts = attempts + 1, updated_at = now(3)
        where (status = 'queued' or (status = 'running' and heartbeat_at < now(3) - interval ? second and attempts < ?)) and (? is null or revision_id = ?)
        order by created_at limit 1`,
      [token, instance, staleSeconds, maxAttempts, revisionId ?? null, revisionId ?? null],
      'run',
    );
    return affected(res) > 0;
  }

  /** Refreshes the heartbeat of a run; whether it still holds its claim. */
  async beat(jobId: string, token: string): Promise<boolean> {
    const res = await this.em.execute(
      "update package_job set heartbeat_at = now(3) where id = ? and claim_token = ? and status = 'running'",
      [jobId, token],
      'run',
    );
    return affected(res) === 1;
  }
}
