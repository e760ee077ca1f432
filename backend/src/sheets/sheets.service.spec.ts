/**
 * The save path's decisions, with its collaborators replaced: what a save asks of its evaluation process
 * (one cell, or the whole sheet), which write it takes and with which results, what a stale save answers,
 * what a failed evaluation stores. The SQL itself is covered by the integration tests
 * (test/sheets.test.ts, test/incremental-store.test.ts) against MariaDB.
 */
import type { EntityManager } from '@mikro-orm/mariadb';
import { describe, expect, it, vi } from 'vitest';
import { ENGINE_VERSION, SheetErrorCode, type CellResult, type SheetFile } from '@ampwright/common';
import type { AuditService } from '../audit/audit.service';
import { AppException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import type { EvaluationService, Reservation } from '../evaluation/evaluation.service';
import type { ChangeOptions, ChangeOutcome, EditOptions, SheetEvaluator } from '../evaluation/sheet-evaluator';
import type { ProjectsService } from '../projects/projects.service';
import type { TemplatesService } from '../templates/templates.service';
import type { CellRecord, ChangeToStore, SaveLock, SheetRepository } from './sheet.repository';
import { SheetViewCache } from './sheet-view-cache';
import { SheetsService } from './sheets.service';

const author = { id: 'u-1', name: 'Ada Preparer' };
const auth: AuthContext = {
  user: { ...author, email: 'ada@example.test' },
  firm: { id: 'f-1', name: 'F' },
  roles: ['engineer'],
  session: { tokenHash: 'h', csrfToken: 'c' },
};
const ok = (index: number, x: number) =>
  ({ kind: 'calc', status: 'ok', errors: [], warnings: [], values: { [`x${index}`]: { si: x } } }) as unknown as CellResult;

/**
 * A sheet at version 4 with three calc cells whose stored results are version 4's (of the content whose
 * fingerprint is F4), and the service over fakes of everything it uses. `held`: whether the evaluation process
 * keeps the evaluation of F4 (a one-cell edit is evaluated there without the sheet).
 */
function setup(
  evaluation: { ok: boolean; complete?: boolean; results?: [number, CellResult][]; engineVersion?: string },
  options: {
    fast?: boolean;
    held?: boolean;
    lock?: Partial<SaveLock> | null;
    version?: number;
    resultsVersion?: number | null;
    engineVersion?: string;
    resultsFingerprint?: string | null;
  } = {},
) {
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
  const sheet = {
    id: 's-1',
    state: 'being-prepared',
    preparer: author,
    checker: null,
    approver: null,
    revisionNumber: 1,
    version: options.version ?? 4,
    title: 'T',
    settings: {},
    extra: {},
    resultsVersion: options.resultsVersion === undefined ? 4 : options.resultsVersion,
    engineVersion: options.engineVersion ?? ENGINE_VERSION,
    resultsFingerprint: options.resultsFingerprint === undefined ? 'F4' : options.resultsFingerprint,
  };
  const lock: SaveLock | null =
    options.lock === null
      ? null
      : { version: 4, state: 'being-prepared', resultsVersion: 4, engineVersion: ENGINE_VERSION, resultsFingerprint: 'F4', ...options.lock };
  // Each read gives copies, as a database would: a save changes what it read in place.
  const copies = (list: CellRecord[]) => list.map((c) => ({ ...c, fields: { ...c.fields } }));
  const repository = {
    heading: vi.fn(async (_firm: string, _id: string, o: { cells?: boolean; cell?: string } = {}) =>
      o.cell !== undefined
        ? { ...sheet, cells: copies(cells.filter((c) => c.id === o.cell)), cellIds: cells.map((c) => c.id) }
        : { ...sheet, cells: copies(cells) },
    ),
    saveCellEdit: vi.fn(async (_id: string, _cell: CellRecord, _change: ChangeToStore) => options.fast ?? true),
    lockForSave: vi.fn(async () => lock),
    writeCells: vi.fn(async () => undefined),
    writeHeading: vi.fn(async () => undefined),
    raiseWithResults: vi.fn(async (_id: string, _change: Pick<ChangeToStore, 'version' | 'results' | 'engineVersion' | 'fingerprint'>) => undefined),
    contents: vi.fn(async () => ({ version: 5, state: lock?.state ?? 'being-prepared', cells: [] })),
    storeResults: vi.fn(async () => true),
  };
  const authors = { recordEdit: vi.fn(async () => undefined) };
  const txEm = { getRepository: vi.fn(() => authors) };
  const em = { transactional: vi.fn(async (work: (tx: typeof txEm) => Promise<unknown>) => work(txEm)) };
  const reservation: Reservation = { tenant: 'f-1', release: () => undefined };
  const evaluations = { holding: vi.fn(async <T>(_firm: string, work: (r: Reservation) => Promise<T>) => work(reservation)) };
  const outcome: ChangeOutcome = evaluation.ok
    ? {
        ok: true,
        complete: evaluation.complete ?? false,
        results: new Map(evaluation.results ?? cells.map((_, k) => [k, ok(k, k)])),
        engineVersion: evaluation.engineVersion ?? ENGINE_VERSION,
        evaluated: (evaluation.results ?? []).map(([k]) => k),
        engineMs: 1,
        totalMs: 3,
        fingerprint: 'F5',
      }
    : { ok: false, reason: 'timeout', message: 'This sheet takes too long.', totalMs: 3 };
  const complete: ChangeOutcome = outcome.ok ? { ...outcome, complete: true, results: new Map(cells.map((_, k) => [k, ok(k, 10 + k)])) } : outcome;
  const evaluator = {
    evaluateChange: vi.fn(async (_file: SheetFile, o: ChangeOptions) => (o.base ? outcome : complete)),
    evaluateEdit: vi.fn(async (_o: EditOptions) => (options.held === false ? { held: false as const, totalMs: 1 } : outcome)),
  };
  const audit = { record: vi.fn(async () => undefined) };
  const service = new SheetsService(
    em as unknown as EntityManager,
    {} as ProjectsService,
    {} as TemplatesService,
    evaluations as unknown as EvaluationService,
    evaluator as unknown as SheetEvaluator,
    repository as unknown as SheetRepository,
    audit as unknown as AuditService,
    new SheetViewCache(),
  );
  return { service, repository, evaluator, cells, em, authors };
}

const edit = { version: 4, cell: { kind: 'calc', source: 'x0 = 10' } };

describe('SheetsService: the path of a save', () => {
  it('sends a one-cell edit as that cell alone to the process keeping the stored sheet, and writes it with the results that differ in one statement', async () => {
    const { service, repository, evaluator, em } = setup({
      ok: true,
      results: [
        [0, ok(0, 10)],
        [2, ok(2, 20)],
      ],
    });
    const answer = await service.updateCell(auth, 's-1', 'c-a', edit);
    // One statement read the heading, that cell and the cells' ids; the sheet itself is not sent.
    expect(repository.heading).toHaveBeenCalledTimes(1);
    expect(repository.heading.mock.calls[0][2]).toEqual({ cell: 'c-a' });
    expect(evaluator.evaluateChange).not.toHaveBeenCalled();
    expect(evaluator.evaluateEdit.mock.calls[0][0]).toMatchObject({ key: 's-1', base: 'F4', index: 0, cell: { kind: 'calc', source: 'x0 = 10' } });
    const [, cell, change] = repository.saveCellEdit.mock.calls[0];
    expect(cell).toMatchObject({ id: 'c-a', fields: { source: 'x0 = 10' }, changedById: 'u-1' });
    // Stored only while the stored results are still those of F4; the new ones are of F5.
    expect(change).toMatchObject({ version: 4, partial: true, engineVersion: ENGINE_VERSION, base: 'F4', fingerprint: 'F5' });
    expect([...change.results.keys()]).toEqual(['c-a', 'c-c']);
    expect(em.transactional).not.toHaveBeenCalled();
    expect(answer.version).toBe(5);
    expect(answer.changed.map((c) => c.id)).toEqual(['c-a']);
    expect(answer.changed[0]).toMatchObject({ fields: { source: 'x0 = 10' }, changedBy: 'Ada Preparer', results: { values: { x0: { si: 10 } } } });
    expect(answer.reevaluated).toEqual([{ id: 'c-c', results: ok(2, 20) }]);
  });

  it('sends the whole sheet, naming the stored one as the base, when the process does not keep it', async () => {
    const { service, repository, evaluator } = setup({ ok: true, results: [[0, ok(0, 10)]] }, { held: false });
    const answer = await service.updateCell(auth, 's-1', 'c-a', edit);
    expect(evaluator.evaluateEdit).toHaveBeenCalledTimes(1);
    const [file, options] = evaluator.evaluateChange.mock.calls[0];
    expect(file.cells).toEqual([
      { kind: 'calc', source: 'x0 = 10' },
      { kind: 'calc', source: 'x1 = 1' },
      { kind: 'calc', source: 'x2 = 2' },
    ]);
    // The process is told which sheet the stored results are of, and which cell's results the answer needs.
    expect(options).toMatchObject({ key: 's-1', base: 'F4', want: [0] });
    expect(repository.saveCellEdit).toHaveBeenCalledTimes(1);
    expect(repository.saveCellEdit.mock.calls[0][2]).toMatchObject({ partial: true, base: 'F4', fingerprint: 'F5' });
    expect(answer.changed.map((c) => c.id)).toEqual(['c-a']);
    expect(answer.reevaluated).toEqual([]);
  });

  it('names no base when the stored results are not those of the version changed, of another engine or of unknown content, and writes every cell', async () => {
    for (const stale of [{ resultsVersion: 3 }, { resultsVersion: null }, { engineVersion: '0.0.9' }, { resultsFingerprint: null }]) {
      const { service, repository, evaluator } = setup({ ok: true }, stale);
      const answer = await service.updateCell(auth, 's-1', 'c-a', edit);
      expect(evaluator.evaluateEdit).not.toHaveBeenCalled();
      expect(evaluator.evaluateChange.mock.calls[0][1].base).toBeUndefined();
      expect(repository.saveCellEdit.mock.calls[0][2]).toMatchObject({ partial: false, fingerprint: 'F5' });
      expect(answer.changed.map((c) => c.id)).toEqual(['c-a']);
      expect(answer.reevaluated.map((c) => c.id)).toEqual(['c-b', 'c-c']);
    }
  });

  it('answers a save based on an older version with 409 and the contents to merge, and evaluates nothing', async () => {
    const { service, repository, evaluator } = setup({ ok: true }, { version: 5 });
    const error = await service.updateCell(auth, 's-1', 'c-a', edit).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AppException);
    expect(error).toMatchObject({ code: SheetErrorCode.StaleVersion, status: 409, current: { version: 5, state: 'being-prepared', cells: [] } });
    expect(repository.contents).toHaveBeenCalledWith('s-1');
    expect(evaluator.evaluateChange).not.toHaveBeenCalled();
    expect(evaluator.evaluateEdit).not.toHaveBeenCalled();
  });

  it('answers 409 when another save won between the read and the write, and writes nothing', async () => {
    const { service, repository } = setup({ ok: true, results: [[0, ok(0, 10)]] }, { fast: false, lock: { version: 5 } });
    await expect(service.updateCell(auth, 's-1', 'c-a', edit)).rejects.toMatchObject({ code: SheetErrorCode.StaleVersion, status: 409 });
    expect(repository.writeCells).not.toHaveBeenCalled();
    expect(repository.raiseWithResults).not.toHaveBeenCalled();
  });

  it('refuses a save on a sheet that left preparation meanwhile as read-only, not as stale', async () => {
    const { service } = setup({ ok: true }, { fast: false, lock: { version: 5, state: 'approved' } });
    await expect(service.updateCell(auth, 's-1', 'c-a', edit)).rejects.toMatchObject({ code: SheetErrorCode.ReadOnly, status: 409 });
  });

  it('evaluates again for every cell when the stored results changed since they were read, and writes them all', async () => {
    for (const moved of [{ resultsVersion: null }, { resultsFingerprint: 'F4-other' }]) {
      const { service, repository, evaluator } = setup({ ok: true, results: [[0, ok(0, 10)]] }, { fast: false, lock: moved });
      const answer = await service.updateCell(auth, 's-1', 'c-a', edit);
      // The one-cell path found them moved, the whole-sheet path too; then every cell's results, without a base.
      expect(evaluator.evaluateEdit).toHaveBeenCalledTimes(1);
      expect(evaluator.evaluateChange).toHaveBeenCalledTimes(2);
      expect(evaluator.evaluateChange.mock.calls[1][1].base).toBeUndefined();
      expect(repository.raiseWithResults).toHaveBeenCalledTimes(1);
      const [, change] = repository.raiseWithResults.mock.calls[0];
      expect(change).toMatchObject({ version: 4, partial: false });
      expect([...change.results.keys()]).toEqual(['c-a', 'c-b', 'c-c']);
      expect(repository.writeCells).toHaveBeenCalledWith('s-1', { inserted: [], edited: [expect.objectContaining({ id: 'c-a' })], moved: [], removed: [] });
      expect(answer.changed.map((c) => c.id)).toEqual(['c-a']);
      expect(answer.reevaluated).toHaveLength(2);
    }
  });

  it("sends a co-preparer's one-cell edit through the whole-sheet path, which records them as an author", async () => {
    const { service, evaluator, authors, repository } = setup({ ok: true, results: [[0, ok(0, 10)]] });
    const coPreparer: AuthContext = { ...auth, user: { id: 'u-2', name: 'Bo Helper', email: 'bo@example.test' } };
    (service as unknown as { assertMayEdit: () => Promise<void> }).assertMayEdit = async () => undefined;
    await service.updateCell(coPreparer, 's-1', 'c-a', edit);
    expect(evaluator.evaluateEdit).not.toHaveBeenCalled();
    expect(evaluator.evaluateChange).toHaveBeenCalledTimes(1);
    expect(repository.saveCellEdit).not.toHaveBeenCalled();
    expect(authors.recordEdit).toHaveBeenCalledWith('s-1', 1, 'u-2');
  });

  it('writes any other change in one transaction under the row lock: a cell added, and a co-preparer recorded as an author', async () => {
    const { service, repository, authors } = setup({ ok: true, results: [[1, ok(1, 1)]] });
    const coPreparer: AuthContext = { ...auth, user: { id: 'u-2', name: 'Bo Helper', email: 'bo@example.test' } };
    // The co-preparer may edit (named for this revision): the rulebook asks the authors only for someone other than the preparer.
    (service as unknown as { assertMayEdit: () => Promise<void> }).assertMayEdit = async () => undefined;
    const answer = await service.addCell(coPreparer, 's-1', { version: 4, position: 1, cell: { kind: 'calc', source: 'y = 1' } });
    expect(repository.saveCellEdit).not.toHaveBeenCalled();
    expect(repository.lockForSave).toHaveBeenCalledWith('s-1');
    expect(authors.recordEdit).toHaveBeenCalledWith('s-1', 1, 'u-2');
    const writes = (repository.writeCells.mock.calls[0] as unknown[])[1] as { inserted: CellRecord[]; moved: CellRecord[] };
    expect(writes.inserted).toEqual([expect.objectContaining({ position: 1, kind: 'calc', fields: { source: 'y = 1' } })]);
    expect(writes.moved.map((c) => [c.id, c.position])).toEqual([
      ['c-b', 2],
      ['c-c', 3],
    ]);
    expect(repository.raiseWithResults).toHaveBeenCalledTimes(1);
    expect(answer.version).toBe(5);
  });

  it('stores in every cell why a sheet could not be evaluated, and still saves the change', async () => {
    const { service, repository } = setup({ ok: false });
    const answer = await service.updateCell(auth, 's-1', 'c-a', edit);
    const [, , change] = repository.saveCellEdit.mock.calls[0];
    expect(change).toMatchObject({ partial: false, engineVersion: null, fingerprint: null });
    expect(change.results.size).toBe(3);
    for (const result of change.results.values())
      expect(result).toMatchObject({ kind: 'unevaluated', errors: [{ message: 'Not evaluated: This sheet takes too long.' }] });
    expect(answer.version).toBe(5);
  });
});
