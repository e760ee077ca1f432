/**
 * The save path's decisions, with its collaborators replaced: which results a save asks to store, what a
 * stale save answers, what a failed evaluation stores. The SQL itself is covered by the integration tests
 * (test/sheets.test.ts, test/incremental-store.test.ts) against MariaDB.
 */
import type { EntityManager } from '@mikro-orm/mariadb';
import { describe, expect, it, vi } from 'vitest';
import type { CellResult } from '@ampwright/common';
import { SheetErrorCode } from '@ampwright/common';
import type { AuditService } from '../audit/audit.service';
import { AppException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import type { EvaluationService, Reservation } from '../evaluation/evaluation.service';
import type { SheetEvaluator, SheetOutcome } from '../evaluation/sheet-evaluator';
import type { ProjectsService } from '../projects/projects.service';
import type { TemplatesService } from '../templates/templates.service';
import type { Sheet } from './entities/sheet.entity';
import type { CellRecord, ResultsToStore, SheetRepository } from './sheet.repository';
import { SheetsService } from './sheets.service';

const author = { id: 'u-1', name: 'Ada Preparer' };
const auth = { session: { user: author, firm: { id: 'f-1' } }, roles: ['engineer'] } as unknown as AuthContext;
const ok = (index: number, x: number) =>
  ({ kind: 'calc', status: 'ok', errors: [], warnings: [], values: { [`x${index}`]: { si: x } } }) as unknown as CellResult;

/** A sheet at version 4 with three calc cells, and the service over fakes of everything it uses. */
function setup(evaluation: Partial<SheetOutcome> & { ok: boolean }, options: { raised?: boolean; state?: string } = {}) {
  const sheet = {
    id: 's-1',
    state: 'being-prepared',
    preparer: author,
    checker: undefined,
    approver: undefined,
    revisionNumber: 1,
    version: 4,
    title: 'T',
    settings: {},
    extra: {},
  } as unknown as Sheet;
  const cells = ['c-a', 'c-b', 'c-c'].map((id, position): CellRecord => ({
    id,
    position,
    kind: 'calc',
    fields: { source: `x${position} = ${position}` },
    changedById: null,
    changedBy: null,
    changedAt: new Date('2026-01-01'),
    agreedById: null,
    agreedBy: null,
    agreedAt: null,
    changedAfterAgreement: false,
  }));
  const repository = {
    heading: vi.fn(async () => sheet),
    raiseVersion: vi.fn(async () => options.raised ?? true),
    cellRecords: vi.fn(async () => cells),
    writeCells: vi.fn(async () => undefined),
    writeHeading: vi.fn(async () => undefined),
    contents: vi.fn(async () => ({ version: 5, state: options.state ?? 'being-prepared', cells: [] })),
    storeResults: vi.fn(async (_id: string, store: ResultsToStore) => new Set(store.only ? store.only.ids : store.results.keys())),
  };
  const txEm = { findOneOrFail: vi.fn(async () => sheet), flush: vi.fn(async () => undefined), getReference: vi.fn((_e: unknown, id: string) => ({ id })) };
  const em = { transactional: vi.fn(async (work: (tx: typeof txEm) => Promise<unknown>) => work(txEm)) };
  const reservation: Reservation = { tenant: 'f-1', release: () => undefined };
  const evaluations = { holding: vi.fn(async <T>(_firm: string, work: (r: Reservation) => Promise<T>) => work(reservation)) };
  const outcome = {
    totalMs: 3,
    ...(evaluation.ok
      ? { results: cells.map((_, k) => ok(k, k)), engineVersion: '1.0.0', evaluated: [], reusedFrom: null, engineMs: 1 }
      : { reason: 'timeout', message: 'This sheet takes too long.' }),
    ...evaluation,
  } as SheetOutcome;
  const evaluator = { evaluate: vi.fn(async () => outcome) };
  const audit = { record: vi.fn(async () => undefined) };
  const service = new SheetsService(
    em as unknown as EntityManager,
    {} as ProjectsService,
    {} as TemplatesService,
    evaluations as unknown as EvaluationService,
    evaluator as unknown as SheetEvaluator,
    repository as unknown as SheetRepository,
    audit as unknown as AuditService,
  );
  return { service, repository, evaluator, cells };
}

const edit = { version: 4, cell: { kind: 'calc', source: 'x0 = 10' } };

describe('SheetsService: the path of a save', () => {
  it('asks to store only the re-evaluated and touched cells when the process reused the cache of the version changed', async () => {
    const { service, repository, evaluator } = setup({ ok: true, reusedFrom: 4, evaluated: [0, 2] });
    const answer = await service.updateCell(auth, 's-1', 'c-a', edit);
    expect(evaluator.evaluate).toHaveBeenCalledWith(
      expect.objectContaining({ cells: [{ kind: 'calc', source: 'x0 = 10' }, expect.anything(), expect.anything()] }),
      expect.objectContaining({ key: 's-1', version: 5 }),
    );
    const [, store] = repository.storeResults.mock.calls[0];
    expect(store).toMatchObject({ version: 5, only: { basedOn: 4 } });
    expect([...store.only!.ids].sort()).toEqual(['c-a', 'c-c']);
    expect(answer.version).toBe(5);
    expect(answer.changed.map((c) => c.id)).toEqual(['c-a', 'c-c']);
    expect(answer.changed[0]).toMatchObject({ fields: { source: 'x0 = 10' }, changedBy: 'Ada Preparer', results: { values: { x0: { si: 0 } } } });
    // Only the edited cell is written; nothing moved, nothing added.
    expect(repository.writeCells).toHaveBeenCalledWith('s-1', {
      inserted: [],
      edited: [expect.objectContaining({ id: 'c-a', changedById: 'u-1' })],
      moved: [],
      removed: [],
    });
    expect(repository.writeHeading).not.toHaveBeenCalled();
  });

  it('asks to store every cell when the process reused the cache of another version, or none', async () => {
    for (const reusedFrom of [3, null]) {
      const { service, repository } = setup({ ok: true, reusedFrom, evaluated: [0] });
      const answer = await service.updateCell(auth, 's-1', 'c-a', edit);
      expect(repository.storeResults.mock.calls[0][1].only).toBeUndefined();
      expect(answer.changed.map((c) => c.id)).toEqual(['c-a', 'c-b', 'c-c']);
    }
  });

  it('answers a stale save with 409 and the contents to merge, and evaluates nothing', async () => {
    const { service, repository, evaluator } = setup({ ok: true }, { raised: false });
    const error = await service.updateCell(auth, 's-1', 'c-a', edit).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AppException);
    expect(error).toMatchObject({ code: SheetErrorCode.StaleVersion, status: 409, current: { version: 5, state: 'being-prepared', cells: [] } });
    expect(repository.contents).toHaveBeenCalledWith('s-1');
    expect(evaluator.evaluate).not.toHaveBeenCalled();
  });

  it('refuses a save on a sheet that left preparation meanwhile as read-only, not as stale', async () => {
    const { service } = setup({ ok: true }, { raised: false, state: 'approved' });
    await expect(service.updateCell(auth, 's-1', 'c-a', edit)).rejects.toMatchObject({ code: SheetErrorCode.ReadOnly, status: 409 });
  });

  it('stores in every cell why a sheet could not be evaluated, and still answers the saved change', async () => {
    const { service, repository } = setup({ ok: false });
    const answer = await service.updateCell(auth, 's-1', 'c-a', edit);
    const [, store] = repository.storeResults.mock.calls[0];
    expect(store.only).toBeUndefined();
    expect(store.engineVersion).toBeNull();
    for (const result of store.results.values())
      expect(result).toMatchObject({ kind: 'unevaluated', errors: [{ message: 'Not evaluated: This sheet takes too long.' }] });
    expect(answer.version).toBe(5);
  });
});
