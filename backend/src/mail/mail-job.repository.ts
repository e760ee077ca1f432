import { EntityRepository } from '@mikro-orm/mariadb';
import type { MailJob } from './entities/mail-job.entity';

/** The SQL of the mail queue: a batch is claimed with one conditional UPDATE, so app instances never send a message twice. */
export class MailJobRepository extends EntityRepository<MailJob> {
  /** Claims up to `batch` due messages (or ones whose claim ran out) under `token` for `seconds`; how many. */
  async claim(token: string, seconds: number, batch: number): Promise<number> {
    const res = await this.em.execute(
      `update mail_job set status = 'sending', claim_token = ?, claimed_until = now(3) + interval ? second, attempts = attempts + 1
        where (status = 'queued' and next_attempt_at <= now(3)) or (status = 'sending' and claimed_until < now(3))
        order by next_attempt_at limit ?`,
      [token, seconds, batch],
      'run',
    );
    return (res as { affectedRows?: number }).affectedRows ?? 0;
  }

  /** Clears sent messages older than a week, a few hundred at a time, so the table does not grow. */
  async clearOldSent(): Promise<void> {
    await this.em.execute("delete from mail_job where status = 'sent' and sent_at < now(3) - interval 7 day limit 500", [], 'run');
  }
}
