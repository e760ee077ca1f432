import { createHash } from 'node:crypto';
import { UniqueConstraintViolationException } from '@mikro-orm/core';
import { EntityManager } from '@mikro-orm/mariadb';
import { HttpStatus, Injectable } from '@nestjs/common';
import { EDITABLE_STATES, editRefusal, WorkflowCode, cellSchema, parseSheetFile, revisionCode, SHEET_FORMAT, unevaluatedResults, type CellDto, type CellResult, type SaveResultDto, type SheetDto, type SheetFile } from '@ampwright/common';
import { AppException, ErrorCode } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { EvaluationService, type Reservation } from '../evaluation/evaluation.service';
import { Membership } from '../firms/entities/membership.entity';
import { authorsOf, nameCoPreparers, recordEdit } from './sheet-authors';
import { ProjectsService } from '../projects/projects.service';
import { TemplatesService } from '../templates/templates.service';
import type { AddCellDto, CoPreparersDto, CreateSheetDto, ImportCsvDto, MoveCellDto, UpdateCellDto, UpdateSheetDto } from './dto/sheet.dto';
import { Cell } from './entities/cell.entity';
import { Sheet, type SheetState } from './entities/sheet.entity';
import { actorOf, enforce } from '../core/errors/refusal';
import { sheetFromFile } from './sheet-file';
import { User } from '../users/entities/user.entity';
import { AuditService } from '../audit/audit.service';
import { CellQuery } from '../review/entities/cell-query.entity';
import { SheetErrorCode } from '@ampwright/common';

export { SheetErrorCode };

/** The states in which cells may change, from the workflow rulebook. */
const EDITABLE: SheetState[] = [...EDITABLE_STATES];

export type CellView = CellDto;
export type SheetView = SheetDto;
export type SaveResult = SaveResultDto;

/** A cell row as read for a sheet's view, without loading entities (reads are the hot path). */
interface CellRow {
  id: string;
  position: number;
  kind: string;
  fields: unknown;
  results: unknown;
  changed_at: Date | string;
  changed_after_agreement: number | boolean;
  changed_by: string | null;
  agreed_by: string | null;
}

const parsedJson = (v: unknown) => (typeof v === 'string' ? JSON.parse(v) : v);
const sha1 = (text: string) => createHash('sha1').update(text, 'utf8').digest('hex');

const rowView = (r: CellRow): CellView => ({
  id: r.id,
  position: r.position,
  kind: r.kind,
  fields: parsedJson(r.fields) as Record<string, unknown>,
  results: (parsedJson(r.results) as CellResult | null) ?? null,
  changedBy: r.changed_by,
  changedAt: new Date(r.changed_at).toISOString(),
  agreedBy: r.agreed_by,
  changedAfterAgreement: !!r.changed_after_agreement,
});

interface SheetRow {
  id: string;
  project_id: string;
  number: string;
  title: string;
  settings: unknown;
  state: SheetState;
  version: number;
  engine_version: string | null;
  revision_number: number;
  preparer_id: string;
  preparer_name: string;
  checker_id: string | null;
  checker_name: string | null;
  approver_id: string | null;
  approver_name: string | null;
  open_queries: number | bigint | string;
  /** JSON array of {id, name, named} from sheet_author, or null. */
  authors: unknown;
}

/** A sheet's cells in order, as stored (their content, not their results). */
async function cellContents(em: EntityManager, sheetId: string): Promise<CellContent[]> {
  const rows = await em.execute<{ id: string; kind: string; fields: unknown }[]>('select id, kind, fields from cell where sheet_id = ? order by position', [sheetId]);
  return rows.map((r) => ({ id: r.id, kind: r.kind, fields: parsedJson(r.fields) as Record<string, unknown> }));
}

