import { EntityManager, UniqueConstraintViolationException } from '@mikro-orm/core';
import { HttpStatus, Injectable } from '@nestjs/common';
import { cellSchema, csvToTableCell, parseSheetFile, SHEET_FORMAT, type CellDto, type CellResult, type SaveResultDto, type SheetDto, type SheetFile } from '@ampwright/common';
import { AppException, ErrorCode } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { EvaluationService } from '../evaluation/evaluation.service';
import { ProjectsService } from '../projects/projects.service';
import { TemplatesService } from '../templates/templates.service';
import type { AddCellDto, CreateSheetDto, ImportCsvDto, MoveCellDto, UpdateCellDto, UpdateSheetDto } from './dto/sheet.dto';
import { Cell } from './entities/cell.entity';
import { Sheet, type SheetState } from './entities/sheet.entity';
import { sheetFromFile } from './sheet-file';
import { isPlainText } from '../files/uploads';
import { User } from '../users/entities/user.entity';
import { AuditService } from '../audit/audit.service';
import { CellQuery } from '../review/entities/cell-query.entity';
import { revisionCode } from '@ampwright/common';

export enum SheetErrorCode {
  NumberTaken = 'SHEET_NUMBER_TAKEN',
  StaleVersion = 'STALE_VERSION',
  ReadOnly = 'SHEET_READ_ONLY',
  BadCell = 'INVALID_CELL',
  NotIndependent = 'NOT_INDEPENDENT',
  HasRevisions = 'SHEET_HAS_REVISIONS',
}

const EDITABLE: SheetState[] = ['being-prepared', 'with-checker'];

export type CellView = CellDto;
export type SheetView = SheetDto;
export type SaveResult = SaveResultDto;

const cellView = (c: Cell): CellView => ({
  id: c.id,
  position: c.position,
  kind: c.kind,
  fields: c.fields,
  results: (c.results as CellResult | undefined) ?? null,
  changedBy: c.changedBy?.name ?? null,
  changedAt: c.changedAt.toISOString(),
  agreedBy: c.agreedBy?.name ?? null,
  changedAfterAgreement: c.changedAfterAgreement,
});

