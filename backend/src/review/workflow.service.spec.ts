/**
 * The review service's decisions, with its collaborators replaced: a move refused leaves nothing written
 * or told; a move made raises the version, is recorded and told; an issue evaluates before it takes the
 * row lock. The rules themselves are the rulebook's (common/src/review/workflow.spec.ts); the SQL and the
 * locks are covered against MariaDB (test/review.test.ts, test/independence.test.ts).
 */
import type { EntityManager } from '@mikro-orm/mariadb';
import { describe, expect, it, vi } from 'vitest';
import { WorkflowCode } from '@ampwright/common';
import type { AuditService } from '../audit/audit.service';
import { WorkflowException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import type { Role } from '../core/roles';
import type { NotificationsService } from '../notifications/notifications.service';
import type { Sheet } from '../sheets/entities/sheet.entity';
import { SheetAuthor } from '../sheets/entities/sheet-author.entity';
import type { SheetsService } from '../sheets/sheets.service';
import type { RevisionsService } from './revisions.service';
import { WorkflowService } from './workflow.service';

const ada = { id: 'u-ada', name: 'Ada Preparer', email: 'ada@example.test' };
const cole = { id: 'u-cole', name: 'Cole Checker', email: 'cole@example.test' };
const ana = { id: 'u-ana', name: 'Ana Approver', email: 'ana@example.test' };
const as = (user: { id: string; name: string }, roles: Role[]) =>
  ({ user: { email: `${user.id}@example.test`, ...user }, firm: { id: 'f-1', name: 'F' }, roles, session: { tokenHash: 'h', csrfToken: 'c' } }) as AuthContext;

/** A sheet in `state` with its people, and the service over fakes; `calls` lists what happened, in order. */
function setup(state: string, options: { openQueries?: number; authors?: [string, string][] } = {}) {
  const calls: string[] = [];
  const sheet = {
    id: 's-1',
    number: 'E-101',
    title: 'Bank step',
    state,
    version: 7,
    revisionNumber: 1,
    preparer: ada,
    checker: cole,
    approver: ana,
    project: { id: 'p-1', firm: { name: 'Ohmline Consulting' } },
  } as unknown as Sheet;
  const authors = new Map<string, string>([[ada.id, ada.name], ...(options.authors ?? [])]);
  const repositories = new Map<unknown, unknown>([[SheetAuthor, { notIndependent: vi.fn(async () => authors) }]]);
  const em = {
    transactional: vi.fn(async (work: (em: unknown) => Promise<void>) => {
      calls.push('lock');
      await work(em);
    }),
    findOneOrFail: vi.fn(async () => sheet),
    populate: vi.fn(async () => undefined),
    flush: vi.fn(async () => calls.push('flush')),
    clear: vi.fn(),
    persist: vi.fn(),
    find: vi.fn(async () => []),
    getReference: vi.fn((_entity: unknown, id: string) => ({ id })),
    getRepository: vi.fn((entity: unknown) => repositories.get(entity) ?? { openQueriesOf: vi.fn(async () => options.openQueries ?? 0) }),
  };
  const sheets = { findReadable: vi.fn(async () => sheet), get: vi.fn(async () => ({ id: sheet.id })), refreshResults: vi.fn() };
  const revisions = {
    evaluateForIssue: vi.fn(async () => {
      calls.push('evaluate');
      return { version: 7 };
    }),
    freeze: vi.fn(async () => ({ id: 'r-1', code: 'A', snapshotSha256: 'ab' })),
    summary: vi.fn(async () => ({ id: 'r-1' })),
  };
  const notifications = { notify: vi.fn(async () => calls.push('notify')), url: (p: string) => p };
  const audit = { record: vi.fn(async (type: string) => calls.push(`record ${type}`)) };
  const service = new WorkflowService(
    em as unknown as EntityManager,
    sheets as unknown as SheetsService,
    revisions as unknown as RevisionsService,
    notifications as unknown as NotificationsService,
    audit as unknown as AuditService,
  );
  return { service, sheet, calls, em, revisions, notifications, audit };
}

describe('WorkflowService', () => {
  it('refuses to pass a check while a query is open: 409 OPEN_QUERIES, nothing written, recorded or told', async () => {
    const { service, sheet, calls } = setup('with-checker', { openQueries: 2 });
    const refused = await service.passCheck(as(cole, ['checker']), 's-1').catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(WorkflowException);
    expect(refused).toMatchObject({ code: WorkflowCode.OpenQueries, status: 409, message: expect.stringMatching(/2 queries are not closed/) });
    expect(sheet.state).toBe('with-checker');
    expect(sheet.version).toBe(7);
    expect(calls).toEqual(['lock']);
  });

  it('passes a check: the state and version move under the lock, then the event is recorded and the preparer and approver are told', async () => {
    const { service, sheet, calls, notifications } = setup('with-checker');
    await service.passCheck(as(cole, ['checker']), 's-1');
    expect(sheet).toMatchObject({ state: 'checked', version: 8 });
    expect(calls).toEqual(['lock', 'flush', 'record check-passed', 'notify']);
    const [targets] = notifications.notify.mock.calls[0] as unknown as [{ user: { id: string } }[]];
    expect(targets.map((t) => t.user.id)).toEqual([ada.id, ana.id]);
  });

  it('refuses a checker who edited the revision (400 NOT_INDEPENDENT, a bad choice of checker), even when assigned', async () => {
    const { service, calls } = setup('with-checker', { authors: [[cole.id, cole.name]] });
    await expect(service.passCheck(as(cole, ['checker']), 's-1')).rejects.toMatchObject({ code: WorkflowCode.NotIndependent, status: 400 });
    expect(calls).toEqual(['lock']);
  });

  it('issues after evaluating outside the lock, and queues the package in the same transaction', async () => {
    const { service, sheet, calls, em, revisions } = setup('approved');
    await service.issue(as(ana, ['approver']), 's-1');
    expect(calls.slice(0, 3)).toEqual(['evaluate', 'lock', 'flush']);
    expect(revisions.freeze).toHaveBeenCalledWith(em, sheet, { version: 7 });
    expect(em.persist).toHaveBeenCalledTimes(1);
    expect(sheet.state).toBe('issued');
  });

  it('refuses an issue by someone other than the approver before evaluating anything', async () => {
    const { service, calls, revisions } = setup('approved');
    await expect(service.issue(as(cole, ['approver']), 's-1')).rejects.toMatchObject({ code: WorkflowCode.NotYours, status: 403 });
    expect(revisions.evaluateForIssue).not.toHaveBeenCalled();
    expect(calls).toEqual([]);
  });
});
