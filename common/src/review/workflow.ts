/**
 * The review workflow's rulebook: the states of a sheet, the moves between them, who may make each
 * move, and why not. The server enforces it (inside the row lock of each move) and the app asks it
 * which buttons to offer, so the two cannot disagree. Pure: facts in, a decision out.
 *
 *   being prepared ──request-check──▶ with the checker ──pass──▶ checked ──approve──▶ approved ──issue──▶ issued
 *        ▲                                 │    ▲                    │                   │                  │
 *        └───────────return────────────────┘    └──return-to-checker─┴───────────────────┘                  │
 *        ▲                                                                                                  │
 *        └──────────────────────────────────────start-revision─────────────────────────────────────────────┘
 */
import type { SheetDto, SheetState } from '../api/projects';

/** The roles of PRODUCT.md. A member may hold several; a client holds only `client`. */
export const ROLES = ['owner', 'engineer', 'checker', 'approver', 'client'] as const;
export type Role = (typeof ROLES)[number];
export const MEMBER_ROLES: readonly Role[] = ['owner', 'engineer', 'checker', 'approver'];
/** Who may write sheets: create them, edit cells, upload attachments, ask for a check. */
export const SHEET_EDITORS: readonly Role[] = ['owner', 'engineer'];

export const STATE_WORDS: Record<SheetState, string> = {
  'being-prepared': 'being prepared',
  'with-checker': 'with the checker',
  checked: 'checked',
  approved: 'approved',
  issued: 'issued',
};

/** The states in which cells may be changed (the checker marks up while the sheet is with them). */
export const EDITABLE_STATES: readonly SheetState[] = ['being-prepared', 'with-checker'];
export const isEditable = (state: SheetState) => EDITABLE_STATES.includes(state);

export type WorkflowMove = 'request-check' | 'return' | 'pass' | 'approve' | 'return-to-checker' | 'issue' | 'new-revision';

/** Each move: the states it starts from, the state it ends in, the roles that may make it. */
export const MOVES: Record<WorkflowMove, { from: readonly SheetState[]; to: SheetState; roles: readonly Role[]; doing: string }> = {
  'request-check': { from: ['being-prepared'], to: 'with-checker', roles: SHEET_EDITORS, doing: 'ask for a check' },
  return: { from: ['with-checker'], to: 'being-prepared', roles: ['checker'], doing: 'return the sheet' },
  pass: { from: ['with-checker'], to: 'checked', roles: ['checker'], doing: 'pass the check' },
  approve: { from: ['checked'], to: 'approved', roles: ['approver'], doing: 'approve the sheet' },
  'return-to-checker': { from: ['checked', 'approved'], to: 'with-checker', roles: ['approver', 'owner'], doing: 'return the sheet to its checker' },
  issue: { from: ['approved'], to: 'issued', roles: ['approver'], doing: 'issue a revision' },
  'new-revision': { from: ['issued'], to: 'being-prepared', roles: SHEET_EDITORS, doing: 'start a new revision' },
};

export interface Person {
  id: string;
  name: string;
}

/** What the rules need to know of a sheet. */
export interface SheetFacts {
  state: SheetState;
  preparer: Person;
  checker?: Person | null;
  approver?: Person | null;
  /** Everyone who prepared or edited this revision (preparer, co-preparers, anyone whose save was stored), id → name. */
  authors: ReadonlyMap<string, string>;
  /** Queries of this revision not closed. */
  openQueries: number;
}

/** The rulebook's facts of a sheet as the API gives it (the app's view), with its named co-preparers. */
export function factsOfSheet(sheet: SheetDto): SheetFacts & { coPreparerIds: string[] } {
  const { state, preparer, checker, approver, openQueries } = sheet;
  return {
    state,
    preparer,
    checker,
    approver,
    openQueries,
    authors: new Map(sheet.authorIds.map((id) => [id, ''])),
    coPreparerIds: sheet.coPreparers.map((p) => p.id),
  };
}

/** Who wants to act. */
export interface Actor {
  id: string;
  name: string;
  roles: readonly Role[];
}

