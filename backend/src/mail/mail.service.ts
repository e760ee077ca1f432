import { randomUUID } from 'node:crypto';
import { EntityManager, MikroORM } from '@mikro-orm/core';
import { BeforeApplicationShutdown, Injectable, Logger, OnApplicationBootstrap, OnApplicationShutdown } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { createTransport, Transporter } from 'nodemailer';
import type { Environment } from '../config/environment';
import { MailJob } from './entities/mail-job.entity';

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html: string;
}

/** Attempts before a message is given up (about 11 hours of back-off in all). */
export const MAIL_MAX_ATTEMPTS = 10;
/** The wait before attempt n + 1: 5 s, 10 s, 20 s, … at most an hour. */
export const mailBackoffMs = (attempts: number) => Math.min(5_000 * 2 ** Math.max(0, attempts - 1), 3_600_000);
/** How long a run may hold a message before another instance may take it over. */
const CLAIM_SECONDS = 60;
const BATCH = 10;

/**
 * E-mail leaves from a queue (the mail_job table): `send` only stores the message, inside or beside
 * the action's own work, so a mail server that is slow or down never slows or fails an action. A worker
 * in every app instance claims due messages with a conditional UPDATE, sends them over SMTP (locally,
 * the sink the scripts start), and on failure tries again with back-off, giving up after
 * MAIL_MAX_ATTEMPTS with the reason kept.
 */
@Injectable()
export class MailService implements OnApplicationBootstrap, BeforeApplicationShutdown, OnApplicationShutdown {
  private readonly logger = new Logger(MailService.name);
  private readonly transporter: Transporter;
  private readonly from: string;
  private timer?: NodeJS.Timeout;
  private busy = false;
  private stopped = false;

  constructor(
    config: ConfigService<Environment, true>,
    private readonly orm: MikroORM,
  ) {
    this.from = config.get('MAIL_FROM', { infer: true });
    this.transporter = createTransport({
      host: config.get('SMTP_HOST', { infer: true }),
      port: config.get('SMTP_PORT', { infer: true }),
      secure: false,
      ignoreTLS: config.get('NODE_ENV', { infer: true }) !== 'production' || config.get('SMTP_HOST', { infer: true }) === '127.0.0.1',
      connectionTimeout: 3000,
      greetingTimeout: 3000,
      socketTimeout: 10_000,
    });
  }

  onApplicationBootstrap(): void {
    this.timer = setInterval(() => void this.tick(), 500);
    this.timer.unref();
  }

  /** Queues a message; it leaves within a second while the mail server answers. */
  async send(mail: OutgoingMail, em: EntityManager = this.orm.em.fork()): Promise<void> {
    await em.persist(new MailJob([mail.to].flat(), mail.subject.slice(0, 300), mail.text, mail.html)).flush();
  }

  /** Sends the messages that are due; returns how many it sent. */
  async tick(): Promise<number> {
    if (this.busy || this.stopped) return 0;
    this.busy = true;
    try {
      const em = this.orm.em.fork();
      const queue = em.getRepository(MailJob);
      const token = randomUUID();
      if (!(await queue.claim(token, CLAIM_SECONDS, BATCH))) {
        // Idle: now and then, sent messages older than a week are cleared out, so the table does not grow.
        if (Math.random() < 0.01) await queue.clearOldSent();
        return 0;
      }
      const jobs = await em.find(MailJob, { claimToken: token });
      let sent = 0;
      for (const job of jobs) sent += (await this.deliver(em, job, token)) ? 1 : 0;
      return sent;
    } catch (err) {
      this.logger.error(`mail worker: ${(err as Error).message}`);
      return 0;
    } finally {
      this.busy = false;
    }
  }

  private async deliver(em: EntityManager, job: MailJob, token: string): Promise<boolean> {
    try {
      await this.transporter.sendMail({ from: this.from, to: job.recipients, subject: job.subject, text: job.text, html: job.html });
      await em.nativeUpdate(MailJob, { id: job.id, claimToken: token }, { status: 'sent', sentAt: new Date(), claimToken: null, lastError: null });
      this.logger.log(`sent "${job.subject}" to ${job.recipients.length} recipient(s)`);
      return true;
    } catch (err) {
      const last = job.attempts >= MAIL_MAX_ATTEMPTS;
      const reason = (err as Error).message.slice(0, 480);
      await em.nativeUpdate(
        MailJob,
        { id: job.id, claimToken: token },
        { status: last ? 'failed' : 'queued', nextAttemptAt: new Date(Date.now() + mailBackoffMs(job.attempts)), claimToken: null, lastError: reason },
      );
      this.logger.warn(`could not send "${job.subject}" (attempt ${job.attempts}${last ? ', giving up' : ''}): ${reason}`);
      return false;
    }
  }

  /** True when the SMTP server answers a greeting. */
  async isReachable(): Promise<boolean> {
    try {
      return await this.transporter.verify();
    } catch {
      return false;
    }
  }

  /** On a clean stop: let the batch in hand finish (up to 10 s); anything left is sent by the next start. */
  async beforeApplicationShutdown(): Promise<void> {
    this.stopped = true;
    clearInterval(this.timer);
    const until = Date.now() + 10_000;
    while (this.busy && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
  }

  /** Last, after the batch in hand and the requests in flight (onModuleDestroy would be before them). */
  onApplicationShutdown(): void {
    this.transporter.close();
  }
}
