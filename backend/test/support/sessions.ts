import type { INestApplication } from '@nestjs/common';
import { EntityManager } from '@mikro-orm/core';
import request from 'supertest';
import { Session } from '../../src/auth/entities/session.entity';
import { newToken } from '../../src/auth/sessions.service';
import { hashToken, SESSION_COOKIE, CSRF_HEADER } from '../../src/core/guards/auth.guard';
import type { Role } from '../../src/core/roles';
import { Firm } from '../../src/firms/entities/firm.entity';
import { Membership } from '../../src/firms/entities/membership.entity';
import { User } from '../../src/users/entities/user.entity';

export interface Caller {
  cookie: string;
  csrf: string;
  user: User;
  firm: Firm;
}

let counter = 0;
/** A unique address per test run, so tests never collide with each other or with the seed. */
export const uniqueEmail = (tag: string) => `${tag}-${Date.now().toString(36)}-${counter++}@test.example`;

/** Creates a firm (or uses one), a user with roles in it, and a session, directly in the database. */
export async function makeCaller(app: INestApplication, roles: Role[], firm?: Firm): Promise<Caller> {
  const em = app.get(EntityManager).fork();
  const f = firm ? await em.findOneOrFail(Firm, firm.id) : em.create(Firm, { name: `Test firm ${counter++}` });
  const user = new User(uniqueEmail(roles.join('-') || 'none'), 'Test person', '$2b$04$invalidinvalidinvalidinvalidinvalidinvalidinvalidinv');
  const token = newToken();
  const csrf = newToken();
  em.persist([f, user, new Membership(f, user, roles), new Session(hashToken(token), user, f, csrf, new Date(Date.now() + 3600_000))]);
  await em.flush();
  return { cookie: `${SESSION_COOKIE}=${token}`, csrf, user, firm: f };
}

/** A request as a caller (or signed out), with the anti-forgery header a browser page would send. */
export function as(app: INestApplication, caller: Caller | undefined, method: 'get' | 'post' | 'patch' | 'put' | 'delete', path: string) {
  const r = request(app.getHttpServer())[method](path);
  if (caller) r.set('cookie', caller.cookie);
  if (method !== 'get') r.set(CSRF_HEADER, caller?.csrf ?? '1');
  return r;
}

/** The session cookie a response set, as a Cookie header value. */
export function cookieFrom(res: request.Response): string {
  const set = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const found = set.find((c) => c.startsWith(`${SESSION_COOKIE}=`));
  if (!found) throw new Error('no session cookie was set');
  return found.split(';')[0];
}

/** Reads a response body as bytes (for PDFs and downloads). */
export const binary = (res: request.Test) =>
  res.buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });
