import { randomUUID } from 'node:crypto';
import { Entity, EntityRepositoryType, Index, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import { MailJobRepository } from '../mail-job.repository';

export type MailJobStatus = 'queued' | 'sending' | 'sent' | 'failed';

/**
 * One e-mail waiting to leave, kept in MariaDB: an action only queues it, and a worker in any app
 * instance sends it, trying again with back-off while the mail server is down.
 */
@Entity({ tableName: 'mail_job', repository: () => MailJobRepository })
@Index({ properties: ['status', 'nextAttemptAt'] })
export class MailJob {
  [EntityRepositoryType]?: MailJobRepository;

  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @Property({ type: 'json' })
  recipients: string[];

  @Property({ length: 300 })
  subject: string;

  @Property({ type: 'text' })
  text: string;

  @Property({ type: 'text' })
  html: string;

  @Property({ length: 10 })
  status: MailJobStatus & Opt = 'queued';

  @Property({ type: 'integer' })
  attempts: number & Opt = 0;

  @Property({ type: 'datetime', length: 3 })
  nextAttemptAt: Date & Opt = new Date();

  /** The run sending it now; a run that died is overtaken once `claimedUntil` has passed. */
  @Property({ length: 36, nullable: true })
  claimToken?: string;

  @Property({ type: 'datetime', length: 3, nullable: true })
  claimedUntil?: Date;

  @Property({ length: 500, nullable: true })
  lastError?: string;

  @Property({ type: 'datetime', length: 3 })
  createdAt: Date & Opt = new Date();

  @Property({ type: 'datetime', length: 3, nullable: true })
  sentAt?: Date;

  constructor(recipients: string[], subject: string, text: string, html: string) {
    this.recipients = recipients;
    this.subject = subject;
    this.text = text;
    this.html = html;
  }
}
