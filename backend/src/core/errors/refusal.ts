/** A refusal of the workflow rulebook (common/src/review/workflow.ts) as the API's error. */
import type { Actor, Refusal } from '@ampwright/common';
import type { AuthContext } from '../guards/auth.guard';
import { WorkflowException } from './app-exception';

/** Throws the refusal, if there is one. */
export function enforce(refusal: Refusal | undefined): void {
  if (refusal) throw new WorkflowException(refusal);
}

/** The person acting, as the rulebook sees them. */
export const actorOf = (auth: AuthContext): Actor => ({ id: auth.user.id, name: auth.user.name, roles: auth.roles });
