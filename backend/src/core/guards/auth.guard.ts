import { createHash, timingSafeEqual } from 'node:crypto';
import { EntityManager } from '@mikro-orm/core';
import { CanActivate, ExecutionContext, HttpStatus, Injectable } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { Request } from 'express';
import { Session } from '../../auth/entities/session.entity';
import { Membership } from '../../firms/entities/membership.entity';
import { ACCESS_KEY, type AccessRule } from '../decorators/access.decorator';
import { AppException, ErrorCode } from '../errors/app-exception';
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
  constructor(
    private readonly reflector: Reflector,
    private readonly em: EntityManager,
  ) {}

  async canActivate(context: ExecutionContext): Promise<boolean> {
    const rule = this.reflector.getAllAndOverride<AccessRule | undefined>(ACCESS_KEY, [context.getHandler(), context.getClass()]);
    const req = context.switchToHttp().getRequest<Request & { auth?: AuthContext }>();
    if (!rule) throw new AppException(ErrorCode.Forbidden, 'This route has no access rule, so it is closed.', HttpStatus.FORBIDDEN);
    const mutating = !SAFE_METHODS.has(req.method);
    const csrf = req.get(CSRF_HEADER);

    if (rule.kind === 'public') {
      if (mutating && !csrf) throw new AppException('CSRF_FAILED', 'The request is missing its anti-forgery header. Reload the page and try again.', HttpStatus.FORBIDDEN);
      await this.attach(req).catch(() => undefined);
      return true;
    }

    const auth = await this.attach(req);
    if (!auth) throw new AppException(ErrorCode.Unauthenticated, 'Sign in to continue.', HttpStatus.UNAUTHORIZED);
    if (mutating && (!csrf || !sameToken(csrf, auth.session.csrfToken))) {
      throw new AppException('CSRF_FAILED', 'The request is missing its anti-forgery token. Reload the page and try again.', HttpStatus.FORBIDDEN);
    }
    if (rule.kind === 'roles' && !rule.roles.some((r) => auth.roles.includes(r))) {
      throw new AppException(ErrorCode.Forbidden, `This needs one of the roles: ${rule.roles.join(', ')}.`, HttpStatus.FORBIDDEN);
    }
    return true;
  }

  /** Reads the session cookie; sets req.auth when it names a live session. */
  private async attach(req: Request & { auth?: AuthContext }): Promise<AuthContext | undefined> {
    const token = (req.cookies as Record<string, string> | undefined)?.[SESSION_COOKIE];
    if (!token || token.length > 200) return undefined;
    const session = await this.em.findOne(Session, { tokenHash: hashToken(token) }, { populate: ['user', 'firm'] });
    if (!session || session.expiresAt.getTime() < Date.now()) return undefined;
    const membership = await this.em.findOne(Membership, { firm: session.firm, user: session.user });
    if (!membership) return undefined;
    req.auth = { session, membership, roles: membership.roles };
    return req.auth;
  }
}
