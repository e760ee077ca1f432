/**
 * The server's side of the workflow rulebook (common/src/review/workflow.ts): the facts of a locked
 * sheet and the person acting, and a refusal turned into the API's error. Each refusal says why.
 */
import { HttpStatus } from '@nestjs/common';
import { STATE_WORDS, WorkflowCode, refusalOf, type SheetFacts, type SheetState, type WorkflowMove } from '@ampwright/common';
import { AppException } from '../core/errors/app-exception';
import { actorOf, enforce } from '../core/errors/refusal';
import type { AuthContext } from '../core/guards/auth.guard';
import type { Sheet } from '../sheets/entities/sheet.entity';

/** The workflow's error codes under the name the review module has always used. */
export { WorkflowCode as ReviewErrorCode };

/** The rulebook's facts of a sheet whose preparer, checker and approver are loaded. */
export function factsOf(sheet: Sheet, authors: ReadonlyMap<string, string>, openQueries = 0): SheetFacts {
  const person = (u: { id: string; name: string } | undefined) => (u ? { id: u.id, name: u.name } : null);
  return { state: sheet.state as SheetState, preparer: person(sheet.preparer)!, checker: person(sheet.checker), approver: person(sheet.approver), authors, openQueries };
}

/** Refuses a move of the workflow the rulebook does not allow this person now. */
export function requireMove(move: WorkflowMove, auth: AuthContext, facts: SheetFacts, choice?: { checkerId?: string; approverId?: string }): void {
  enforce(refusalOf(move, facts, actorOf(auth), choice));
}

export function requireState(sheet: Sheet, allowed: SheetState[], action: string): void {
  if (!allowed.includes(sheet.state as SheetState)) {
    throw new AppException(WorkflowCode.OutOfTurn, `You cannot ${action}: the sheet is ${STATE_WORDS[sheet.state as SheetState]}, and this needs it ${allowed.map((s) => STATE_WORDS[s]).join(' or ')}.`, HttpStatus.CONFLICT);
  }
}

export const isUser = (auth: AuthContext, user: { id: string } | undefined | null) => !!user && user.id === auth.session.user.id;

export function requireChecker(auth: AuthContext, sheet: Sheet, action: string): void {
  if (!isUser(auth, sheet.checker)) {
    throw new AppException(WorkflowCode.NotYours, `Only the sheet's assigned checker${sheet.checker ? ` (${sheet.checker.name})` : ''} can ${action}.`, HttpStatus.FORBIDDEN);
  }
}
