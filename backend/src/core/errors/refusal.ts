/** A refusal of the workflow rulebook (common/src/review/workflow.ts) as the API's error. */
import { HttpStatus } from '@nestjs/common';
import type { Actor, Refusal } from '@ampwright/common';
import type { AuthContext } from '../guards/auth.guard';
import { AppException } from './app-exception';

const STATUS: Record<Refusal['kind'], HttpStatus> = { conflict: HttpStatus.CONFLICT, forbidden: HttpStatus.FORBIDDEN, invalid: HttpStatus.BAD_REQUEST };

/** Throws the refusal, if there is one. */
export function enforce(refusal: Refusal | undefined): void {
  if (refusal) throw new AppException(refusal.code, refusal.message, STATUS[refusal.kind], refusal.details);
}

/** The person acting, as the rulebook sees them. */
export const actorOf = (auth: AuthContext): Actor => ({ id: auth.session.user.id, name: auth.session.user.name, roles: auth.roles });
