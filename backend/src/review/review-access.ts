/**
 * The server's side of the workflow rulebook (common/src/review/workflow.ts): the facts of a locked
 * sheet and the person acting, and a refusal turned into the API's error. Each refusal says why.
 */
import { checkerRefusal, refusalOf, stateRefusal, type SheetFacts, type SheetState, type WorkflowMove } from '@ampwright/common';
import { actorOf, enforce } from '../core/errors/refusal';
import type { AuthContext } from '../core/guards/auth.guard';
import type { Sheet } from '../sheets/entities/sheet.entity';

/** The workflow's error codes under the name the review module has always used. */

/** The rulebook's facts of a sheet whose preparer, checker and approver are loaded. */
export function factsOf(sheet: Sheet, authors: ReadonlyMap<string, string>, openQueries = 0): SheetFacts {
  const person = (u: { id: string; name: string } | undefined) => (u ? { id: u.id, name: u.name } : null);
  return {
    state: sheet.state as SheetState,
    preparer: person(sheet.preparer)!,
    checker: person(sheet.checker),
    approver: person(sheet.approver),
    authors,
    openQueries,
  };
}

/** Refuses a move of the workflow the rulebook does not allow this person now. */
export function requireMove(move: WorkflowMove, auth: AuthContext, facts: SheetFacts, choice?: { checkerId?: string; approverId?: string }): void {
  enforce(refusalOf(move, facts, actorOf(auth), choice));
}

export function requireState(sheet: Sheet, allowed: SheetState[], action: string): void {
  enforce(stateRefusal(sheet.state as SheetState, allowed, action));
}

export const isUser = (auth: AuthContext, user: { id: string } | undefined | null) => !!user && user.id === auth.user.id;

export function requireChecker(auth: AuthContext, sheet: Sheet, action: string): void {
  enforce(checkerRefusal(sheet, actorOf(auth), action));
}
