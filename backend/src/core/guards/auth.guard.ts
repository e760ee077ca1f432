import { createHash, timingSafeEqual } from 'node:crypto';
import { EntityManager } from '@mikro-orm/mariadb';
import { CanActivate, ExecutionContext, Injectable } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { ConfigService } from '@nestjs/config';
import type { Environment } from '../../config/environment';
import type { Request } from 'express';
import { Session } from '../../auth/entities/session.entity';
import { Firm } from '../../firms/entities/firm.entity';
import { Membership } from '../../firms/entities/membership.entity';
import { User } from '../../users/entities/user.entity';
import { ACCESS_KEY, type AccessRule } from '../decorators/access.decorator';
import { ErrorCode, RequestException } from '../errors/app-exception';
import type { Role } from '../roles';

export const SESSION_COOKIE = 'aw_session';
export const CSRF_HEADER = 'x-ampwright-csrf';

export interface AuthContext {
  session: Session;
  membership: Membership;
  roles: Role[];
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
   * query for the session, its user, firm and membership (this runs for every request), mapped into
   * the request's entity manager as if each had been loaded.
   */
  private async attach(req: Request & { auth?: AuthContext }): Promise<AuthContext | undefined> {
    const token = (req.cookies as Record<string, string> | undefined)?.[SESSION_COOKIE];
    if (!token || token.length > 200) return undefined;
    const sessions = this.em.getRepository(Session);
    const row = await sessions.live(hashToken(token));
    if (!row || new Date(row.expires_at).getTime() < Date.now()) return undefined;
    // Sliding sessions: each use moves the end to SESSION_IDLE_MINUTES from now, never past SESSION_HOURS
    // from sign-in. Written at most once a minute a session, not at every request.
    if (new Date(row.expires_at).getTime() - Date.now() < this.idleMinutes * 60_000 - 60_000) {
      await sessions.slide(row.token_hash, this.hours, this.idleMinutes);
    }
    this.em.map(User, { id: row.user_id, email: row.u_email, name: row.u_name, password_hash: row.u_password_hash, created_at: row.u_created_at });
    this.em.map(Firm, { id: row.firm_id, name: row.f_name, created_at: row.f_created_at });
    const session = this.em.map(Session, {
      token_hash: row.token_hash,
      user_id: row.user_id,
      firm_id: row.firm_id,
      csrf_token: row.csrf_token,
      created_at: row.created_at,
      expires_at: row.expires_at,
    });
    const roles = (typeof row.m_roles === 'string' ? JSON.parse(row.m_roles) : row.m_roles) as Role[];
    const membership = this.em.map(Membership, { id: row.m_id, firm_id: row.firm_id, user_id: row.user_id, roles, created_at: row.m_created_at });
    req.auth = { session, membership, roles: membership.roles };
    return req.auth;
  }
}
