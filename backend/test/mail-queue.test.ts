/**
 * Mail leaves from a queue: an action only stores the message; a worker sends it, and while the mail
 * server is down it tries again with back-off, then gives up with the reason kept.
 */
import { MikroORM } from '@mikro-orm/core';
import type { INestApplication } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Environment } from '../src/config/environment';
import { MAIL_MAX_ATTEMPTS, MailService } from '../src/mail/mail.service';
import { as, makeCaller } from './support/sessions';
import { createTestApp, waitForMail } from './support/test-app';

describe('the mail queue', () => {
  let app: INestApplication;
  let down: MailService;
  let up: MailService;
  const sql = <T>(query: string, params: unknown[] = []) => app.get(MikroORM).em.fork().getConnection().execute<T>(query, params);

  /** A worker of our own, with the app's settings but another SMTP port. */
  const worker = (port?: number) => {
    const config = app.get(ConfigService) as ConfigService<Environment, true>;
    const settings = { get: (key: keyof Environment) => (key === 'SMTP_PORT' && port ? port : config.get(key, { infer: true })) } as unknown as ConfigService<
      Environment,
      true
    >;
    return new MailService(settings, app.get(MikroORM));
  };

  beforeAll(async () => {
    app = await createTestApp();
    // The app's own worker is stopped: this file drives the workers itself.
    await app.get(MailService).beforeApplicationShutdown();
    down = worker(9); // nothing listens on port 9 here: the mail server is down
    up = worker();
  });
  afterAll(async () => {
    down?.onApplicationShutdown();
    up?.onApplicationShutdown();
    await app?.close();
  });

  it('queues the e-mail of an action instead of sending it, then sends it', async () => {
    const owner = await makeCaller(app, ['owner']);
    await as(app, owner, 'post', '/api/invitations')
      .send({ email: 'queued-invitee@invited.example', roles: ['engineer'] })
      .expect(201);
    const [row] = await sql<{ status: string; attempts: number }[]>(
      'select status, attempts from mail_job where json_contains(recipients, \'"queued-invitee@invited.example"\')',
    );
    expect(row).toEqual({ status: 'queued', attempts: 0 });
    expect(await up.tick()).toBeGreaterThan(0);
    expect((await waitForMail('queued-invitee@invited.example')).subject).toMatch(/invit/i);
  });

  it('tries again with back-off while the mail server is down, and gives up after the last attempt', async () => {
    await up.send({ to: 'patient@test.example', subject: 'Probe while down', text: 'x', html: '<p>x</p>' });
    expect(await down.tick()).toBe(0);
    const [failed] = await sql<{ status: string; attempts: number; wait: number; last_error: string }[]>(
      "select status, attempts, timestampdiff(second, now(3), next_attempt_at) as wait, last_error from mail_job where subject = 'Probe while down'",
    );
    expect(failed).toMatchObject({ status: 'queued', attempts: 1 });
    expect(Number(failed.wait)).toBeGreaterThanOrEqual(3); // 5 s after the first failure
    expect(failed.last_error).toMatch(/ECONNREFUSED|connect/i);
    // Not due yet: the server being back changes nothing until the back-off has passed.
    expect(await up.tick()).toBe(0);
    await sql("update mail_job set next_attempt_at = now(3) where subject = 'Probe while down'");
    expect(await up.tick()).toBe(1);
    expect((await waitForMail('patient@test.example')).subject).toBe('Probe while down');

    await up.send({ to: 'lost@test.example', subject: 'Probe given up', text: 'x', html: '<p>x</p>' });
    await sql("update mail_job set attempts = ? where subject = 'Probe given up'", [MAIL_MAX_ATTEMPTS - 1]);
    expect(await down.tick()).toBe(0);
    const [gone] = await sql<{ status: string; attempts: number }[]>("select status, attempts from mail_job where subject = 'Probe given up'");
    expect(gone).toEqual({ status: 'failed', attempts: MAIL_MAX_ATTEMPTS });
  }, 30_000);
});
