import { randomBytes } from 'node:crypto';
import { EntityManager } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { Response } from 'express';
import type { Environment } from '../config/environment';
import { hashToken, SESSION_COOKIE } from '../core/guards/auth.guard';
import { Firm } from '../firms/entities/firm.entity';
import { User } from '../users/entities/user.entity';
import { Session } from './entities/session.entity';

export const newToken = () => randomBytes(32).toString('base64url');

/** Sessions live in MariaDB (any app server can serve any session); the cookie carries the token. */
@Injectable()
export class SessionsService {
  private readonly hours: number;
  private readonly idleMinutes: number;
  private readonly secure: boolean;

  constructor(
    private readonly em: EntityManager,
    config: ConfigService<Environment, true>,
  ) {
    this.hours = config.get('SESSION_HOURS', { infer: true });
    this.idleMinutes = config.get('SESSION_IDLE_MINUTES', { infer: true });
    this.secure = config.get('COOKIE_SECURE', { infer: true }) === 'true';
  }

  /** Opens a session, and clears out sessions that have expired (anyone's), so the table does not grow. */
  async open(user: User, firm: Firm, res: Response): Promise<Session> {
    await this.em.nativeDelete(Session, { expiresAt: { $lt: new Date() } });
    const token = newToken();
    // Idle out first; the auth guard moves the end on at each use, up to SESSION_HOURS from now.
    const session = new Session(hashToken(token), user, firm, newToken(), new Date(Date.now() + Math.min(this.hours * 60, this.idleMinutes) * 60_000));
    await this.em.persist(session).flush();
    res.cookie(SESSION_COOKIE, token, { httpOnly: true, sameSite: 'lax', secure: this.secure, path: '/', maxAge: this.hours * 3600_000 });
    return session;
  }

  async close(tokenHash: string, res: Response): Promise<void> {
    await this.em.nativeDelete(Session, { tokenHash });
    res.clearCookie(SESSION_COOKIE, { path: '/' });
  }

  async closeAllOf(user: User): Promise<void> {
    await this.em.nativeDelete(Session, { user });
  }
}
