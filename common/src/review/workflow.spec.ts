import { describe, expect, it } from 'vitest';
import type { SheetState } from '../api/projects';
import { allowedMoves, editRefusal, mayEdit, refusalOf, WorkflowCode, type Actor, type SheetFacts, type WorkflowMove } from './workflow';

// The people of one review: Pat prepares, Cole co-prepares, Chris checks, Alex approves, Olive owns the firm.
const pat: Actor = { id: 'pat', name: 'Pat', roles: ['engineer'] };
const cole: Actor = { id: 'cole', name: 'Cole', roles: ['engineer', 'checker'] };
const chris: Actor = { id: 'chris', name: 'Chris', roles: ['checker'] };
const alex: Actor = { id: 'alex', name: 'Alex', roles: ['approver'] };
const avery: Actor = { id: 'avery', name: 'Avery', roles: ['approver'] };
const olive: Actor = { id: 'olive', name: 'Olive', roles: ['owner'] };
const carla: Actor = { id: 'carla', name: 'Carla', roles: ['client'] };

const sheet = (state: SheetState, more: Partial<SheetFacts> = {}): SheetFacts => ({
  state,
  preparer: pat,
  checker: state === 'being-prepared' ? null : chris,
  approver: state === 'approved' || state === 'issued' ? alex : null,
  authors: new Map([
    ['pat', 'Pat'],
    ['cole', 'Cole'],
  ]),
  openQueries: 0,
  ...more,
});

describe('the workflow rulebook (common practice: independent checking; PRODUCT.md roles)', () => {
  // [state, actor, the moves that actor may make]
  const table: [SheetState, Actor, WorkflowMove[]][] = [
    ['being-prepared', pat, ['request-check']],
    ['being-prepared', cole, []],
    ['being-prepared', chris, []],
    ['being-prepared', olive, []],
    ['with-checker', chris, ['return', 'pass']],
    ['with-checker', cole, []],
    ['with-checker', pat, []],
    ['checked', alex, ['approve', 'return-to-checker']],
    ['checked', olive, ['return-to-checker']],
    ['checked', chris, []],
    ['checked', pat, []],
    ['approved', alex, ['return-to-checker', 'issue']],
    ['approved', avery, []],
    ['approved', olive, ['return-to-checker']],
    ['issued', pat, ['new-revision']],
    ['issued', olive, ['new-revision']],
    ['issued', alex, []],
    ['issued', carla, []],
  ];
  it.each(table)('%s: %s may make exactly these moves', (state, actor, moves) => {
    expect(allowedMoves(sheet(state), actor)).toEqual(moves);
  });

  it('refuses each move with the reason a person would want first', () => {
    const why = (move: WorkflowMove, facts: SheetFacts, actor: Actor, choice = {}) => refusalOf(move, facts, actor, choice);
    expect(why('pass', sheet('being-prepared'), chris)).toMatchObject({
      code: WorkflowCode.OutOfTurn,
      kind: 'conflict',
      message: 'You cannot pass the check: the sheet is being prepared, and this needs it with the checker.',
    });
    expect(why('pass', sheet('with-checker', { openQueries: 2 }), chris)).toMatchObject({
      code: WorkflowCode.OpenQueries,
      message: 'The check cannot pass while 2 queries are not closed.',
    });
    expect(why('pass', sheet('with-checker', { checker: cole }), cole)).toMatchObject({ code: WorkflowCode.NotIndependent, kind: 'invalid' });
    expect(why('request-check', sheet('being-prepared'), pat, { checkerId: 'cole' })).toMatchObject({
      code: WorkflowCode.NotIndependent,
      message: 'Cole prepared or edited this revision, so cannot check it: choose someone who had no hand in it.',
      details: [{ field: 'checkerId' }],
    });
    expect(why('request-check', sheet('being-prepared'), pat, { checkerId: 'chris', approverId: 'chris' })).toMatchObject({
      message: 'The checker cannot also approve it: the approver is a third person.',
    });
    expect(why('request-check', sheet('being-prepared'), olive, { checkerId: 'chris' })).toMatchObject({
      code: WorkflowCode.NotYours,
      message: "Only the sheet's preparer (Pat) can ask for a check.",
    });
    expect(why('approve', sheet('checked', { approver: avery }), alex)).toMatchObject({
      code: WorkflowCode.NotYours,
      message: 'The sheet is to be approved by Avery.',
    });
    expect(why('approve', sheet('checked'), { ...pat, roles: ['engineer', 'approver'] })).toMatchObject({
      code: WorkflowCode.NotIndependent,
      message: 'You prepared this sheet, so you cannot approve it: checking and approval are done by someone else.',
    });
    expect(why('approve', sheet('checked'), { ...chris, roles: ['checker', 'approver'] })).toMatchObject({
      message: 'The checker cannot also approve it: the approver is a third person.',
    });
    expect(why('issue', sheet('approved'), avery)).toMatchObject({ code: WorkflowCode.NotYours, message: 'Only the approver (Alex) can issue the sheet.' });
    expect(why('return-to-checker', sheet('approved'), avery)).toMatchObject({
      message: "Only the sheet's approver (Alex) or an owner can return it to the checker.",
    });
    expect(why('return-to-checker', sheet('checked'), { ...cole, roles: ['owner'] })).toMatchObject({ code: WorkflowCode.NotIndependent });
    expect(why('issue', sheet('approved'), chris)).toMatchObject({ code: WorkflowCode.NotYours, message: 'Only an approver can issue a revision.' });
  });

  it('lets only the preparer and named co-preparers change cells, and only while the sheet is being prepared or with the checker', () => {
    const states: SheetState[] = ['being-prepared', 'with-checker', 'checked', 'approved', 'issued'];
    const people: [Actor, boolean][] = [
      [pat, true],
      [cole, true],
      [{ ...cole, id: 'dana', name: 'Dana' }, false],
      [chris, false],
      [{ ...chris, roles: ['checker', 'engineer'] }, false],
      [olive, false],
      [carla, false],
    ];
    for (const state of states) {
      for (const [actor, mayWhenOpen] of people) {
        const facts = { ...sheet(state), coPreparerIds: ['cole'] };
        expect(mayEdit(facts, actor), `${state} ${actor.name} ${actor.roles}`).toBe((state === 'being-prepared' || state === 'with-checker') && mayWhenOpen);
      }
    }
    expect(editRefusal({ ...sheet('with-checker'), coPreparerIds: [] }, { ...chris, roles: ['checker', 'engineer'] })).toMatchObject({
      code: WorkflowCode.NotIndependent,
      kind: 'forbidden',
    });
    expect(editRefusal({ ...sheet('issued'), coPreparerIds: [] }, pat)).toMatchObject({
      code: WorkflowCode.ReadOnly,
      message: 'The sheet is issued and can no longer be edited.',
    });
    expect(editRefusal({ ...sheet('being-prepared'), coPreparerIds: [] }, { ...cole, id: 'dana', name: 'Dana' })).toMatchObject({
      code: WorkflowCode.NotPreparer,
    });
  });
});