const person = (u?: User) => (u ? { id: u.id, name: u.name } : null);

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

  /** A sheet the caller may change: of their firm, and still being prepared or with the checker. */
  async findEditable(auth: AuthContext, id: string): Promise<Sheet> {
    const sheet = await this.find(auth, id);
    this.assertEditable(sheet);
    if ((sheet.checker?.id === auth.session.user.id || sheet.approver?.id === auth.session.user.id) && sheet.preparer.id !== auth.session.user.id) {
      throw new AppException(SheetErrorCode.NotIndependent, 'You are this sheet\'s checker or approver, so you do not edit it: raise a query for the preparer instead.', HttpStatus.FORBIDDEN);
    }
    return sheet;
  }

  private assertEditable(sheet: Sheet): void {
    if (!EDITABLE.includes(sheet.state)) {
      throw new AppException(SheetErrorCode.ReadOnly, `The sheet is ${sheet.state.replace('-', ' ')} and can no longer be edited.`, HttpStatus.CONFLICT);
    }
  }

  private async cells(sheet: Sheet): Promise<Cell[]> {
    return this.em.find(Cell, { sheet }, { orderBy: { position: 'asc' }, populate: ['changedBy', 'agreedBy'] });
  }

  private async view(sheet: Sheet): Promise<SheetView> {
    return {
      id: sheet.id,
      projectId: sheet.project.id,
      number: sheet.number,
      title: sheet.title,
      settings: sheet.settings,
      state: sheet.state,
      version: sheet.version,
      engineVersion: sheet.engineVersion ?? null,
      preparer: { id: sheet.preparer.id, name: sheet.preparer.name },
      checker: person(sheet.checker),
      approver: person(sheet.approver),
      revisionNumber: sheet.revisionNumber,
      revisionCode: revisionCode(sheet.revisionNumber),
      openQueries: await this.em.count(CellQuery, { sheet, revisionNumber: sheet.revisionNumber, status: { $ne: 'closed' } }),
      cells: (await this.cells(sheet)).map(cellView),
    };
  }

  toFile(sheet: Sheet, cells: Cell[]): SheetFile {
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
    return this.view(await this.find(auth, id));
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
    this.em.persist(cells);
    try {
      await this.em.persist(sheet).flush();
    } catch (err) {
      if (err instanceof UniqueConstraintViolationException) {
        throw new AppException(SheetErrorCode.NumberTaken, `Sheet number ${dto.number} is used in this project already.`, HttpStatus.CONFLICT, [{ field: 'number', message: 'this sheet number is taken' }]);
      }
      throw err;
    }
    await this.evaluateAndStore(sheet);
    return this.view(sheet);
  }

  async remove(auth: AuthContext, id: string): Promise<void> {
    const sheet = await this.findEditable(auth, id);
    if (sheet.revisionNumber > 1) throw new AppException(SheetErrorCode.HasRevisions, 'This sheet has issued revisions, which are kept for good; it cannot be deleted.', HttpStatus.CONFLICT);
    await this.em.remove(sheet).flush();
  }

  /**
   * Applies a change made against `version`: in one transaction, the version is raised only if it is
   * still the one the change was based on, so of two concurrent saves exactly one wins; the other gets
   * 409 with the current sheet. Then the sheet is evaluated and the results stored with the cells.
   */
  private async change(auth: AuthContext, id: string, version: number, apply: (sheet: Sheet, cells: Cell[], em: EntityManager) => Promise<Set<string>> | Set<string>): Promise<SaveResult> {
    const sheet = await this.findEditable(auth, id);
    let touched = new Set<string>();
    let removed: string[] = [];
    await this.em.transactional(async (em) => {
      const raised = await em.nativeUpdate(Sheet, { id: sheet.id, version }, { version: version + 1 });
      if (raised === 0) {
        throw new AppException(SheetErrorCode.StaleVersion, 'Someone else saved this sheet since you opened it. Their change is shown; your text is kept so you can apply it again.', HttpStatus.CONFLICT, undefined);
      }
      const cells = await em.find(Cell, { sheet }, { orderBy: { position: 'asc' } });
      const before = new Set(cells.map((c) => c.id));
      touched = await apply(await em.findOneOrFail(Sheet, sheet.id), cells, em);
      await em.flush();
      const after = new Set((await em.find(Cell, { sheet }, { fields: ['id'] })).map((c) => c.id));
      removed = [...before].filter((x) => !after.has(x));
    }).catch(async (err) => {
      if (err instanceof AppException && err.code === SheetErrorCode.StaleVersion) {
        this.em.clear();
        throw new AppException(SheetErrorCode.StaleVersion, err.message, HttpStatus.CONFLICT, undefined, await this.view(await this.find(auth, id)));
      }
      throw err;
    });
    this.em.clear();
    const fresh = await this.find(auth, id);
    const changedByResults = await this.evaluateAndStore(fresh);
    const cells = await this.cells(fresh);
    const changed = cells.filter((c) => touched.has(c.id) || changedByResults.has(c.id)).map(cellView);
    return { version: fresh.version, changed, removed };
  }

  /** Evaluates the sheet in a worker and stores each cell's results; returns the ids whose results changed. */
  private async evaluateAndStore(sheet: Sheet): Promise<Set<string>> {
    const cells = await this.em.find(Cell, { sheet }, { orderBy: { position: 'asc' } });
    const outcome = await this.evaluation.evaluate(this.toFile(sheet, cells));
    const changed = new Set<string>();
    cells.forEach((cell, i) => {
      const result = outcome.cells[i];
      if (JSON.stringify(result) !== JSON.stringify(cell.results ?? null)) {
        cell.results = result;
        changed.add(cell.id);
      }
    });
    sheet.engineVersion = outcome.engineVersion;
    await this.em.flush();
    return changed;
  }

  update(auth: AuthContext, id: string, dto: UpdateSheetDto): Promise<SaveResult> {
    return this.change(auth, id, dto.version, (s, cells) => {
      if (dto.title !== undefined) s.title = dto.title;
      if (dto.settings !== undefined) {
        const parsed = parseSheetFile({ format: SHEET_FORMAT, title: s.title, settings: dto.settings, cells: [] });
        if (!parsed.ok) throw new AppException(ErrorCode.ValidationFailed, parsed.problems.map((p) => `${p.path}: ${p.message}`).join('; '), HttpStatus.BAD_REQUEST);
        s.settings = dto.settings;
      }
      return new Set(dto.settings !== undefined ? cells.map((c) => c.id) : []);
    });
  }

  addCell(auth: AuthContext, id: string, dto: AddCellDto): Promise<SaveResult> {
    const { kind, fields } = splitCell(dto.cell);
    return this.change(auth, id, dto.version, (sheet, cells, em) => {
      const position = Math.min(dto.position, cells.length);
      for (const c of cells) if (c.position >= position) c.position += 1;
      const cell = new Cell(sheet, position, kind, fields, em.getReference(User, auth.session.user.id));
      em.persist(cell);
      return new Set([cell.id, ...cells.filter((c) => c.position > position).map((c) => c.id)]);
    });
  }

  /** A CSV upload as a new table cell; any bad row is reported by its line and nothing is stored. */
  importCsv(auth: AuthContext, id: string, file: { buffer: Buffer; originalname: string } | undefined, dto: ImportCsvDto): Promise<SaveResult> {
    if (!file) throw new AppException(ErrorCode.ValidationFailed, 'Attach the CSV file in the field "file".', HttpStatus.BAD_REQUEST, [{ field: 'file', message: 'no file was sent' }]);
    if (!isPlainText(file.buffer)) {
      throw new AppException(ErrorCode.UnsupportedMediaType, `${file.originalname} is not a CSV text file (its content is binary), whatever its name says.`, HttpStatus.UNSUPPORTED_MEDIA_TYPE, [{ field: 'file', message: 'not a text file' }]);
    }
    const parsed = csvToTableCell(file.buffer.toString('utf8'));
    if (!parsed.ok) {
      const details = parsed.problems.map((p) => ({ field: 'file', message: `line ${p.line}: ${p.message}` }));
      throw new AppException('CSV_INVALID', `The CSV could not be read, so nothing was stored: ${details.map((d) => d.message).join('; ')}`, HttpStatus.BAD_REQUEST, details);
    }
    return this.addCell(auth, id, { version: dto.version, position: dto.position, cell: parsed.cell as unknown as Record<string, unknown> });
  }

  async updateCell(auth: AuthContext, id: string, cellId: string, dto: UpdateCellDto): Promise<SaveResult> {
    const { kind, fields } = splitCell(dto.cell);
    const withdrawn: string[] = [];
    const result = await this.change(auth, id, dto.version, (_sheet, cells, em) => {
      const cell = cells.find((c) => c.id === cellId);
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
      return new Set([cell.id]);
    });
    for (const cell of withdrawn) {
      await this.audit.record('agreement-withdrawn', { firmId: auth.session.firm.id, userId: auth.session.user.id, subjectId: id, detail: { cell, reason: 'edited after the checker agreed it' } });
    }
    return result;
  }

  moveCell(auth: AuthContext, id: string, cellId: string, dto: MoveCellDto): Promise<SaveResult> {
    return this.change(auth, id, dto.version, (_sheet, cells) => {
      const from = cells.findIndex((c) => c.id === cellId);
      if (from < 0) throw new AppException(ErrorCode.NotFound, 'No such cell in this sheet.', HttpStatus.NOT_FOUND);
      const [cell] = cells.splice(from, 1);
      cells.splice(Math.min(dto.position, cells.length), 0, cell);
      const moved = new Set<string>();
      cells.forEach((c, i) => {
        if (c.position !== i) moved.add(c.id);
        c.position = i;
      });
      return moved;
    });
  }

  deleteCell(auth: AuthContext, id: string, cellId: string, version: number): Promise<SaveResult> {
    return this.change(auth, id, version, (_sheet, cells, em) => {
      const cell = cells.find((c) => c.id === cellId);
      if (!cell) throw new AppException(ErrorCode.NotFound, 'No such cell in this sheet.', HttpStatus.NOT_FOUND);
      em.remove(cell);
      const rest = cells.filter((c) => c !== cell);
      const moved = new Set<string>();
      rest.forEach((c, i) => {
        if (c.position !== i) moved.add(c.id);
        c.position = i;
      });
      return moved;
    });
  }
}