/** The co-preparers, and everyone who may not check or approve the revision (preparer, co-preparers, editors). */
function authorFields(preparerId: string, raw: unknown): Pick<SheetView, 'coPreparers' | 'authorIds'> {
  const authors = ((raw === null || raw === undefined ? [] : parsedJson(raw)) ?? []) as { id: string; name: string; named: number | boolean }[];
  return {
    coPreparers: authors.filter((a) => a.named).map((a) => ({ id: a.id, name: a.name })).sort((a, b) => a.name.localeCompare(b.name)),
    authorIds: [preparerId, ...authors.map((a) => a.id)],
  };
}

/** What a change did: the ids of the cells it touched, and of those it removed. */
interface Applied {
  touched: Set<string>;
  removed?: string[];
}

/** A cell as the engine needs it. */
type CellContent = Pick<Cell, 'id' | 'kind' | 'fields'>;

/**
 * A change to a sheet, run in the saving transaction. `cells` loads all the sheet's cells as entities
 * (without their results) for changes that need them; a cell edit, the common case, loads just its own.
 */
type Change = (sheet: Sheet, em: EntityManager, cells: () => Promise<Cell[]>) => Promise<Applied> | Applied;

function splitCell(cell: unknown): { kind: string; fields: Record<string, unknown> } {
  const parsed = cellSchema.safeParse(cell);
  if (!parsed.success) {
    const details = parsed.error.issues.map((i) => ({ field: ['cell', ...i.path.map(String)].join('.'), message: i.message }));
    throw new AppException(SheetErrorCode.BadCell, `The cell is not valid: ${details.map((d) => d.message).join('; ')}`, HttpStatus.BAD_REQUEST, details);
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
    private readonly audit: AuditService,
  ) {}

  /** A sheet of the caller's firm (members only); another firm's id is 404. */
  private async find(auth: AuthContext, id: string): Promise<Sheet> {
    const sheet = await this.em.findOne(Sheet, { id, project: { firm: auth.session.firm } }, { populate: ['project', 'preparer', 'checker', 'approver'] });
    if (!sheet) throw new AppException(ErrorCode.NotFound, 'No such sheet.', HttpStatus.NOT_FOUND);
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
    // The rulebook decides; the co-preparers are read only when the caller is not the preparer.
    const actor = actorOf(auth);
    const facts = { state: sheet.state as SheetState, preparer: sheet.preparer, checker: sheet.checker, approver: sheet.approver, coPreparerIds: [] as string[] };
    let refusal = editRefusal(facts, actor);
    if (refusal?.code === WorkflowCode.NotPreparer) {
      facts.coPreparerIds = (await authorsOf(this.em, sheet.id, sheet.revisionNumber)).filter((a) => a.named).map((a) => a.userId);
      refusal = editRefusal(facts, actor);
    }
    enforce(refusal);
    return sheet;
  }

  /** The preparer names the co-preparers of the revision being prepared: members of the firm with the engineer role. */
  async setCoPreparers(auth: AuthContext, id: string, dto: CoPreparersDto): Promise<SheetView> {
    const sheet = await this.find(auth, id);
    this.assertEditable(sheet.state);
    if (sheet.preparer.id !== auth.session.user.id) throw new AppException(SheetErrorCode.NotPreparer, `Only the sheet's preparer (${sheet.preparer.name}) names its co-preparers.`, HttpStatus.FORBIDDEN);
    const ids = [...new Set(dto.userIds)].filter((u) => u !== sheet.preparer.id);
    const members = ids.length ? await this.em.find(Membership, { firm: auth.session.firm, user: { $in: ids } }) : [];
    for (const uid of ids) {
      const m = members.find((x) => x.user.id === uid);
      if (!m || !m.roles.includes('engineer')) throw new AppException(ErrorCode.ValidationFailed, 'A co-preparer must be a member of the firm with the engineer role.', HttpStatus.BAD_REQUEST, [{ field: 'userIds', message: `${uid} is not an engineer of the firm` }]);
      if (uid === sheet.checker?.id || uid === sheet.approver?.id) throw new AppException(SheetErrorCode.NotIndependent, 'The sheet\'s checker or approver cannot be a co-preparer of it.', HttpStatus.BAD_REQUEST, [{ field: 'userIds', message: 'the checker or approver cannot prepare the sheet' }]);
    }
    await this.em.transactional((em) => nameCoPreparers(em, sheet.id, sheet.revisionNumber, ids));
    await this.audit.record('co-preparers-named', { firmId: auth.session.firm.id, userId: auth.session.user.id, subjectId: id, detail: { sheet: sheet.number, coPreparers: ids } });
    return this.view(auth, id);
  }

  private assertEditable(state: SheetState): void {
    if (!EDITABLE.includes(state)) {
      throw new AppException(SheetErrorCode.ReadOnly, `The sheet is ${state.replace('-', ' ')} and can no longer be edited.`, HttpStatus.CONFLICT);
    }
  }

  private async cells(sheet: Sheet): Promise<Cell[]> {
    return this.em.find(Cell, { sheet }, { orderBy: { position: 'asc' }, populate: ['changedBy', 'agreedBy'] });
  }

  /** The cells of a sheet as the API shows them, read in one query. */
  private async cellViews(sheetId: string, only?: string[]): Promise<CellView[]> {
    if (only && !only.length) return [];
    const rows = await this.em.execute<CellRow[]>(
      `select c.id, c.position, c.kind, c.fields, c.results, c.changed_at, c.changed_after_agreement, cu.name as changed_by, au.name as agreed_by
         from cell c left join app_user cu on cu.id = c.changed_by_id left join app_user au on au.id = c.agreed_by_id
        where c.sheet_id = ?${only ? ` and c.id in (${only.map(() => '?').join(', ')})` : ''} order by c.position`,
      [sheetId, ...(only ?? [])],
    );
    return rows.map(rowView);
  }

  /**
   * A sheet of the caller's firm as the API shows it (another firm's id is 404), in two queries:
   * the sheet with its people and open-query count, then its cells. Reading a sheet is the hot path.
   */
  private async view(auth: AuthContext, id: string): Promise<SheetView> {
    const [s] = await this.em.execute<SheetRow[]>(
      `select s.id, s.project_id, s.number, s.title, s.settings, s.state, s.version, s.engine_version, s.revision_number,
              s.preparer_id, pu.name as preparer_name, s.checker_id, cu.name as checker_name, s.approver_id, au.name as approver_name,
              (select count(*) from cell_query q where q.sheet_id = s.id and q.revision_number = s.revision_number and q.status <> 'closed') as open_queries,
              (select json_arrayagg(json_object('id', a.user_id, 'name', au2.name, 'named', a.named)) from sheet_author a join app_user au2 on au2.id = a.user_id
                where a.sheet_id = s.id and a.revision_number = s.revision_number) as authors
         from sheet s
         join project p on p.id = s.project_id
         join app_user pu on pu.id = s.preparer_id
         left join app_user cu on cu.id = s.checker_id
         left join app_user au on au.id = s.approver_id
        where s.id = ? and p.firm_id = ?`,
      [id, auth.session.firm.id],
    );
    if (!s) throw new AppException(ErrorCode.NotFound, 'No such sheet.', HttpStatus.NOT_FOUND);
    const who = (personId: string | null, name: string | null) => (personId ? { id: personId, name: name ?? '' } : null);
    return {
      id: s.id,
      projectId: s.project_id,
      number: s.number,
      title: s.title,
      settings: parsedJson(s.settings) as Record<string, unknown>,
      state: s.state,
      version: s.version,
      engineVersion: s.engine_version ?? null,
      preparer: { id: s.preparer_id, name: s.preparer_name },
      checker: who(s.checker_id, s.checker_name),
      approver: who(s.approver_id, s.approver_name),
      revisionNumber: s.revision_number,
      revisionCode: revisionCode(s.revision_number),
      openQueries: Number(s.open_queries),
      ...authorFields(s.preparer_id, s.authors),
      cells: await this.cellViews(s.id),
    };
  }

  toFile(sheet: Sheet, cells: readonly Pick<Cell, 'kind' | 'fields'>[]): SheetFile {
    return { ...sheet.extra, format: SHEET_FORMAT, title: sheet.title, settings: sheet.settings, cells: cells.map((c) => ({ kind: c.kind, ...c.fields }) as SheetFile['cells'][number]) };
  }

  async list(auth: AuthContext, projectId: string) {
    const project = await this.projects.find(auth, projectId);
    const sheets = await this.em.find(Sheet, { project }, { orderBy: { number: 'asc' }, populate: ['preparer'] });
    const open = await this.openQueryCounts(sheets);
    return sheets.map((s) => ({ id: s.id, number: s.number, title: s.title, state: s.state, version: s.version, preparer: s.preparer.name, openQueries: open.get(s.id) ?? 0, updatedAt: s.updatedAt.toISOString() }));
  }

  /** Queries not closed, by sheet, for the revision each sheet is being prepared as. */
  async openQueryCounts(sheets: Sheet[]): Promise<Map<string, number>> {
    const counts = new Map<string, number>();
    if (!sheets.length) return counts;
    const rows = await this.em.find(CellQuery, { sheet: { $in: sheets.map((s) => s.id) }, status: { $ne: 'closed' } }, { fields: ['sheet', 'revisionNumber'] });
    const current = new Map(sheets.map((s) => [s.id, s.revisionNumber]));
    for (const q of rows) if (current.get(q.sheet.id) === q.revisionNumber) counts.set(q.sheet.id, (counts.get(q.sheet.id) ?? 0) + 1);
    return counts;
  }

  async get(auth: AuthContext, id: string): Promise<SheetView> {
    return this.view(auth, id);
  }

  async export(auth: AuthContext, id: string): Promise<SheetFile> {
    const sheet = await this.find(auth, id);
    return this.toFile(sheet, await this.cells(sheet));
  }

  async create(auth: AuthContext, projectId: string, dto: CreateSheetDto): Promise<SheetView> {
    const project = await this.projects.find(auth, projectId);
    if (dto.templateId && dto.sheet) throw new AppException(ErrorCode.ValidationFailed, 'Give a template or a sheet file, not both.', HttpStatus.BAD_REQUEST);
    let file: SheetFile | undefined = dto.templateId ? await this.templates.get(auth, dto.templateId) : undefined;
    if (dto.sheet) {
      const parsed = parseSheetFile(dto.sheet);
      if (!parsed.ok) {
        const details = parsed.problems.map((p) => ({ field: `sheet.${p.path}`, message: p.message }));
        throw new AppException(ErrorCode.ValidationFailed, `The sheet file is not valid: ${details.map((d) => `${d.field}: ${d.message}`).join('; ')}`, HttpStatus.BAD_REQUEST, details);
      }
      file = parsed.sheet;
    }
    const title = dto.title ?? file?.title;
    if (!title) throw new AppException(ErrorCode.ValidationFailed, 'title is needed for a blank sheet', HttpStatus.BAD_REQUEST, [{ field: 'title', message: 'title is needed for a blank sheet' }]);
    const { sheet, cells } = sheetFromFile(project, dto.number, title, file, auth.session.user);
    await this.evaluation.holding(auth.session.firm.id, async (reservation) => {
      this.em.persist(cells);
      try {
        await this.em.persist(sheet).flush();
      } catch (err) {
        if (err instanceof UniqueConstraintViolationException) {
          throw new AppException(SheetErrorCode.NumberTaken, `Sheet number ${dto.number} is used in this project already.`, HttpStatus.CONFLICT, [{ field: 'number', message: 'this sheet number is taken' }]);
        }
        throw err;
      }
      await this.evaluateAndStore(sheet, cells, sheet.version, { firm: auth.session.firm.id, reservation });
    });
    return this.view(auth, sheet.id);
  }

  async remove(auth: AuthContext, id: string): Promise<void> {
    const sheet = await this.findEditable(auth, id);
    if (sheet.revisionNumber > 1) throw new AppException(SheetErrorCode.HasRevisions, 'This sheet has issued revisions, which are kept for good; it cannot be deleted.', HttpStatus.CONFLICT);
    await this.em.remove(sheet).flush();
  }

  /**
   * Applies a change made against `version`: in one transaction, the version is raised only if it is
   * still the one the change was based on, so of two concurrent saves exactly one wins; the other gets
   * 409 with the current sheet. Then the cells as they now stand are evaluated and their results stored.
   */
  private async change(auth: AuthContext, id: string, version: number, apply: Change): Promise<SaveResult> {
    const sheet = await this.findEditable(auth, id);
    // A place in the firm's evaluation queue is held before anything is written: a firm whose queue is
    // full is told so (429) and its change is not saved, rather than saved and left unevaluated.
    return this.evaluation.holding(auth.session.firm.id, (reservation) => this.changeHolding(sheet, auth, id, version, apply, reservation));
  }

  private async changeHolding(sheet: Sheet, auth: AuthContext, id: string, version: number, apply: Change, reservation: Reservation): Promise<SaveResult> {
    let applied: Applied = { touched: new Set() };
    let contents: CellContent[] = [];
    let current = sheet;
    await this.em.transactional(async (em) => {
      // The state check and the version bump in one statement: a save cannot land on a sheet that has
      // just been passed or approved.
      const raised = await em.nativeUpdate(Sheet, { id: sheet.id, version, state: { $in: EDITABLE } }, { version: version + 1 });
      if (raised === 0) {
        const [now] = await em.execute<{ state: SheetState }[]>('select state from sheet where id = ?', [sheet.id]);
        if (now) this.assertEditable(now.state);
        throw new AppException(SheetErrorCode.StaleVersion, 'Someone else saved this sheet since you opened it. Their change is shown; your text is kept so you can apply it again.', HttpStatus.CONFLICT, undefined);
      }
      current = await em.findOneOrFail(Sheet, sheet.id);
      if (auth.session.user.id !== current.preparer.id) await recordEdit(em, sheet.id, current.revisionNumber, auth.session.user.id);
      // Results are not loaded: they are computed afresh below, and stored apart from the change.
      applied = await apply(current, em, () => em.find(Cell, { sheet }, { orderBy: { position: 'asc' }, exclude: ['results'] }));
      await em.flush();
      contents = await cellContents(em, sheet.id);
    }).catch(async (err) => {
      if (err instanceof AppException && err.code === SheetErrorCode.StaleVersion) {
        throw new AppException(SheetErrorCode.StaleVersion, err.message, HttpStatus.CONFLICT, undefined, await this.view(auth, id));
      }
      throw err;
    });
    const { results, changed } = await this.evaluateAndStore(current, contents, version + 1, { firm: auth.session.firm.id, reservation });
    const shown = new Set(contents.filter((c) => applied.touched.has(c.id) || changed.has(c.id)).map((c) => c.id));
    const views = await this.cellViews(sheet.id, [...shown]);
    return { version: version + 1, changed: views.map((v) => ({ ...v, results: results.get(v.id) ?? v.results })), removed: applied.removed ?? [] };
  }

  /**
   * Evaluates a sheet afresh, as it stands, and stores every cell's results: what a checker sees after the
   * sheet comes back to them (review/workflow.service.ts).
   */
  async refreshResults(sheetId: string, firmId: string): Promise<void> {
    const em = this.em.fork();
    const sheet = await em.findOneOrFail(Sheet, sheetId);
    const contents = await cellContents(em, sheetId);
    await this.evaluation.holding(firmId, (reservation) => this.evaluateAndStore(sheet, contents, sheet.version, { firm: firmId, reservation }));
  }

  /**
   * Evaluates the cells of a sheet as they stand at `version` and stores each result that differs
   * from the stored one. The results are stored only while the sheet is still at that version (its row
   * locked): a later save evaluates a later state and stores that, so older results never overwrite
   * newer ones. A sheet that cannot be evaluated at all (deadline, memory) gets, in every cell, the
   * reason instead of a number: no result of an older state stays on screen. The change itself is saved.
   * Returns the results by cell id and the ids whose stored results changed.
   */
  private async evaluateAndStore(sheet: Sheet, cells: readonly CellContent[], version: number, options: { firm: string; reservation: Reservation }): Promise<{ results: Map<string, CellResult>; changed: Set<string> }> {
    const outcome = await this.evaluation.evaluate(this.toFile(sheet, cells), { ...options, key: sheet.id });
    const results = outcome.ok ? outcome.cells : unevaluatedResults(cells.length, outcome.message);
    const engineVersion = outcome.ok ? outcome.engineVersion : null;
    const byId = new Map(cells.map((c, i) => [c.id, results[i]]));
    const changed = new Set<string>();
    await this.em.transactional(async (em) => {
      const [row] = await em.execute<{ version: number }[]>('select version from sheet where id = ? for update', [sheet.id]);
      if (row?.version !== version) return;
      const stored = await em.execute<{ id: string; digest: string | null }[]>('select id, sha1(results) as digest from cell where sheet_id = ?', [sheet.id]);
      const digests = new Map(stored.map((r) => [r.id, r.digest]));
      const writes: [string, string][] = [];
      for (const cell of cells) {
        const json = JSON.stringify(byId.get(cell.id) ?? null);
        if (digests.get(cell.id) !== sha1(json)) writes.push([cell.id, json]);
      }
      for (let k = 0; k < writes.length; k += 200) {
        const batch = writes.slice(k, k + 200);
        await em.execute(
          `update cell set results = case id ${batch.map(() => 'when ? then ?').join(' ')} end where id in (${batch.map(() => '?').join(', ')})`,
          [...batch.flat(), ...batch.map(([cellId]) => cellId)],
          'run',
        );
      }
      for (const [cellId] of writes) changed.add(cellId);
      if (engineVersion && engineVersion !== sheet.engineVersion) await em.execute('update sheet set engine_version = ? where id = ?', [engineVersion, sheet.id], 'run');
    });
    return { results: byId, changed };
  }

  update(auth: AuthContext, id: string, dto: UpdateSheetDto): Promise<SaveResult> {
    return this.change(auth, id, dto.version, async (s, _em, all) => {
      if (dto.title !== undefined) s.title = dto.title;
      if (dto.settings !== undefined) {
        const parsed = parseSheetFile({ format: SHEET_FORMAT, title: s.title, settings: dto.settings, cells: [] });
        if (!parsed.ok) throw new AppException(ErrorCode.ValidationFailed, parsed.problems.map((p) => `${p.path}: ${p.message}`).join('; '), HttpStatus.BAD_REQUEST);
        s.settings = dto.settings;
      }
      return { touched: new Set(dto.settings !== undefined ? (await all()).map((c) => c.id) : []) };
    });
  }

  addCell(auth: AuthContext, id: string, dto: AddCellDto): Promise<SaveResult> {
    const { kind, fields } = splitCell(dto.cell);
    return this.change(auth, id, dto.version, async (sheet, em, all) => {
      const cells = await all();
      const position = Math.min(dto.position, cells.length);
      for (const c of cells) if (c.position >= position) c.position += 1;
      const cell = new Cell(sheet, position, kind, fields, em.getReference(User, auth.session.user.id));
      em.persist(cell);
      return { touched: new Set([cell.id, ...cells.filter((c) => c.position > position).map((c) => c.id)]) };
    });
  }

  /** A CSV upload as a new table cell; any bad row is reported by its line and nothing is stored. */
  async importCsv(auth: AuthContext, id: string, file: { buffer: Buffer; originalname: string } | undefined, dto: ImportCsvDto): Promise<SaveResult> {
    if (!file) throw new AppException(ErrorCode.ValidationFailed, 'Attach the CSV file in the field "file".', HttpStatus.BAD_REQUEST, [{ field: 'file', message: 'no file was sent' }]);
    // Nothing is parsed for a sheet the caller may not change; the parsing itself runs in an evaluation process.
    await this.findEditable(auth, id);
    const parsed = await this.evaluation.parseCsv(auth.session.firm.id, file.buffer);
    if ('binary' in parsed) {
      throw new AppException(ErrorCode.UnsupportedMediaType, `${file.originalname} is not a CSV text file (its content is binary), whatever its name says.`, HttpStatus.UNSUPPORTED_MEDIA_TYPE, [{ field: 'file', message: 'not a text file' }]);
    }
    if (!parsed.ok) {
      const details = parsed.problems.map((p) => ({ field: 'file', message: `line ${p.line}: ${p.message}` }));
      throw new AppException('CSV_INVALID', `The CSV could not be read, so nothing was stored: ${details.map((d) => d.message).join('; ')}`, HttpStatus.BAD_REQUEST, details);
    }
    return this.addCell(auth, id, { version: dto.version, position: dto.position, cell: parsed.cell as unknown as Record<string, unknown> });
  }

  async updateCell(auth: AuthContext, id: string, cellId: string, dto: UpdateCellDto): Promise<SaveResult> {
    const { kind, fields } = splitCell(dto.cell);
    const withdrawn: string[] = [];
    const result = await this.change(auth, id, dto.version, async (sheet, em) => {
      const cell = await em.findOne(Cell, { id: cellId, sheet }, { exclude: ['results'] });
      if (!cell) throw new AppException(ErrorCode.NotFound, 'No such cell in this sheet.', HttpStatus.NOT_FOUND);
      const changed = cell.kind !== kind || JSON.stringify(cell.fields) !== JSON.stringify(fields);
      cell.kind = kind;
      cell.fields = fields;
      cell.changedBy = em.getReference(User, auth.session.user.id);
      cell.changedAt = new Date();
      // An edit withdraws the checker's agreement, and marks the cell for the checker to look at again.
      if (changed && cell.agreedBy) {
        cell.agreedBy = undefined;
        cell.agreedAt = undefined;
        cell.changedAfterAgreement = true;
        withdrawn.push(cell.id);
      }
      return { touched: new Set([cell.id]) };
    });
    for (const cell of withdrawn) {
      await this.audit.record('agreement-withdrawn', { firmId: auth.session.firm.id, userId: auth.session.user.id, subjectId: id, detail: { cell, reason: 'edited after the checker agreed it' } });
    }
    return result;
  }

  moveCell(auth: AuthContext, id: string, cellId: string, dto: MoveCellDto): Promise<SaveResult> {
    return this.change(auth, id, dto.version, async (_sheet, _em, all) => {
      const cells = await all();
      const from = cells.findIndex((c) => c.id === cellId);
      if (from < 0) throw new AppException(ErrorCode.NotFound, 'No such cell in this sheet.', HttpStatus.NOT_FOUND);
      const [cell] = cells.splice(from, 1);
      cells.splice(Math.min(dto.position, cells.length), 0, cell);
      const moved = new Set<string>();
      cells.forEach((c, i) => {
        if (c.position !== i) moved.add(c.id);
        c.position = i;
      });
      return { touched: moved };
    });
  }

  deleteCell(auth: AuthContext, id: string, cellId: string, version: number): Promise<SaveResult> {
    return this.change(auth, id, version, async (_sheet, em, all) => {
      const cells = await all();
      const cell = cells.find((c) => c.id === cellId);
      if (!cell) throw new AppException(ErrorCode.NotFound, 'No such cell in this sheet.', HttpStatus.NOT_FOUND);
      em.remove(cell);
      const rest = cells.filter((c) => c !== cell);
      const moved = new Set<string>();
      rest.forEach((c, i) => {
        if (c.position !== i) moved.add(c.id);
        c.position = i;
      });
      return { touched: moved, removed: [cell.id] };
    });
  }
}
