import { createParamDecorator, ExecutionContext } from '@nestjs/common';
import type { Request } from 'express';
import type { AuthContext } from '../guards/auth.guard';

/** The signed-in user, firm, roles and session of the request (set by the global AuthGuard). */
export const CurrentAuth = createParamDecorator((_data: unknown, ctx: ExecutionContext): AuthContext => {
  const req = ctx.switchToHttp().getRequest<Request & { auth?: AuthContext }>();
  return req.auth!;
});
