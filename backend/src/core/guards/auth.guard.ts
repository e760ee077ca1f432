import { createHash, timingSafeEqual } from 'node:crypto';
import { EntityManager } from '@mikro-orm/mariadb';
import { CanActivate, ExecutionContext, Injectable } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { ConfigService } from '@nestjs/config';
import type { Environment } from '../../config/environment';
import type { Request } from 'express';
import { Session } from '../../auth/entities/session.entity';
import { ACCESS_KEY, type AccessRule } from '../decorators/access.decorator';
import { ErrorCode, RequestException } from '../errors/app-exception';
import type { Role } from '../roles';

export const SESSION_COOKIE = 'aw_session';
export const CSRF_HEADER = 'x-ampwright-csrf';

/**
 * Who is asking, as every request carries it: plain facts read with the session in one query (no entities
 * are made per request). Where an entity is needed, `em.getReference(User, auth.user.id)`.
 */
export interface AuthContext {
  user: { id: string; name: string; email: string };
  firm: { id: string; name: string };
  roles: Role[];
  session: { tokenHash: string; csrfToken: string };
}

/** The context of a session just opened (sign-in, registration). */
export function authContextOf(session: Pick<Session, 'tokenHash' | 'csrfToken' | 'user' | 'firm'>, roles: Role[]): AuthContext {
  return {
    user: { id: session.user.id, name: session.user.name, email: session.user.email },
    firm: { id: session.firm.id, name: session.firm.name },
    roles,
    session: { tokenHash: session.tokenHash, csrfToken: session.csrfToken },
  };
}

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

function sameToken(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/**
 * Default deny. Every route declares @Public(), @SignedIn() or @Roles(...); a route without a rule is
 * refused. State-changing requests carry the CSRF header: the session's token when signed in, any value
 * on public routes (a cross-site form cannot set a custom header, and we answer no CORS preflight).
 */
@Injectable()
export class AuthGuard implements CanActivate {
  private readonly idleMinutes: number;
  private readonly hours: number;

  constructor(
    private readonly reflector: Reflector,
    private readonly em: EntityManager,
    config: ConfigService<Environment, true>,
  ) {
    this.idleMinutes = config.get('SESSION_IDLE_MINUTES', { infer: true });
    this.hours = config.get('SESSION_HOURS', { infer: true });
  }

  async canActivate(context: ExecutionContext): Promise<boolean> {
    const rule = this.reflector.getAllAndOverride<AccessRule | undefined>(ACCESS_KEY, [context.getHandler(), context.getClass()]);
    const req = context.switchToHttp().getRequest<Request & { auth?: AuthContext }>();
    if (!rule) throw new RequestException(ErrorCode.Forbidden, 'This route has no access rule, so it is closed.');
    const mutating = !SAFE_METHODS.has(req.method);
    const csrf = req.get(CSRF_HEADER);

    if (rule.kind === 'public') {
      if (mutating && !csrf) throw new RequestException(ErrorCode.CsrfFailed, 'The request is missing its anti-forgery header. Reload the page and try again.');
      await this.attach(req).catch(() => undefined);
      return true;
    }

    const auth = await this.attach(req);
    if (!auth) throw new RequestException(ErrorCode.Unauthenticated, 'Sign in to continue.');
    if (mutating && (!csrf || !sameToken(csrf, auth.session.csrfToken))) {
      throw new RequestException(ErrorCode.CsrfFailed, 'The request is missing its anti-forgery token. Reload the page and try again.');
    }
    if (rule.kind === 'roles' && !rule.roles.some((r) => auth.roles.includes(r))) {
      throw new RequestException(ErrorCode.Forbidden, `This needs one of the roles: ${rule.roles.join(', ')}.`);
    }
    return true;
  }

  /**
   * Reads the session cookie; sets req.auth when it names a live session of a current member. One
   * query for the session, its user, firm and membership (this runs for every request).
   */
  private async attach(req: Request & { auth?: AuthContext }): Promise<AuthContext | undefined> {
    const token = (req.cookies as Record<string, string> | undefined)?.[SESSION_COOKIE];
    if (!token || token.length > 200) return undefined;
    const sessions = this.em.getRepository(Session);
    const row = await sessions.live(hashToken(token));
    if (!row || new Date(row.expires_at).getTime() < Date.now()) return undefined;
    // Sliding sessions: each use moves the end to SESSION_IDLE_MINUTES from now, never past SESSION_HOURS
    // from sign-in. Written at most once a minute a session, not at every request, and no more once the end
    // has reached that cap (it cannot move).
    const ends = new Date(row.expires_at).getTime();
    const cap = new Date(row.created_at).getTime() + this.hours * 3_600_000;
    if (ends < cap && ends - Date.now() < this.idleMinutes * 60_000 - 60_000) {
      await sessions.slide(row.token_hash, this.hours, this.idleMinutes);
    }
    const roles = (typeof row.m_roles === 'string' ? JSON.parse(row.m_roles) : row.m_roles) as Role[];
    req.auth = {
      user: { id: row.user_id, name: row.u_name, email: row.u_email },
      firm: { id: row.firm_id, name: row.f_name },
      roles,
      session: { tokenHash: row.token_hash, csrfToken: row.csrf_token },
    };
    return req.auth;
  }
}
