import type { INestApplication } from '@nestjs/common';
import { EntityManager } from '@mikro-orm/core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../src/audit/entities/audit-event.entity';
import { Session } from '../src/auth/entities/session.entity';
import { CSRF_HEADER } from '../src/core/guards/auth.guard';
import { DEMO_PASSWORD } from '../src/database/seeders/demo.seeder';
import { as, cookieFrom, makeCaller, uniqueEmail } from './support/sessions';
import { createTestApp, waitForMail } from './support/test-app';

const PASSWORD = 'correct horse battery';

describe('accounts: register, sign in, sessions, reset, invitations, members', () => {
  let app: INestApplication;
  const http = () => request(app.getHttpServer());
  const audit = (email: string) => app.get(EntityManager).fork().find(AuditEvent, { email }, { orderBy: { createdAt: 'asc' } });

  beforeAll(async () => {
    app = await createTestApp();
  });
  afterAll(async () => {
    await app?.close();
  });

  async function register(email = uniqueEmail('owner')) {
    const res = await http().post('/api/auth/register').set(CSRF_HEADER, '1').send({ firmName: 'Probe Consulting', name: 'Olu Owner', email, password: PASSWORD }).expect(201);
    return { email, cookie: cookieFrom(res), csrf: res.body.csrfToken as string, body: res.body };
  }

  it('registers a firm whose first user is its owner, with an httpOnly SameSite=Lax session cookie', async () => {
    const email = uniqueEmail('owner');
    const res = await http().post('/api/auth/register').set(CSRF_HEADER, '1').send({ firmName: 'Probe Consulting', name: 'Olu Owner', email, password: PASSWORD }).expect(201);
    expect(res.body).toMatchObject({ user: { email }, firm: { name: 'Probe Consulting' }, roles: ['owner'] });
    const setCookie = String(res.headers['set-cookie']);
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Lax/i);
    const me = await http().get('/api/auth/me').set('cookie', cookieFrom(res)).expect(200);
    expect(me.body.user.email).toBe(email);
    expect(JSON.stringify(res.body)).not.toContain('passwordHash');
  });

  it('refuses a short password and a taken address with clear messages', async () => {
    const short = await http().post('/api/auth/register').set(CSRF_HEADER, '1').send({ firmName: 'X Ltd', name: 'X', email: uniqueEmail('x'), password: 'short' }).expect(400);
    expect(short.body.details).toEqual([{ field: 'password', message: 'password must be at least 12 characters' }]);
    const { email } = await register();
    const taken = await http().post('/api/auth/register').set(CSRF_HEADER, '1').send({ firmName: 'Y Ltd', name: 'Y', email, password: PASSWORD }).expect(409);
    expect(taken.body.code).toBe('EMAIL_TAKEN');
  });

  it('signs in, records sign-ins and failures, and signs out', async () => {
    const { email } = await register();
    const bad = await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email, password: 'wrong password!!' }).expect(401);
    expect(bad.body).toMatchObject({ code: 'BAD_CREDENTIALS', message: 'The e-mail address or the password is not right.' });
    const ok = await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email: email.toUpperCase(), password: PASSWORD }).expect(200);
    const cookie = cookieFrom(ok);
    await http().post('/api/auth/logout').set('cookie', cookie).set(CSRF_HEADER, ok.body.csrfToken).expect(204);
    await http().get('/api/auth/me').set('cookie', cookie).expect(401);
    expect((await audit(email)).map((e) => e.type)).toEqual(['firm-registered', 'sign-in-failed', 'sign-in', 'sign-out']);
  });

  it('answers an unknown address exactly as a wrong password', async () => {
    const res = await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email: uniqueEmail('nobody'), password: PASSWORD }).expect(401);
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
    expect(res.body).toMatchObject({ code: 'TOO_MANY_REQUESTS', message: 'Too many attempts: wait a minute and try again.' });
  });

  it('counts sign-in attempts across app instances: 3 on one and 2 on another use up the 5 of an account', async () => {
    const other = await createTestApp();
    try {
      const email = uniqueEmail('shared-throttle');
      const attempt = (server: INestApplication) => request(server.getHttpServer()).post('/api/auth/login').set(CSRF_HEADER, '1').send({ email, password: 'wrong password!!' });
      for (let k = 0; k < 3; k++) expect((await attempt(app)).status).toBe(401);
      for (let k = 0; k < 2; k++) expect((await attempt(other)).status).toBe(401);
      expect((await attempt(app)).status).toBe(429);
      const blocked = await attempt(other);
      expect(blocked.status).toBe(429);
      expect(Number(blocked.headers['retry-after-account'])).toBeGreaterThan(0);
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

  it('resets a password by an e-mailed single-use link, answering the same for unknown addresses', async () => {
    const { email, cookie } = await register();
    const unknown = await http().post('/api/auth/forgot-password').set(CSRF_HEADER, '1').send({ email: uniqueEmail('nobody') }).expect(202);
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
    const sent = await http().post('/api/invitations').set('cookie', owner.cookie).set(CSRF_HEADER, owner.csrf).send({ email: invitee, roles: ['engineer', 'checker'] }).expect(201);
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
  });

  it('lets the owner change roles and remove members, keeps at least one owner, and audits role changes', async () => {
    const owner = await makeCaller(app, ['owner']);
    const member = await makeCaller(app, ['engineer'], owner.firm);
    const list = await as(app, owner, 'get', '/api/members').expect(200);
    const memberRow = list.body.find((m: { user: { email: string } }) => m.user.email === member.user.email);
    const ownerRow = list.body.find((m: { user: { email: string } }) => m.user.email === owner.user.email);
    await as(app, owner, 'patch', `/api/members/${memberRow.id}`).send({ roles: ['engineer', 'approver'] }).expect(200);
    expect((await audit(member.user.email)).map((e) => e.type)).toContain('role-changed');
    const last = await as(app, owner, 'patch', `/api/members/${ownerRow.id}`).send({ roles: ['engineer'] }).expect(409);
    expect(last.body.code).toBe('LAST_OWNER');
    await as(app, owner, 'delete', `/api/members/${memberRow.id}`).expect(204);
    await as(app, member, 'get', '/api/auth/me').expect(401);
  });

  it('shows another firm\'s member ids as not found', async () => {
    const a = await makeCaller(app, ['owner']);
    const b = await makeCaller(app, ['engineer']);
    const bRow = (await as(app, b, 'get', '/api/members').expect(200)).body[0];
    await as(app, a, 'patch', `/api/members/${bRow.id}`).send({ roles: ['engineer'] }).expect(404);
    await as(app, a, 'delete', `/api/members/${bRow.id}`).expect(404);
  });

  it('seeds the demo people with the documented password', async () => {
    const res = await http().post('/api/auth/login').set(CSRF_HEADER, '1').send({ email: 'checker@northfold.example', password: DEMO_PASSWORD }).expect(200);
    expect(res.body).toMatchObject({ firm: { name: 'Northfold Engineering' }, roles: ['engineer', 'checker'] });
  });
});
