/** The rules of who may act on a sheet under review; each refusal says why. */
import { HttpStatus } from '@nestjs/common';
import type { SheetState } from '@ampwright/common';
import { AppException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import type { Sheet } from '../sheets/entities/sheet.entity';

export enum ReviewErrorCode {
  OutOfTurn = 'OUT_OF_TURN',
  NotYours = 'NOT_ASSIGNED',
  NotIndependent = 'NOT_INDEPENDENT',
  OpenQueries = 'OPEN_QUERIES',
  BadAssignee = 'BAD_ASSIGNEE',
  ResultsChanged = 'RESULTS_CHANGED',
}

export const STATE_WORDS: Record<SheetState, string> = {
  'being-prepared': 'being prepared',
  'with-checker': 'with the checker',
  checked: 'checked',
  approved: 'approved',
  issued: 'issued',
};

export function requireState(sheet: Sheet, allowed: SheetState[], action: string): void {
  if (!allowed.includes(sheet.state)) {
    throw new AppException(ReviewErrorCode.OutOfTurn, `You cannot ${action}: the sheet is ${STATE_WORDS[sheet.state as SheetState]}, and this needs it ${allowed.map((s) => STATE_WORDS[s]).join(' or ')}.`, HttpStatus.CONFLICT);
  }
}

export const isUser = (auth: AuthContext, user: { id: string } | undefined | null) => !!user && user.id === auth.session.user.id;

export function requireChecker(auth: AuthContext, sheet: Sheet, action: string): void {
  if (!isUser(auth, sheet.checker)) {
    throw new AppException(ReviewErrorCode.NotYours, `Only the sheet's assigned checker${sheet.checker ? ` (${sheet.checker.name})` : ''} can ${action}.`, HttpStatus.FORBIDDEN);
  }
}

export function requirePreparer(auth: AuthContext, sheet: Sheet, action: string): void {
  if (!isUser(auth, sheet.preparer)) throw new AppException(ReviewErrorCode.NotYours, `Only the sheet's preparer (${sheet.preparer.name}) can ${action}.`, HttpStatus.FORBIDDEN);
}

export function requireNotPreparer(auth: AuthContext, sheet: Sheet, action: string): void {
  if (isUser(auth, sheet.preparer)) throw new AppException(ReviewErrorCode.NotIndependent, `You prepared this sheet, so you cannot ${action}: checking and approval are done by someone else.`, HttpStatus.FORBIDDEN);
}

/**
 * Independent checking (common practice): the checker is none of the revision's authors (its preparer,
 * co-preparers and anyone whose save was stored); the approver is none of them and not the checker.
 */
export function requireIndependent(role: 'checker' | 'approver', person: { id: string; name?: string }, authors: ReadonlyMap<string, string>, checkerId?: string): void {
  const name = person.name ?? authors.get(person.id) ?? 'This person';
  if (authors.has(person.id)) {
    throw new AppException(
      ReviewErrorCode.NotIndependent,
      `${name} prepared or edited this revision, so cannot ${role === 'checker' ? 'check' : 'approve'} it: choose someone who had no hand in it.`,
      HttpStatus.BAD_REQUEST,
      [{ field: `${role}Id`, message: `${name} prepared or edited this revision` }],
    );
  }
  if (role === 'approver' && person.id === checkerId) {
    throw new AppException(ReviewErrorCode.NotIndependent, 'The checker cannot also approve it: the approver is a third person.', HttpStatus.BAD_REQUEST, [{ field: 'approverId', message: 'the checker cannot approve the sheet they checked' }]);
  }
}