export enum WorkflowCode {
  OutOfTurn = 'OUT_OF_TURN',
  NotYours = 'NOT_ASSIGNED',
  NotIndependent = 'NOT_INDEPENDENT',
  OpenQueries = 'OPEN_QUERIES',
  BadAssignee = 'BAD_ASSIGNEE',
  ResultsChanged = 'RESULTS_CHANGED',
  ReadOnly = 'SHEET_READ_ONLY',
  NotPreparer = 'NOT_PREPARER',
}

/** Why a move is refused: a code, a sentence for the person, and the kind of refusal. */
export interface Refusal {
  code: WorkflowCode;
  message: string;
  /** `conflict`: the sheet is not in a state for it; `forbidden`: not this person; `invalid`: a bad choice in the request. */
  kind: 'conflict' | 'forbidden' | 'invalid';
  details?: { field: string; message: string }[];
}

const is = (actor: Actor, person: Person | null | undefined) => !!person && person.id === actor.id;
const notYours = (message: string): Refusal => ({ code: WorkflowCode.NotYours, kind: 'forbidden', message });
const preparedIt = (doing: string): Refusal => ({
  code: WorkflowCode.NotIndependent,
  kind: 'forbidden',
  message: `You prepared this sheet, so you cannot ${doing}: checking and approval are done by someone else.`,
});

/**
 * Independent checking (common practice): the checker is none of the revision's authors; the approver is
 * none of them and not the checker.
 */
export function independenceRefusal(
  role: 'checker' | 'approver',
  person: { id: string; name?: string },
  authors: ReadonlyMap<string, string>,
  checkerId?: string,
): Refusal | undefined {
  const name = person.name ?? authors.get(person.id) ?? 'This person';
  if (authors.has(person.id)) {
    return {
      code: WorkflowCode.NotIndependent,
      kind: 'invalid',
      message: `${name} prepared or edited this revision, so cannot ${role === 'checker' ? 'check' : 'approve'} it: choose someone who had no hand in it.`,
      details: [{ field: `${role}Id`, message: `${name} prepared or edited this revision` }],
    };
  }
  if (role === 'approver' && person.id === checkerId) {
    return {
      code: WorkflowCode.NotIndependent,
      kind: 'invalid',
      message: 'The checker cannot also approve it: the approver is a third person.',
      details: [{ field: 'approverId', message: 'the checker cannot approve the sheet they checked' }],
    };
  }
  return undefined;
}

/** Refuses `doing` unless the sheet is in one of the states `from` (moves, and the checker's work on queries). */
export function stateRefusal(state: SheetState, from: readonly SheetState[], doing: string): Refusal | undefined {
  if (from.includes(state)) return undefined;
  return {
    code: WorkflowCode.OutOfTurn,
    kind: 'conflict',
    message: `You cannot ${doing}: the sheet is ${STATE_WORDS[state]}, and this needs it ${from.map((s) => STATE_WORDS[s]).join(' or ')}.`,
  };
}

/** Refuses `doing` to anyone but the sheet's assigned checker. */
export function checkerRefusal(sheet: Pick<SheetFacts, 'checker'>, actor: Actor, doing: string): Refusal | undefined {
  return is(actor, sheet.checker) ? undefined : notYours(`Only the sheet's assigned checker${sheet.checker ? ` (${sheet.checker.name})` : ''} can ${doing}.`);
}

/**
 * Whether `actor` may make `move` on a sheet now, and if not, why (the first rule that fails, in the
 * order a person would want to hear them). For `request-check`, `choice` is the checker and approver asked for.
 */
