import { randomUUID } from 'node:crypto';
import { UniqueConstraintViolationException } from '@mikro-orm/core';
import { EntityManager } from '@mikro-orm/mariadb';
import { Injectable } from '@nestjs/common';
import {
  EDITABLE_STATES,
  ENGINE_VERSION,
  editRefusal,
  WorkflowCode,
  cellSchema,
  parseSheetFile,
  SHEET_FORMAT,
  unevaluatedResults,
  type CellDto,
  type CellResult,
  type ImportResultDto,
  type SaveResultDto,
  type SheetDto,
  type SheetFile,
  type SheetSummaryDto,
} from '@ampwright/common';
import { ErrorCode, RequestException, SheetException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { EvaluationService, type Reservation } from '../evaluation/evaluation.service';
import { SheetEvaluator, type ChangeOutcome, type SheetOutcome } from '../evaluation/sheet-evaluator';
import { addTiming, timed } from '../core/timing/server-timing';
import { SheetRepository, type CellRecord, type CellWrites, type ChangeToStore, type SheetHeadingRow } from './sheet.repository';
import { Membership } from '../firms/entities/membership.entity';
import { SheetAuthor } from './entities/sheet-author.entity';
import { User } from '../users/entities/user.entity';
import { ProjectsService } from '../projects/projects.service';
import { TemplatesService } from '../templates/templates.service';
import { retryOnWriteConflict } from '../database/write-conflict';
import type { AddCellDto, CoPreparersDto, CreateSheetDto, ImportCsvDto, MoveCellDto, UpdateCellDto, UpdateSheetDto } from './dto/sheet.dto';
import { Cell } from './entities/cell.entity';
import { Sheet, type SheetState } from './entities/sheet.entity';
import { actorOf, enforce } from '../core/errors/refusal';
import { sheetFromFile } from './sheet-file';
import { AuditService } from '../audit/audit.service';
import { sheetSaves } from '../metrics/metrics';
import { SheetViewCache } from './sheet-view-cache';
import { SheetErrorCode } from '@ampwright/common';

export { SheetErrorCode };

/** The states in which cells may change, from the workflow rulebook. */
const EDITABLE: SheetState[] = [...EDITABLE_STATES];

export type CellView = CellDto;
export type SheetView = SheetDto;
export type SaveResult = SaveResultDto;

/**
 * What a change did: the ids of the cells it touched (their content, place or results may differ), those
 * whose content or people it edited, the cells it added, and the ids it removed.
 */
interface Applied {
  touched: Set<string>;
  edited?: Set<string>;
  inserted?: CellRecord[];
  removed?: string[];
}

/** The sheet's title and settings, which a change may set. */
interface Heading {
  title: string;
  settings: Record<string, unknown>;
}

/** An evaluation's results as a save stores them (ChangeToStore without the version and states). */
type Evaluated = Pick<ChangeToStore, 'results' | 'partial' | 'engineVersion' | 'base' | 'fingerprint'>;

/**
 * The fingerprint of the content whose evaluation the stored results are, when they are this version's by
 * this engine: the evaluation process then sends back only what differs from them.
 */
function storedBase(found: SheetHeadingRow): string | undefined {
  return found.resultsVersion === found.version && found.engineVersion === ENGINE_VERSION ? (found.resultsFingerprint ?? undefined) : undefined;
}

/** A stored cell as the sheet file has it. */
const cellFile = (c: Pick<CellRecord, 'kind' | 'fields'>) => ({ kind: c.kind, ...c.fields }) as SheetFile['cells'][number];

/**
 * A saved change's answer: each cell the change touched, whole, with its results; and the results of every
 * other cell evaluated afresh (its content is as the editor has it).
 */
function answer(version: number, cells: readonly CellRecord[], applied: Applied, results: ReadonlyMap<string, CellResult>): SaveResult {
  const touched = cells.filter((c) => applied.touched.has(c.id));
  return {
    version: version + 1,
    changed: touched.map(
      (c) =>
        ({
          id: c.id,
          position: c.position,
          kind: c.kind,
          fields: c.fields,
          results: results.get(c.id) ?? null,
          changedBy: c.changedBy,
          changedAt: c.changedAt.toISOString(),
          agreedBy: c.agreedBy,
          changedAfterAgreement: c.changedAfterAgreement,
        }) as CellDto,
    ),
    reevaluated: [...results].filter(([id]) => !applied.touched.has(id)).map(([id, r]) => ({ id, results: r })),
    removed: applied.removed ?? [],
  };
}

/**
 * A change to a sheet, run in the saving transaction on the sheet's heading and cells as read (in order,
 * without their results): it changes them in place and says what it did; the repository writes it.
 */
type Change = (heading: Heading, cells: CellRecord[]) => Applied;

function splitCell(cell: unknown): { kind: string; fields: Record<string, unknown> } {
  const parsed = cellSchema.safeParse(cell);
  if (!parsed.success) {
    const details = parsed.error.issues.map((i) => ({ field: ['cell', ...i.path.map(String)].join('.'), message: i.message }));
    throw new SheetException(SheetErrorCode.BadCell, `The cell is not valid: ${details.map((d) => d.message).join('; ')}`, { details });
  }
  const { kind, ...fields } = parsed.data as Record<string, unknown> & { kind: string };
  return { kind, fields };
}

@Injectable()
export class SheetsService {
  constructor(
    private readonly em: EntityManager,
    private readonly projects: ProjectsService,
    private readonly templates: TemplatesService,
    private readonly evaluation: EvaluationService,
    private readonly evaluator: SheetEvaluator,
    private readonly repository: SheetRepository,
    private readonly audit: AuditService,
    private readonly viewCache: SheetViewCache,
  ) {}

  /** A sheet of the caller's firm (members only); another firm's id is 404. */
  private async find(auth: AuthContext, id: string): Promise<Sheet> {
    const sheet = await this.repository.findInFirm(auth.firm.id, id);
    if (!sheet) throw new RequestException(ErrorCode.NotFound, 'No such sheet.');
    return sheet;
  }

  /** A sheet the caller may read (members of its firm). */
  findReadable(auth: AuthContext, id: string): Promise<Sheet> {
    return this.find(auth, id);
  }

  /**
   * A sheet the caller may change: of their firm, still being prepared or with the checker, and the
   * caller one of its preparers (the preparer, or a co-preparer the preparer named for this revision).
   */
  async findEditable(auth: AuthContext, id: string): Promise<Sheet> {
    const sheet = await this.find(auth, id);
    await this.assertMayEdit(auth, {
      id: sheet.id,
      state: sheet.state as SheetState,
      revisionNumber: sheet.revisionNumber,
      preparer: sheet.preparer,
      checker: sheet.checker ?? null,
      approver: sheet.approver ?? null,
    });
    return sheet;
  }

  /** The rulebook decides who may edit; the co-preparers are read only when the caller is not the preparer. */
  private async assertMayEdit(
    auth: AuthContext,
    sheet: Pick<SheetHeadingRow, 'id' | 'state' | 'revisionNumber' | 'preparer' | 'checker' | 'approver'>,
  ): Promise<void> {
    const actor = actorOf(auth);
    const facts = { state: sheet.state, preparer: sheet.preparer, checker: sheet.checker, approver: sheet.approver, coPreparerIds: [] as string[] };
    let refusal = editRefusal(facts, actor);
    if (refusal?.code === WorkflowCode.NotPreparer) {
      facts.coPreparerIds = (await this.em.getRepository(SheetAuthor).authorsOf(sheet.id, sheet.revisionNumber)).filter((a) => a.named).map((a) => a.userId);
      refusal = editRefusal(facts, actor);
    }
    enforce(refusal);
  }

  /** The preparer names the co-preparers of the revision being prepared: members of the firm with the engineer role. */
  async setCoPreparers(auth: AuthContext, id: string, dto: CoPreparersDto): Promise<SheetView> {
    const sheet = await this.find(auth, id);
    this.assertEditable(sheet.state);
    if (sheet.preparer.id !== auth.user.id)
      throw new SheetException(SheetErrorCode.NotPreparer, `Only the sheet's preparer (${sheet.preparer.name}) names its co-preparers.`);
    const ids = [...new Set(dto.userIds)].filter((u) => u !== sheet.preparer.id);
    const members = ids.length ? await this.em.find(Membership, { firm: auth.firm.id, user: { $in: ids } }) : [];
    for (const uid of ids) {
      const m = members.find((x) => x.user.id === uid);
      if (!m || !m.roles.includes('engineer'))
        throw new RequestException(ErrorCode.ValidationFailed, 'A co-preparer must be a member of the firm with the engineer role.', {
          details: [{ field: 'userIds', message: `${uid} is not an engineer of the firm` }],
        });
      if (uid === sheet.checker?.id || uid === sheet.approver?.id)
        throw new SheetException(SheetErrorCode.NotIndependent, "The sheet's checker or approver cannot be a co-preparer of it.", {
          details: [{ field: 'userIds', message: 'the checker or approver cannot prepare the sheet' }],
        });
    }
    await this.em.transactional((em) => em.getRepository(SheetAuthor).nameCoPreparers(sheet.id, sheet.revisionNumber, ids));
    await this.audit.record('co-preparers-named', {
      firmId: auth.firm.id,
      userId: auth.user.id,
      subjectId: id,
      detail: { sheet: sheet.number, coPreparers: ids },
    });
    return this.view(auth, id);
  }

  private assertEditable(state: SheetState): void {
    if (!EDITABLE.includes(state)) {
      throw new SheetException(SheetErrorCode.ReadOnly, `The sheet is ${state.replace('-', ' ')} and can no longer be edited.`);
    }
  }

  private async cells(sheet: Sheet): Promise<Cell[]> {
    return this.em.find(Cell, { sheet }, { orderBy: { position: 'asc' }, populate: ['changedBy', 'agreedBy'] });
  }

  /** A sheet of the caller's firm as the API shows it; another firm's id is 404. */
  private async view(auth: AuthContext, id: string): Promise<SheetView> {
    const view = await this.repository.view(auth.firm.id, id);
    if (!view) throw new RequestException(ErrorCode.NotFound, 'No such sheet.');
    return view;
  }

  toFile(sheet: Pick<Sheet, 'extra' | 'title' | 'settings'>, cells: readonly Pick<Cell, 'kind' | 'fields'>[]): SheetFile {
    return {
      ...sheet.extra,
      format: SHEET_FORMAT,
      title: sheet.title,
      settings: sheet.settings,
      cells: cells.map(cellFile),
    };
  }

  async list(auth: AuthContext, projectId: string): Promise<SheetSummaryDto[]> {
    const project = await this.projects.find(auth, projectId);
    const sheets = await this.em.find(Sheet, { project }, { orderBy: { number: 'asc' }, populate: ['preparer'] });
    const open = await this.repository.openQueryCounts(sheets.map((s) => s.id));
    return sheets.map((s) => ({
      id: s.id,
      number: s.number,
      title: s.title,
      state: s.state,
      version: s.version,
      preparer: s.preparer.name,
      openQueries: open.get(s.id) ?? 0,
      updatedAt: s.updatedAt.toISOString(),
    }));
  }

  async get(auth: AuthContext, id: string): Promise<SheetView> {
    return this.view(auth, id);
  }

  /**
   * The sheet as `get` gives it, as JSON bytes in parts — the heading, the cells (kept, and shared by every read
   * of them), the close — with the stored results passed through unparsed (the read of GET /sheets/:id).
   */
  async getJson(auth: AuthContext, id: string): Promise<Buffer[]> {
    const json = await this.repository.viewJson(auth.firm.id, id, this.viewCache);
    if (!json) throw new RequestException(ErrorCode.NotFound, 'No such sheet.');
    return json;
  }

  async export(auth: AuthContext, id: string): Promise<SheetFile> {
    const sheet = await this.find(auth, id);
    return this.toFile(sheet, await this.cells(sheet));
  }

  async create(auth: AuthContext, projectId: string, dto: CreateSheetDto): Promise<SheetView> {
    const project = await this.projects.find(auth, projectId);
    if (dto.templateId && dto.sheet) throw new RequestException(ErrorCode.ValidationFailed, 'Give a template or a sheet file, not both.');
    let file: SheetFile | undefined = dto.templateId ? await this.templates.get(auth, dto.templateId) : undefined;
    if (dto.sheet) {
      const parsed = parseSheetFile(dto.sheet);
      if (!parsed.ok) {
        const details = parsed.problems.map((p) => ({ field: `sheet.${p.path}`, message: p.message }));
        throw new RequestException(ErrorCode.ValidationFailed, `The sheet file is not valid: ${details.map((d) => `${d.field}: ${d.message}`).join('; ')}`, {
          details,
        });
      }
      file = parsed.sheet;
    }
    const title = dto.title ?? file?.title;
    if (!title)
      throw new RequestException(ErrorCode.ValidationFailed, 'title is needed for a blank sheet', {
        details: [{ field: 'title', message: 'title is needed for a blank sheet' }],
      });
    const { sheet, cells } = sheetFromFile(project, dto.number, title, file, this.em.getReference(User, auth.user.id));
    await this.evaluation.holding(auth.firm.id, async (reservation) => {
      this.em.persist(cells);
      try {
        await this.em.persist(sheet).flush();
      } catch (err) {
        if (err instanceof UniqueConstraintViolationException) {
          throw new SheetException(SheetErrorCode.NumberTaken, `Sheet number ${dto.number} is used in this project already.`, {
            details: [{ field: 'number', message: 'this sheet number is taken' }],
          });
        }
        throw err;
      }
      await this.evaluateAndStore(sheet.id, this.toFile(sheet, cells), cells, sheet.version, { firm: auth.firm.id, reservation });
    });
    return this.view(auth, sheet.id);
  }

  async remove(auth: AuthContext, id: string): Promise<void> {
    const sheet = await this.findEditable(auth, id);
    if (sheet.revisionNumber > 1)
      throw new SheetException(SheetErrorCode.HasRevisions, 'This sheet has issued revisions, which are kept for good; it cannot be deleted.');
    await this.em.remove(sheet).flush();
  }

  /**
   * The path of every save but the one-cell edit's (DEVELOPERS.md, "The path of a save"): the sheet read once
   * (with the rulebook's say on who may edit it) and the change applied to its cells in memory; one evaluation
   * of the changed sheet, outside any lock, whose process sends back only what differs from the stored
   * results; and one write of the change with those results, raising the version only if it is still the one
   * the change was made to — so of two concurrent saves exactly one wins, the other gets 409 with what its
   * editor needs to merge.
   */
  private async change(auth: AuthContext, id: string, version: number, apply: Change): Promise<SaveResult> {
    const found = await timed('db', () => this.editableHeading(auth, id, { cells: true }));
    if (found.version !== version) throw await this.stale(id);
    const cells = found.cells ?? [];
    const heading: Heading = { title: found.title, settings: found.settings };
    const base = storedBase(found);
    const placed = new Map(cells.map((c) => [c.id, c.position]));
    const applied = apply(heading, cells);
    const removed = new Set(applied.removed ?? []);
    const inserted = applied.inserted ?? [];
    const kept = cells.filter((c) => !removed.has(c.id));
    const writes: CellWrites = {
      inserted,
      edited: kept.filter((c) => applied.edited?.has(c.id)),
      moved: kept.filter((c) => placed.get(c.id) !== c.position),
      removed: [...removed],
    };
    const now = [...kept, ...inserted].sort((a, b) => a.position - b.position);
    const headingChanged = heading.title !== found.title || heading.settings !== found.settings;
    const file = this.toFile({ extra: found.extra, ...heading }, now);
    // A place in the firm's evaluation queue is held before anything is evaluated or written: a firm whose
    // queue is full is told so (429) and its change is not saved, rather than saved and left unevaluated.
    return this.evaluation.holding(auth.firm.id, async (reservation) => {
      const want = now.flatMap((c, index) => (applied.touched.has(c.id) ? [index] : []));
      const ids = now.map((c) => c.id);
      let evaluated = this.storable(ids, await this.evaluator.evaluateChange(file, { firm: auth.firm.id, reservation, key: id, base, want }), base);
      const write = (results: Evaluated) => this.write(auth, found, writes, headingChanged ? heading : undefined, results);
      let saved = await write(evaluated);
      if (saved === 'results-moved') {
        // The stored results changed since they were read (another engine, or evaluated afresh): every cell's.
        evaluated = this.storable(ids, await this.evaluator.evaluateChange(file, { firm: auth.firm.id, reservation, key: id, want }));
        saved = await write(evaluated);
      }
      if (saved !== 'saved') throw await this.stale(id);
      sheetSaves.inc({ path: 'whole-sheet' });
      return answer(version, now, applied, evaluated.results);
    });
  }

  /**
   * The usual save — one cell's content edited by the preparer — sent small: the sheet's heading, that cell
   * and the cells' ids read in one statement, and only that cell sent to the evaluation process that keeps the
   * stored sheet's evaluation (named by its fingerprint); then the same write as every save. Whatever this path
   * cannot do — the process does not keep that evaluation (another instance saved last, or it restarted), the
   * stored results are not this version's, a co-preparer edits — the whole-sheet path (`change`) does.
   */
  private async changeOneCell(auth: AuthContext, id: string, cellId: string, version: number, apply: Change): Promise<SaveResult> {
    const found = await timed('db', () => this.editableHeading(auth, id, { cell: cellId }));
    if (found.version !== version) throw await this.stale(id);
    const ids = found.cellIds ?? [];
    const index = ids.indexOf(cellId);
    const base = storedBase(found);
    const [cell] = found.cells ?? [];
    if (!cell || index < 0 || base === undefined || auth.user.id !== found.preparer.id) return this.change(auth, id, version, apply);
    const applied = apply({ title: found.title, settings: found.settings }, [cell]);
    const saved = await this.evaluation.holding(auth.firm.id, async (reservation) => {
      const outcome = await this.evaluator.evaluateEdit({ firm: auth.firm.id, reservation, key: id, base, index, cell: cellFile(cell) });
      if ('held' in outcome) {
        addTiming('eval', outcome.totalMs);
        return undefined;
      }
      const evaluated = this.storable(ids, outcome, base);
      const written = await this.write(auth, found, { inserted: [], edited: [cell], moved: [], removed: [] }, undefined, evaluated);
      if (written === 'stale') throw await this.stale(id);
      if (written !== 'saved') return undefined;
      sheetSaves.inc({ path: 'one-cell' });
      return answer(version, [cell], applied, evaluated.results);
    });
    return saved ?? this.change(auth, id, version, apply);
  }

  /**
   * Writes a change with its results, only while the sheet is still at the version read (and, for results
   * that complete the stored ones, while those are still of the content `base` names). Safe to repeat when
   * the database aborts it for a conflicting write (a Galera node's certification failure): each attempt
   * checks the version again, so it is stored once at most. The usual one-cell edit is one statement; any
   * other change is one short transaction.
   */
  private write(
    auth: AuthContext,
    found: SheetHeadingRow,
    writes: CellWrites,
    heading: Heading | undefined,
    evaluated: Evaluated,
  ): Promise<'saved' | 'stale' | 'results-moved'> {
    const { id, version } = found;
    const byPreparer = auth.user.id === found.preparer.id;
    const change: ChangeToStore = { version, states: EDITABLE, ...evaluated };
    return timed('db', () =>
      retryOnWriteConflict(async () => {
        const simple = !heading && byPreparer && !writes.inserted.length && !writes.removed.length && !writes.moved.length;
        if (simple && writes.edited.length === 1 && (await this.repository.saveCellEdit(id, writes.edited[0], change))) return 'saved';
        return this.em.transactional(async (em) => {
          const row = await this.repository.lockForSave(id);
          if (!row || row.version !== version || !EDITABLE.includes(row.state)) return 'stale';
          if (change.partial && (row.resultsVersion !== version || row.engineVersion !== change.engineVersion || row.resultsFingerprint !== change.base))
            return 'results-moved';
          if (!byPreparer) await em.getRepository(SheetAuthor).recordEdit(id, found.revisionNumber, auth.user.id);
          await this.repository.writeCells(id, writes);
          if (heading) await this.repository.writeHeading(id, heading);
          await this.repository.raiseWithResults(id, change);
          return 'saved';
        });
      }),
    );
  }

  /** A sheet the caller may change, read as a save needs it (one query, no entities); 404 or the rulebook's refusal otherwise. */
  private async editableHeading(auth: AuthContext, id: string, options: { cells?: boolean; cell?: string } = {}): Promise<SheetHeadingRow> {
    const heading = await this.repository.heading(auth.firm.id, id, options);
    if (!heading) throw new RequestException(ErrorCode.NotFound, 'No such sheet.');
    await this.assertMayEdit(auth, heading);
    return heading;
  }

  /** A save refused because the sheet moved on: 409 with what the editor needs to merge, or read-only, or gone. */
  private async stale(id: string): Promise<Error> {
    const current = await this.repository.contents(id);
    if (!current) return new RequestException(ErrorCode.NotFound, 'No such sheet.');
    if (!EDITABLE.includes(current.state))
      return new SheetException(SheetErrorCode.ReadOnly, `The sheet is ${current.state.replace('-', ' ')} and can no longer be edited.`);
    return new SheetException(
      SheetErrorCode.StaleVersion,
      'Someone else saved this sheet since you opened it. Their change is shown; your text is kept so you can apply it again.',
      { current },
    );
  }

  /**
   * What an evaluation gives to store, by cell id (`ids`: the sheet's cells in order): only the results that
   * differ from the stored ones (`partial`) when the process held the evaluation of the stored content, every
   * cell's otherwise. A sheet that cannot be evaluated at all (deadline, memory) gets, in every cell, the
   * reason instead of a number: no result of an older state stays on screen. The change itself is saved —
   * unless the server is stopping: then nothing is written and the answer is 503, to be sent again.
   */
  private storable(ids: readonly string[], outcome: ChangeOutcome, base?: string): Evaluated {
    addTiming('eval', outcome.totalMs);
    this.refuseIfStopping(outcome);
    if (!outcome.ok) return { results: this.unevaluated(ids, outcome.message), partial: false, engineVersion: null, fingerprint: null };
    addTiming('engine', outcome.engineMs);
    const results = new Map<string, CellResult>();
    for (const [index, result] of outcome.results) results.set(ids[index], result);
    return {
      results,
      partial: !outcome.complete,
      engineVersion: outcome.engineVersion,
      base: outcome.complete ? undefined : base,
      fingerprint: outcome.fingerprint ?? null,
    };
  }

  /** A sheet not evaluated because the server is stopping is not stored with that sentence: 503, nothing written. */
  private refuseIfStopping(outcome: ChangeOutcome | SheetOutcome): void {
    if (!outcome.ok && outcome.reason === 'shutdown') throw this.evaluation.failure(outcome.reason, outcome.message, true);
  }

  private unevaluated(ids: readonly string[], message: string): Map<string, CellResult> {
    const list = unevaluatedResults(ids.length, message);
    return new Map(ids.map((id, i) => [id, list[i]]));
  }

  /**
   * Evaluates a sheet afresh, as it stands, and stores every cell's results: what a checker sees after the
   * sheet comes back to them (review/workflow.service.ts).
   */
  async refreshResults(sheetId: string, firmId: string): Promise<void> {
    const em = this.em.fork();
    const sheet = await em.findOneOrFail(Sheet, sheetId);
    const cells = await em.find(Cell, { sheet }, { orderBy: { position: 'asc' }, exclude: ['results'] });
    await this.evaluation.holding(firmId, (reservation) =>
      this.evaluateAndStore(sheet.id, this.toFile(sheet, cells), cells, sheet.version, { firm: firmId, reservation }),
    );
  }

  /** Evaluates every cell of a sheet as it stands at `version` and stores the results while it is still at that version. */
  private async evaluateAndStore(
    sheetId: string,
    file: SheetFile,
    cells: readonly { id: string }[],
    version: number,
    options: { firm: string; reservation: Reservation },
  ): Promise<void> {
    const outcome = await this.evaluator.evaluate(file, { ...options, key: sheetId });
    this.refuseIfStopping(outcome);
    const ids = cells.map((c) => c.id);
    const results = outcome.ok ? new Map(ids.map((id, i) => [id, outcome.results[i]])) : this.unevaluated(ids, outcome.message);
    await this.repository.storeResults(sheetId, {
      version,
      results,
      engineVersion: outcome.ok ? outcome.engineVersion : null,
      fingerprint: outcome.ok ? (outcome.fingerprint ?? null) : null,
    });
  }

  update(auth: AuthContext, id: string, dto: UpdateSheetDto): Promise<SaveResult> {
    return this.change(auth, id, dto.version, (heading, cells) => {
      if (dto.title !== undefined) heading.title = dto.title;
      if (dto.settings !== undefined) {
        const parsed = parseSheetFile({ format: SHEET_FORMAT, title: heading.title, settings: dto.settings, cells: [] });
        if (!parsed.ok) throw new RequestException(ErrorCode.ValidationFailed, parsed.problems.map((p) => `${p.path}: ${p.message}`).join('; '));
        heading.settings = dto.settings;
      }
      return { touched: new Set(dto.settings !== undefined ? cells.map((c) => c.id) : []) };
    });
  }

  addCell(auth: AuthContext, id: string, dto: AddCellDto): Promise<SaveResult> {
    const { kind, fields } = splitCell(dto.cell);
    const actor = auth.user;
    return this.change(auth, id, dto.version, (_heading, cells) => {
      const position = Math.min(dto.position, cells.length);
      const shifted = cells.filter((c) => c.position >= position);
      for (const c of shifted) c.position += 1;
      const cell: CellRecord = {
        id: randomUUID(),
        position,
        kind,
        fields,
        changedById: actor.id,
        changedBy: actor.name,
        changedAt: new Date(),
        agreedById: null,
        agreedBy: null,
        agreedAt: null,
        changedAfterAgreement: false,
      };
      return { touched: new Set([cell.id, ...shifted.map((c) => c.id)]), inserted: [cell] };
    });
  }

  /** A CSV upload as a new table cell; any bad row is reported by its line and nothing is stored. */
  async importCsv(auth: AuthContext, id: string, file: { buffer: Buffer; originalname: string } | undefined, dto: ImportCsvDto): Promise<ImportResultDto> {
    if (!file)
      throw new RequestException(ErrorCode.ValidationFailed, 'Attach the CSV file in the field "file".', {
        details: [{ field: 'file', message: 'no file was sent' }],
      });
    // Nothing is parsed for a sheet the caller may not change; the parsing itself runs in an evaluation process.
    await this.editableHeading(auth, id);
    const parsed = await this.evaluation.parseCsv(auth.firm.id, file.buffer);
    if ('binary' in parsed) {
      throw new RequestException(
        ErrorCode.UnsupportedMediaType,
        `${file.originalname} is not a CSV text file (its content is binary), whatever its name says.`,
        { details: [{ field: 'file', message: 'not a text file' }] },
      );
    }
    if (!parsed.ok) {
      const details = parsed.problems.map((p) => ({ field: 'file', message: `line ${p.line}: ${p.message}` }));
      throw new SheetException(SheetErrorCode.CsvInvalid, `The CSV could not be read, so nothing was stored: ${details.map((d) => d.message).join('; ')}`, {
        details,
      });
    }
    const saved = await this.addCell(auth, id, { version: dto.version, position: dto.position, cell: parsed.cell as unknown as Record<string, unknown> });
    return { ...saved, detected: parsed.detected };
  }

  async updateCell(auth: AuthContext, id: string, cellId: string, dto: UpdateCellDto): Promise<SaveResult> {
    const { kind, fields } = splitCell(dto.cell);
    const actor = auth.user;
    // A set: the change may be applied twice (the one-cell path, then the whole-sheet path).
    const withdrawn = new Set<string>();
    const result = await this.changeOneCell(auth, id, cellId, dto.version, (_heading, cells) => {
      const cell = cells.find((c) => c.id === cellId);
      if (!cell) throw new RequestException(ErrorCode.NotFound, 'No such cell in this sheet.');
      const changed = cell.kind !== kind || JSON.stringify(cell.fields) !== JSON.stringify(fields);
      Object.assign(cell, { kind, fields, changedById: actor.id, changedBy: actor.name, changedAt: new Date() });
      // An edit withdraws the checker's agreement, and marks the cell for the checker to look at again.
      if (changed && cell.agreedById) {
        Object.assign(cell, { agreedById: null, agreedBy: null, agreedAt: null, changedAfterAgreement: true });
        withdrawn.add(cell.id);
      }
      return { touched: new Set([cell.id]), edited: new Set([cell.id]) };
    });
    for (const cell of withdrawn) {
      await this.audit.record('agreement-withdrawn', {
        firmId: auth.firm.id,
        userId: auth.user.id,
        subjectId: id,
        detail: { cell, reason: 'edited after the checker agreed it' },
      });
    }
    return result;
  }

  moveCell(auth: AuthContext, id: string, cellId: string, dto: MoveCellDto): Promise<SaveResult> {
    return this.change(auth, id, dto.version, (_heading, all) => {
      const cells = [...all];
      const from = cells.findIndex((c) => c.id === cellId);
      if (from < 0) throw new RequestException(ErrorCode.NotFound, 'No such cell in this sheet.');
      const [cell] = cells.splice(from, 1);
      cells.splice(Math.min(dto.position, cells.length), 0, cell);
      return { touched: renumber(cells) };
    });
  }

  deleteCell(auth: AuthContext, id: string, cellId: string, version: number): Promise<SaveResult> {
    return this.change(auth, id, version, (_heading, cells) => {
      const cell = cells.find((c) => c.id === cellId);
      if (!cell) throw new RequestException(ErrorCode.NotFound, 'No such cell in this sheet.');
      return { touched: renumber(cells.filter((c) => c !== cell)), removed: [cell.id] };
    });
  }
}

/** Numbers cells 0, 1, 2… in the order given; returns the ids whose position changed. */
function renumber(cells: CellRecord[]): Set<string> {
  const moved = new Set<string>();
  cells.forEach((c, i) => {
    if (c.position !== i) moved.add(c.id);
    c.position = i;
  });
  return moved;
}
