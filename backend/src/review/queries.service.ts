/** Queries on cells and the checker's agreement with cells. */
import { EntityManager, LockMode } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { isEditable, type QueryDto, type SheetState, WorkflowCode } from '@ampwright/common';
import { AuditService } from '../audit/audit.service';
import { ErrorCode, RequestException, WorkflowException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { NotificationsService } from '../notifications/notifications.service';
import { Cell } from '../sheets/entities/cell.entity';
import { Sheet } from '../sheets/entities/sheet.entity';
import { SheetsService } from '../sheets/sheets.service';
import { User } from '../users/entities/user.entity';
import type { RaiseQueryDto, ReplyDto, NoteDto } from './dto/review.dto';
import { CellQuery, QueryMessage } from './entities/cell-query.entity';
import { isUser, requireChecker, requireState } from './review-access';

export const queryView = (q: CellQuery): QueryDto => ({
  id: q.id,
  cellId: q.cell?.id ?? null,
  line: q.line ?? null,
  status: q.status,
  raisedBy: q.raisedBy.name,
  revisionNumber: q.revisionNumber,
  messages: q.messages.getItems().map((m) => ({ id: m.id, author: m.author.name, authorId: m.author.id, text: m.text, createdAt: m.createdAt.toISOString() })),
  closedBy: q.closedBy?.name ?? null,
  closedAt: q.closedAt?.toISOString() ?? null,
  createdAt: q.createdAt.toISOString(),
});

const POPULATE = ['messages', 'messages.author', 'raisedBy', 'closedBy', 'cell'] as const;

@Injectable()
export class QueriesService {
  constructor(
    private readonly em: EntityManager,
    private readonly sheets: SheetsService,
    private readonly notifications: NotificationsService,
    private readonly audit: AuditService,
  ) {}

  private link(sheet: Sheet) {
    return `/projects/${sheet.project.id}/sheets/${sheet.id}`;
  }

  private async tell(sheet: Sheet, to: User | undefined, kind: string, subject: string, text: string) {
    if (!to) return;
    await this.notifications.notify([{ user: to }], { kind, subject, text, link: this.link(sheet), firm: sheet.project.firm.name });
  }

  private record(
    auth: AuthContext,
    type: 'query-raised' | 'query-replied' | 'query-closed' | 'cell-agreed' | 'agreement-withdrawn',
    sheet: Sheet,
    detail: Record<string, unknown>,
  ) {
    return this.audit.record(type, {
      firmId: auth.firm.id,
      userId: auth.user.id,
      subjectId: sheet.id,
      detail: { sheet: sheet.number, ...detail },
    });
  }

  async list(auth: AuthContext, sheetId: string, all: boolean): Promise<QueryDto[]> {
    const sheet = await this.sheets.findReadable(auth, sheetId);
    const rows = await this.em.find(
      CellQuery,
      { sheet, ...(all ? {} : { revisionNumber: sheet.revisionNumber }) },
      { orderBy: { createdAt: 'asc' }, populate: POPULATE },
    );
    return rows.map(queryView);
  }

  async raise(auth: AuthContext, sheetId: string, dto: RaiseQueryDto): Promise<QueryDto> {
    await this.sheets.findReadable(auth, sheetId);
    let id = '';
    let sheet!: Sheet;
    await this.em.transactional(async (em) => {
      sheet = await em.findOneOrFail(Sheet, { id: sheetId }, { lockMode: LockMode.PESSIMISTIC_WRITE });
      await em.populate(sheet, ['preparer', 'checker', 'project', 'project.firm']);
      requireState(sheet, ['with-checker'], 'raise a query');
      requireChecker(auth, sheet, 'raise a query');
      const cell = await em.findOne(Cell, { id: dto.cellId, sheet });
      if (!cell)
        throw new RequestException(ErrorCode.NotFound, 'No such cell in this sheet.', { details: [{ field: 'cellId', message: 'not a cell of this sheet' }] });
      if (dto.line !== undefined) {
        const lines = cell.kind === 'calc' ? String(cell.fields.source ?? '').split('\n').length : 1;
        if (dto.line > lines)
          throw new RequestException(ErrorCode.ValidationFailed, `The cell has ${lines} line${lines === 1 ? '' : 's'}; there is no line ${dto.line}.`, {
            details: [{ field: 'line', message: `at most ${lines}` }],
          });
      }
      const query = new CellQuery(sheet, cell, dto.line, em.getReference(User, auth.user.id), sheet.revisionNumber);
      em.persist(query);
      em.persist(new QueryMessage(query, em.getReference(User, auth.user.id), dto.text));
      id = query.id;
    });
    await this.record(auth, 'query-raised', sheet, { query: id, line: dto.line ?? null });
    await this.tell(
      sheet,
      sheet.preparer,
      'query-raised',
      `Query raised on ${sheet.number}`,
      `${auth.user.name} raised a query on sheet ${sheet.number}: ${dto.text}`,
    );
    return this.one(id);
  }

  private async one(id: string): Promise<QueryDto> {
    this.em.clear();
    return queryView(await this.em.findOneOrFail(CellQuery, id, { populate: POPULATE }));
  }

  private async findQuery(auth: AuthContext, id: string): Promise<CellQuery> {
    const q = await this.em.findOne(
      CellQuery,
      { id, sheet: { project: { firm: auth.firm.id } } },
      { populate: ['sheet', 'sheet.preparer', 'sheet.checker', 'sheet.project', 'sheet.project.firm'] },
    );
    if (!q) throw new RequestException(ErrorCode.NotFound, 'No such query.');
    return q;
  }

  /** A reply by the preparer answers the query; one by the checker keeps (or puts) it open. */
  async reply(auth: AuthContext, id: string, dto: ReplyDto): Promise<QueryDto> {
    const q = await this.findQuery(auth, id);
    const sheet = q.sheet;
    if (q.status === 'closed')
      throw new WorkflowException({
        code: WorkflowCode.OutOfTurn,
        kind: 'conflict',
        message: 'The query is closed; raise a new one if something is still wrong.',
      });
    const byPreparer = isUser(auth, sheet.preparer);
    const byChecker = isUser(auth, sheet.checker);
    if (!byPreparer && !byChecker)
      throw new WorkflowException({
        code: WorkflowCode.NotYours,
        kind: 'forbidden',
        message: "Only the sheet's preparer and its checker take part in a query.",
      });
    if (!isEditable(sheet.state as SheetState))
      throw new WorkflowException({ code: WorkflowCode.OutOfTurn, kind: 'conflict', message: 'The sheet is past checking; its queries can no longer change.' });
    this.em.persist(new QueryMessage(q, this.em.getReference(User, auth.user.id), dto.text));
    q.status = byPreparer ? 'answered' : 'open';
    await this.em.flush();
    await this.record(auth, 'query-replied', sheet, { query: q.id, status: q.status });
    await this.tell(
      sheet,
      byPreparer ? sheet.checker : sheet.preparer,
      'query-answered',
      `Query ${byPreparer ? 'answered' : 'followed up'} on ${sheet.number}`,
      `${auth.user.name} replied to a query on sheet ${sheet.number}: ${dto.text}`,
    );
    return this.one(q.id);
  }

  async close(auth: AuthContext, id: string, dto: NoteDto): Promise<QueryDto> {
    const q = await this.findQuery(auth, id);
    const sheet = q.sheet;
    requireChecker(auth, sheet, 'close a query');
    requireState(sheet, ['with-checker'], 'close a query');
    if (q.status === 'closed') throw new WorkflowException({ code: WorkflowCode.OutOfTurn, kind: 'conflict', message: 'The query is closed already.' });
    if (dto.note) this.em.persist(new QueryMessage(q, this.em.getReference(User, auth.user.id), dto.note));
    q.status = 'closed';
    q.closedBy = this.em.getReference(User, auth.user.id);
    q.closedAt = new Date();
    await this.em.flush();
    await this.record(auth, 'query-closed', sheet, { query: q.id });
    return this.one(q.id);
  }

  async agree(auth: AuthContext, sheetId: string, cellId: string, agreed: boolean): Promise<void> {
    const sheet = await this.sheets.findReadable(auth, sheetId);
    await this.em.populate(sheet, ['checker']);
    requireState(sheet, ['with-checker'], agreed ? 'agree a cell' : 'withdraw an agreement');
    requireChecker(auth, sheet, agreed ? 'agree a cell' : 'withdraw an agreement');
    const cell = await this.em.findOne(Cell, { id: cellId, sheet });
    if (!cell) throw new RequestException(ErrorCode.NotFound, 'No such cell in this sheet.');
    cell.agreedBy = agreed ? this.em.getReference(User, auth.user.id) : undefined;
    cell.agreedAt = agreed ? new Date() : undefined;
    if (agreed) cell.changedAfterAgreement = false;
    await this.em.flush();
    await this.record(auth, agreed ? 'cell-agreed' : 'agreement-withdrawn', sheet, { cell: cell.id, position: cell.position + 1 });
  }
}
