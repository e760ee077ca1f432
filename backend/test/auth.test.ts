import type { INestApplication } from '@nestjs/common';
import { EntityManager } from '@mikro-orm/core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { SessionRepository } from '../src/auth/session.repository';
import { AuditEvent } from '../src/audit/entities/audit-event.entity';
import { Session } from '../src/auth/entities/session.entity';
import { PasswordService } from '../src/auth/password.service';
import { Firm } from '../src/firms/entities/firm.entity';
import { Membership } from '../src/firms/entities/membership.entity';
import { User } from '../src/users/entities/user.entity';
import { CSRF_HEADER } from '../src/core/guards/auth.guard';
import { DEMO_PASSWORD } from '../src/database/seeders/demo.seeder';
import { as, cookieFrom, makeCaller, uniqueEmail } from './support/sessions';
import { createTestApp, waitForMail, type SinkMessage } from './support/test-app';

const PASSWORD = 'correct horse battery';

describe('accounts: register, sign in, sessions, reset, invitations, members', () => {
  let app: INestApplication;
  const http = () => request(app.getHttpServer());
  const audit = (email: string) =>
    app
      .get(EntityManager)
      .fork()
      .find(AuditEvent, { email }, { orderBy: { createdAt: 'asc' } });

  beforeAll(async () => {
    app = await createTestApp();
  });
  afterAll(async () => {
    await app?.close();
  });

  const REGISTERED = 'Check your e-mail: follow the link we sent to confirm the address, and the firm is ready.';

  /** Registers a firm the way a person does: the form, then the link e-mailed to the address. */
  async function register(email = uniqueEmail('owner')) {
    const asked = await http()
      .post('/api/auth/register')
      .set(CSRF_HEADER, '1')
      .send({ firmName: 'Probe Consulting', name: 'Olu Owner', email, password: PASSWORD })
      .expect(202);
    expect(asked.body).toEqual({ message: REGISTERED });
    const mail = await waitForMail(email, (m) => m.subject === 'Confirm your Ampwright registration');
    const token = /token=([\w-]+)/.exec(mail.text)![1];
    const res = await http().post('/api/auth/register/confirm').set(CSRF_HEADER, '1').send({ token }).expect(201);
    return { email, token, cookie: cookieFrom(res), csrf: res.body.csrfToken as string, body: res.body, res };
  }

  it('registers a firm by an e-mailed link; its first user is its owner, with an httpOnly SameSite=Lax session cookie', async () => {
    const { email, res, token } = await register();
    expect(res.body).toMatchObject({ user: { email }, firm: { name: 'Probe Consulting' }, roles: ['owner'] });
    // The link works once.
    expect((await http().post('/api/auth/register/confirm').set(CSRF_HEADER, '1').send({ token }).expect(400)).body.code).toBe('REGISTRATION_INVALID');
    const setCookie = String(res.headers['set-cookie']);
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Lax/i);
    const me = await http().get('/api/auth/me').set('cookie', cookieFrom(res)).expect(200);
    expect(me.body.user.email).toBe(email);
    expect(JSON.stringify(res.body)).not.toContain('passwordHash');
  });

  it('refuses a short password and a taken address with clear messages', async () => {
    const short = await http()
      .post('/api/auth/register')
      .set(CSRF_HEADER, '1')
      .send({ firmName: 'X Ltd', name: 'X', email: uniqueEmail('x'), password: 'short' })
      .expect(400);
    expect(short.body.details).toEqual([{ field: 'password', message: 'password must be at least 12 characters' }]);
  });

  it('answers a registration alike whether or not the address has an account, and tells the address by e-mail', async () => {
    const { email } = await register();
    const known = await http().post('/api/auth/register').set(CSRF_HEADER, '1').send({ firmName: 'Y Ltd', name: 'Y', email, password: PASSWORD }).expect(202);
    const unknown = await http()
      .post('/api/auth/register')
      .set(CSRF_HEADER, '1')
      .send({ firmName: 'Y Ltd', name: 'Y', email: uniqueEmail('fresh'), password: PASSWORD })
      .expect(202);
    expect(known.body).toEqual(unknown.body);
    expect((await waitForMail(email, (m) => m.subject === 'Your Ampwright account')).text).toMatch(/has an account already/);
  });

  it('signs in, records sign-ins and failures, and signs out', async () => {
    const { email } = await register();
    const bad = await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email, password: 'wrong password!!' }).expect(401);
    expect(bad.body).toMatchObject({ code: 'BAD_CREDENTIALS', message: 'The e-mail address or the password is not right.' });
    const ok = await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email: email.toUpperCase(), password: PASSWORD }).expect(200);
    const cookie = cookieFrom(ok);
    await http().post('/api/auth/logout').set('cookie', cookie).set(CSRF_HEADER, ok.body.csrfToken).expect(204);
    await http().get('/api/auth/me').set('cookie', cookie).expect(401);
    expect((await audit(email)).map((e) => e.type)).toEqual(['registration-requested', 'firm-registered', 'sign-in-failed', 'sign-in', 'sign-out']);
  });

  it('answers an unknown address exactly as a wrong password', async () => {
    const res = await http()
      .post('/api/auth/login')
      .set(CSRF_HEADER, '1')
      .send({ email: uniqueEmail('nobody'), password: PASSWORD })
      .expect(401);
    expect(res.body.message).toBe('The e-mail address or the password is not right.');
  });

  it('refuses a state-changing request without the anti-forgery token', async () => {
    const { cookie } = await register();
    const res = await http().post('/api/auth/logout').set('cookie', cookie).expect(403);
    expect(res.body.code).toBe('CSRF_FAILED');
    await http().post('/api/auth/logout').set('cookie', cookie).set(CSRF_HEADER, 'forged-token-value').expect(403);
    await http().post('/api/auth/login').send({ email: 'a@b.example', password: 'x' }).expect(403);
  });

  it('throttles sign-in to 5 a minute per account with a clear 429', async () => {
    const email = uniqueEmail('throttle');
    for (let k = 0; k < 5; k++) await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email, password: 'wrong password!!' }).expect(401);
    const res = await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email, password: 'wrong password!!' }).expect(429);
    expect(res.body).toMatchObject({ code: 'TOO_MANY_REQUESTS', message: expect.stringMatching(/^Too many failed sign-ins: wait \d+ s and try again\.$/) });
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('counts sign-in attempts across app instances: 3 on one and 2 on another use up the 5 of an account', async () => {
    const other = await createTestApp();
    try {
      const email = uniqueEmail('shared-throttle');
      const attempt = (server: INestApplication) =>
        request(server.getHttpServer()).post('/api/auth/login').set(CSRF_HEADER, '1').send({ email, password: 'wrong password!!' });
      for (let k = 0; k < 3; k++) expect((await attempt(app)).status).toBe(401);
      for (let k = 0; k < 2; k++) expect((await attempt(other)).status).toBe(401);
      expect((await attempt(app)).status).toBe(429);
      const blocked = await attempt(other);
      expect(blocked.status).toBe(429);
      expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    } finally {
      await other.close();
    }
  });

  it('clears out expired sessions when someone signs in, keeping live ones', async () => {
    const em = app.get(EntityManager).fork();
    const expired = await makeCaller(app, ['engineer']);
    const live = await makeCaller(app, ['engineer']);
    await em.nativeUpdate(Session, { user: expired.user.id }, { expiresAt: new Date(Date.now() - 60_000) });
    await as(app, expired, 'get', '/api/auth/me').expect(401);
    const { email } = await register();
    await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email, password: PASSWORD }).expect(200);
    expect(await em.count(Session, { user: expired.user.id })).toBe(0);
    expect(await em.count(Session, { user: live.user.id })).toBe(1);
    await as(app, live, 'get', '/api/auth/me').expect(200);
  });

  it('slides a session with its use: idle for SESSION_IDLE_MINUTES it ends, busy it lasts at most SESSION_HOURS', async () => {
    const { cookie, email } = await register();
    const sql = <T>(q: string, p: unknown[] = []) => app.get(EntityManager).fork().getConnection().execute<T>(q, p);
    const sessionOf = `select s.token_hash from session s join app_user u on u.id = s.user_id where u.email = '${email}'`;
    const left = async () =>
      (await sql<{ minutes: number }[]>(`select timestampdiff(second, now(3), expires_at) / 60 as minutes from session where token_hash = (${sessionOf})`))[0]
        .minutes;
    // Signed in: it ends after 120 idle minutes, not after 12 hours.
    expect(Number(await left())).toBeGreaterThan(118);
    expect(Number(await left())).toBeLessThanOrEqual(120);
    // Nearly idle out, then used: it moves on to 120 minutes from now.
    await sql(`update session set expires_at = now(3) + interval 30 second where token_hash = (${sessionOf})`);
    await http().get('/api/auth/me').set('cookie', cookie).expect(200);
    expect(Number(await left())).toBeGreaterThan(118);
    // Signed in nearly 12 hours ago: used now, it still ends 12 hours after sign-in.
    await sql(
      `update session set created_at = now() - interval 12 hour + interval 10 minute, expires_at = now(3) + interval 30 second where token_hash = (${sessionOf})`,
    );
    await http().get('/api/auth/me').set('cookie', cookie).expect(200);
    expect(Number(await left())).toBeLessThanOrEqual(10.1);
    // Its end at that cap, further use writes nothing more (the end cannot move).
    const slide = vi.spyOn(SessionRepository.prototype, 'slide');
    await http().get('/api/auth/me').set('cookie', cookie).expect(200);
    await http().get('/api/auth/me').set('cookie', cookie).expect(200);
    expect(slide).not.toHaveBeenCalled();
    slide.mockRestore();
    // Idle past its end: signed out.
    await sql(`update session set expires_at = now(3) - interval 1 second where token_hash = (${sessionOf})`);
    await http().get('/api/auth/me').set('cookie', cookie).expect(401);
  });

  it('lets an office of 20 behind one address sign in within a minute: good sign-ins never count', async () => {
    const em = app.get(EntityManager).fork();
    const firm = await register();
    const hash = await app.get(PasswordService).hash(PASSWORD);
    const emails = Array.from({ length: 20 }, () => uniqueEmail('office'));
    const [{ id: firmId }] = await em
      .getConnection()
      .execute<{ id: string }[]>('select firm_id as id from membership m join app_user u on u.id = m.user_id where u.email = ?', [firm.email]);
    for (const email of emails) {
      const user = new User(email, 'Office person', hash);
      em.persist([user, new Membership(em.getReference(Firm, firmId), user, ['engineer'])]);
    }
    await em.flush();
    // Everyone arrives at nine, twice over (a second tab), from the office's one address.
    for (const email of [...emails, ...emails])
      await http().post('/api/auth/login').set(CSRF_HEADER, '1').set('x-forwarded-for', '198.51.100.20').send({ email, password: PASSWORD }).expect(200);
  });

  it('slows guessing one account from one address without locking its owner out from elsewhere, and limits failures per address', async () => {
    const { email } = await register();
    const from = (ip: string, password: string) => http().post('/api/auth/login').set(CSRF_HEADER, '1').set('x-forwarded-for', ip).send({ email, password });
    for (let k = 0; k < 5; k++) await from('203.0.113.7', 'guessed wrong!!').expect(401);
    await from('203.0.113.7', PASSWORD).expect(429); // even the right password waits at the guessing address
    await from('198.51.100.44', PASSWORD).expect(200); // the owner, elsewhere, is not locked out
    // A good sign-in clears the account's failures from its own address.
    const office = '198.51.100.45';
    for (let k = 0; k < 4; k++) await from(office, 'typo in it!!').expect(401);
    await from(office, PASSWORD).expect(200);
    for (let k = 0; k < 4; k++) await from(office, 'typo in it!!').expect(401);
    await from(office, PASSWORD).expect(200);
    // Failures per address (30 a minute by default), whatever the accounts tried.
    const spray = '203.0.113.99';
    for (let k = 0; k < 30; k++)
      await http()
        .post('/api/auth/login')
        .set(CSRF_HEADER, '1')
        .set('x-forwarded-for', spray)
        .send({ email: uniqueEmail('sprayed'), password: 'spray-and-pray!' })
        .expect(401);
    const refused = await http().post('/api/auth/login').set(CSRF_HEADER, '1').set('x-forwarded-for', spray).send({ email, password: PASSWORD }).expect(429);
    expect(refused.body.message).toMatch(/Too many failed sign-ins/);
  });

  it('refuses a new password longer than bcrypt reads (72 bytes of UTF-8), with the reason', async () => {
    const tooLong = 'ü'.repeat(37); // 37 characters, 74 bytes
    const res = await http()
      .post('/api/auth/register')
      .set(CSRF_HEADER, '1')
      .send({ firmName: 'Long Pass Ltd', name: 'Lena Long', email: uniqueEmail('long'), password: tooLong })
      .expect(400);
    expect(res.body.message).toMatch(/password must be at most 72 bytes/);
    await http()
      .post('/api/auth/register')
      .set(CSRF_HEADER, '1')
      .send({ firmName: 'Long Pass Ltd', name: 'Lena Long', email: uniqueEmail('long'), password: 'ü'.repeat(36) })
      .expect(202);
  });

  it("takes a reset link once when it is used twice at the same moment, and revokes the account's other links", async () => {
    const { email } = await register();
    for (let k = 0; k < 2; k++) await http().post('/api/auth/forgot-password').set(CSRF_HEADER, '1').send({ email }).expect(202);
    const em = app.get(EntityManager).fork();
    const deadline = Date.now() + 5000;
    let mails: SinkMessage[] = [];
    while (mails.length < 2 && Date.now() < deadline) {
      mails = ((await (await fetch(`${process.env.MAIL_API_URL}/messages?to=${encodeURIComponent(email)}`)).json()) as SinkMessage[]).filter((m) =>
        m.subject.includes('Reset'),
      );
      if (mails.length < 2) await new Promise((r) => setTimeout(r, 100));
    }
    const [first, second] = mails.map((m) => /token=([\w-]+)/.exec(m.text)![1]);
    const both = await Promise.all(
      [1, 2].map((k) =>
        http()
          .post('/api/auth/reset-password')
          .set(CSRF_HEADER, '1')
          .send({ token: first, password: `simultaneous passphrase ${k}` }),
      ),
    );
    expect(both.map((r) => r.status).sort()).toEqual([204, 400]);
    // The other link of the same account no longer works.
    expect(
      (await http().post('/api/auth/reset-password').set(CSRF_HEADER, '1').send({ token: second, password: 'a third passphrase' }).expect(400)).body.code,
    ).toBe('RESET_INVALID');
    const rows = await em
      .getConnection()
      .execute<{ open: number }[]>(
        'select count(*) as open from password_reset r join app_user u on u.id = r.user_id where u.email = ? and r.used_at is null',
        [email],
      );
    expect(Number(rows[0].open)).toBe(0);
  });

  it('resets a password by an e-mailed single-use link, answering the same for unknown addresses', async () => {
    const { email, cookie } = await register();
    const unknown = await http()
      .post('/api/auth/forgot-password')
      .set(CSRF_HEADER, '1')
      .send({ email: uniqueEmail('nobody') })
      .expect(202);
    const known = await http().post('/api/auth/forgot-password').set(CSRF_HEADER, '1').send({ email }).expect(202);
    expect(known.body).toEqual(unknown.body);
    const mail = await waitForMail(email, (m) => m.subject.includes('Reset'));
    expect(mail.text).toContain('Probe Consulting');
    const token = /token=([\w-]+)/.exec(mail.text)![1];
    await http().post('/api/auth/reset-password').set(CSRF_HEADER, '1').send({ token, password: 'a brand new passphrase' }).expect(204);
    const again = await http().post('/api/auth/reset-password').set(CSRF_HEADER, '1').send({ token, password: 'another new passphrase' }).expect(400);
    expect(again.body.code).toBe('RESET_INVALID');
    await http().get('/api/auth/me').set('cookie', cookie).expect(401); // old sessions end
    await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email, password: 'a brand new passphrase' }).expect(200);
  });

  it('invites a member by e-mail; accepting sets the password and signs in with the roles given', async () => {
    const owner = await register();
    const invitee = uniqueEmail('checker');
    const sent = await http()
      .post('/api/invitations')
      .set('cookie', owner.cookie)
      .set(CSRF_HEADER, owner.csrf)
      .send({ email: invitee, roles: ['engineer', 'checker'] })
      .expect(201);
    expect(sent.body).toMatchObject({ email: invitee, roles: ['engineer', 'checker'], acceptedAt: null });
    const mail = await waitForMail(invitee, (m) => m.subject.includes('invites you'));
    expect(mail.subject).toBe('Probe Consulting invites you to Ampwright');
    expect(mail.html).toContain('Probe Consulting');
    const token = /token=([\w-]+)/.exec(mail.text)![1];
    const preview = await http().get(`/api/invitations/preview?token=${token}`).expect(200);
    expect(preview.body).toEqual({ firm: 'Probe Consulting', email: invitee, roles: ['engineer', 'checker'], hasAccount: false });
    const accepted = await http().post('/api/invitations/accept').set(CSRF_HEADER, '1').send({ token, name: 'Cai Checker', password: PASSWORD }).expect(200);
    const me = await http().get('/api/auth/me').set('cookie', cookieFrom(accepted)).expect(200);
    expect(me.body).toMatchObject({ user: { email: invitee, name: 'Cai Checker' }, firm: { name: 'Probe Consulting' }, roles: ['engineer', 'checker'] });
    await http().post('/api/invitations/accept').set(CSRF_HEADER, '1').send({ token, name: 'Again', password: PASSWORD }).expect(400);
    // An accepted invitation is not withdrawn: the member is removed instead.
    const late = await http().delete(`/api/invitations/${sent.body.id}`).set('cookie', owner.cookie).set(CSRF_HEADER, owner.csrf).expect(409);
    expect(late.body.message).toMatch(/accepted already/);
  });

  it('lets the owner withdraw an invitation, whose link then no longer works', async () => {
    const owner = await register();
    const invitee = uniqueEmail('withdrawn');
    const sent = await http()
      .post('/api/invitations')
      .set('cookie', owner.cookie)
      .set(CSRF_HEADER, owner.csrf)
      .send({ email: invitee, roles: ['engineer'] })
      .expect(201);
    const token = /token=([\w-]+)/.exec((await waitForMail(invitee, (m) => m.subject.includes('invites you'))).text)![1];
    const withdrawn = await http().delete(`/api/invitations/${sent.body.id}`).set('cookie', owner.cookie).set(CSRF_HEADER, owner.csrf).expect(200);
    expect(withdrawn.body.revokedAt).toEqual(expect.any(String));
    const refused = await http().post('/api/invitations/accept').set(CSRF_HEADER, '1').send({ token, name: 'Too Late', password: PASSWORD }).expect(400);
    expect(refused.body.message).toMatch(/been withdrawn/);
    await http().get(`/api/invitations/preview?token=${token}`).expect(400);
    await http().delete(`/api/invitations/${sent.body.id}`).set('cookie', owner.cookie).set(CSRF_HEADER, owner.csrf).expect(409);
    const audit = await app.get(EntityManager).fork().find(AuditEvent, { email: invitee, type: 'invitation-revoked' });
    expect(audit).toHaveLength(1);
  });

  it('lets the owner change roles and remove members, keeps at least one owner, and audits role changes', async () => {
    const owner = await makeCaller(app, ['owner']);
    const member = await makeCaller(app, ['engineer'], owner.firm);
    const list = await as(app, owner, 'get', '/api/members').expect(200);
    const memberRow = list.body.find((m: { user: { email: string } }) => m.user.email === member.user.email);
    const ownerRow = list.body.find((m: { user: { email: string } }) => m.user.email === owner.user.email);
    await as(app, owner, 'patch', `/api/members/${memberRow.id}`)
      .send({ roles: ['engineer', 'approver'] })
      .expect(200);
    expect((await audit(member.user.email)).map((e) => e.type)).toContain('role-changed');
    const last = await as(app, owner, 'patch', `/api/members/${ownerRow.id}`)
      .send({ roles: ['engineer'] })
      .expect(409);
    expect(last.body.code).toBe('LAST_OWNER');
    await as(app, owner, 'delete', `/api/members/${memberRow.id}`).expect(204);
    await as(app, member, 'get', '/api/auth/me').expect(401);
  });

  it("shows another firm's member ids as not found", async () => {
    const a = await makeCaller(app, ['owner']);
    const b = await makeCaller(app, ['engineer']);
    const bRow = (await as(app, b, 'get', '/api/members').expect(200)).body[0];
    await as(app, a, 'patch', `/api/members/${bRow.id}`)
      .send({ roles: ['engineer'] })
      .expect(404);
    await as(app, a, 'delete', `/api/members/${bRow.id}`).expect(404);
  });

  it('seeds the demo people with the documented password', async () => {
    const res = await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email: 'checker@northfold.example', password: DEMO_PASSWORD }).expect(200);
    expect(res.body).toMatchObject({ firm: { name: 'Northfold Engineering' }, roles: ['engineer', 'checker'] });
  });
});