export function refusalOf(move: WorkflowMove, sheet: SheetFacts, actor: Actor, choice: { checkerId?: string; approverId?: string } = {}): Refusal | undefined {
  const roles = MOVES[move].roles;
  if (!roles.some((r) => actor.roles.includes(r)))
    return notYours(`Only ${roles.map((r) => `an ${r}`.replace(/^an ([^aeiou])/, 'a $1')).join(' or ')} can ${MOVES[move].doing}.`);
  const state = stateRefusal(sheet.state, MOVES[move].from, MOVES[move].doing);
  if (state) return state;
  switch (move) {
    case 'request-check': {
      if (!is(actor, sheet.preparer)) return notYours(`Only the sheet's preparer (${sheet.preparer.name}) can ask for a check.`);
      // Independence first: whoever prepared or edited the revision hears that, whatever their roles.
      if (choice.checkerId) {
        const checker = independenceRefusal('checker', { id: choice.checkerId }, sheet.authors);
        if (checker) return checker;
      }
      const approverId = choice.approverId ?? sheet.approver?.id;
      if (approverId) return independenceRefusal('approver', choice.approverId ? { id: approverId } : sheet.approver!, sheet.authors, choice.checkerId);
      return undefined;
    }
    case 'return':
    case 'pass': {
      const notChecker = checkerRefusal(sheet, actor, MOVES[move].doing);
      if (notChecker || move === 'return') return notChecker;
      const independent = independenceRefusal('checker', sheet.checker!, sheet.authors);
      if (independent) return independent;
      if (sheet.openQueries > 0) {
        const n = sheet.openQueries;
        return {
          code: WorkflowCode.OpenQueries,
          kind: 'conflict',
          message: `The check cannot pass while ${n} ${n === 1 ? 'query is' : 'queries are'} not closed.`,
        };
      }
      return undefined;
    }
    case 'approve':
    case 'issue': {
      if (is(actor, sheet.preparer)) return preparedIt(move === 'approve' ? 'approve it' : 'issue it');
      if (move === 'approve' && sheet.approver && !is(actor, sheet.approver)) return notYours(`The sheet is to be approved by ${sheet.approver.name}.`);
      if (move === 'issue' && !is(actor, sheet.approver))
        return notYours(`Only the approver${sheet.approver ? ` (${sheet.approver.name})` : ''} can issue the sheet.`);
      return independenceRefusal('approver', { id: actor.id, name: actor.name }, sheet.authors, sheet.checker?.id);
    }
    case 'return-to-checker': {
      const isOwner = actor.roles.includes('owner');
      if (!isOwner && sheet.approver && !is(actor, sheet.approver))
        return notYours(`Only the sheet's approver (${sheet.approver.name}) or an owner can return it to the checker.`);
      return independenceRefusal('approver', { id: actor.id, name: actor.name }, sheet.authors, sheet.checker?.id);
    }
    case 'new-revision':
      return undefined;
  }
}

/** The moves `actor` may make on the sheet now: what the app offers. */
export function allowedMoves(sheet: SheetFacts, actor: Actor): WorkflowMove[] {
  return (Object.keys(MOVES) as WorkflowMove[]).filter((move) => !refusalOf(move, sheet, actor));
}

/**
 * Whether `actor` may change the sheet's cells now, and if not, why: the sheet must be in an editable
 * state, and the actor a sheet editor who is its preparer or a co-preparer the preparer named for this
 * revision — never its checker or approver, who raise queries instead.
 */
export function editRefusal(
  sheet: Pick<SheetFacts, 'state' | 'preparer' | 'checker' | 'approver'> & { coPreparerIds: readonly string[] },
  actor: Actor,
): Refusal | undefined {
  if (!isEditable(sheet.state))
    return { code: WorkflowCode.ReadOnly, kind: 'conflict', message: `The sheet is ${sheet.state.replace('-', ' ')} and can no longer be edited.` };
  if (!SHEET_EDITORS.some((r) => actor.roles.includes(r))) return notYours('Only an owner or an engineer can change a sheet.');
  if (is(actor, sheet.preparer)) return undefined;
  if (is(actor, sheet.checker) || is(actor, sheet.approver)) {
    return {
      code: WorkflowCode.NotIndependent,
      kind: 'forbidden',
      message: "You are this sheet's checker or approver, so you do not edit it: raise a query for the preparer instead.",
    };
  }
  if (sheet.coPreparerIds.includes(actor.id)) return undefined;
  const p = sheet.preparer.name;
  return {
    code: WorkflowCode.NotPreparer,
    kind: 'forbidden',
    message: `Only this sheet's preparers change it: ${p}, and the co-preparers ${p} names. Ask to be named co-preparer (then you cannot check or approve this revision).`,
  };
}

export const mayEdit = (sheet: Parameters<typeof editRefusal>[0], actor: Actor) => !editRefusal(sheet, actor);
