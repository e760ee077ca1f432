import { WorkflowCode } from '@ampwright/common';
/**
 * The life of a sheet: being prepared → with the checker → checked → approved → issued, and back from
 * the checker to the preparer. Each move locks the sheet's row (SELECT … FOR UPDATE) and checks the
 * state inside that lock, so of two people acting at once one wins and the other is told why.
 */
import { LockMode } from '@mikro-orm/core';
import { EntityManager } from '@mikro-orm/mariadb';
import { Injectable } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import type { AuditType } from '../audit/entities/audit-event.entity';
import { WorkflowException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { currentRequestId } from '../core/middleware/request-id';
import type { Role } from '../core/roles';
import { Membership } from '../firms/entities/membership.entity';
import { NotificationsService, type NoticeTarget } from '../notifications/notifications.service';
import { ProjectPerson } from '../projects/entities/project.entity';
import { Sheet } from '../sheets/entities/sheet.entity';
import { SheetsService } from '../sheets/sheets.service';
import { User } from '../users/entities/user.entity';
import { mailTemplates } from '../mail/mail-templates';
import type { NoteDto, RequestCheckDto } from './dto/review.dto';
import { Revision } from './entities/revision.entity';
import { PackageJob } from '../packages/entities/package-job.entity';
import { SheetAuthor } from '../sheets/entities/sheet-author.entity';
import { factsOf, requireMove } from './review-access';
import { RevisionsService } from './revisions.service';

@Injectable()
export class WorkflowService {
  constructor(
    private readonly em: EntityManager,
    private readonly sheets: SheetsService,
    private readonly revisions: RevisionsService,
    private readonly notifications: NotificationsService,
    private readonly audit: AuditService,
  ) {}

  /** Runs `act` on the sheet locked for update, then records the event and tells people. */
  private async locked<T>(auth: AuthContext, id: string, act: (sheet: Sheet, em: EntityManager) => Promise<T>): Promise<{ sheet: Sheet; out: T }> {
    await this.sheets.findReadable(auth, id);
    let sheet!: Sheet;
    let out!: T;
    await this.em.transactional(async (em) => {
      sheet = await em.findOneOrFail(Sheet, { id }, { lockMode: LockMode.PESSIMISTIC_WRITE });
      await em.populate(sheet, ['preparer', 'checker', 'approver', 'project', 'project.firm']);
      out = await act(sheet, em);
      sheet.version += 1;
      await em.flush();
    });
    this.em.clear();
    return { sheet, out };
  }

  private async member(auth: AuthContext, userId: string, role: Role, what: string): Promise<User> {
    const m = await this.em.findOne(Membership, { firm: auth.firm.id, user: userId }, { populate: ['user'] });
    if (!m || !m.roles.includes(role))
      throw new WorkflowException({
        code: WorkflowCode.BadAssignee,
        kind: 'invalid',
        message: `The ${what} must be a member of the firm with the ${role} role.`,
        details: [{ field: `${what}Id`, message: `not a ${role} of the firm` }],
      });
    return m.user;
  }

  private link(sheet: Sheet) {
    return `/projects/${sheet.project.id}/sheets/${sheet.id}`;
  }

  private async record(auth: AuthContext, type: AuditType, sheet: Sheet, detail: Record<string, unknown> = {}) {
    await this.audit.record(type, {
      firmId: auth.firm.id,
      userId: auth.user.id,
      subjectId: sheet.id,
      detail: { sheet: sheet.number, ...detail },
    });
  }

  private tell(sheet: Sheet, targets: (User | undefined)[], kind: string, subject: string, text: string) {
    return this.notifications.notify(
      targets.filter((u): u is User => !!u).map((user) => ({ user })),
      { kind, subject, text, link: this.link(sheet), firm: sheet.project.firm.name },
    );
  }

  async requestCheck(auth: AuthContext, id: string, dto: RequestCheckDto) {
    const { sheet } = await this.locked(auth, id, async (s, em) => {
      requireMove('request-check', auth, factsOf(s, await em.getRepository(SheetAuthor).notIndependent(s)), {
        checkerId: dto.checkerId,
        approverId: dto.approverId,
      });
      s.checker = await this.member(auth, dto.checkerId, 'checker', 'checker');
      if (dto.approverId) s.approver = await this.member(auth, dto.approverId, 'approver', 'approver');
      s.state = 'with-checker';
      s.checkRequestedAt = new Date();
      s.checkedAt = undefined;
    });
    await this.record(auth, 'check-requested', sheet, { checker: sheet.checker!.name });
    await this.tell(
      sheet,
      [sheet.checker],
      'check-requested',
      `Check requested: ${sheet.number}`,
      `${auth.user.name} asks you to check sheet ${sheet.number} "${sheet.title}".`,
    );
    return this.sheets.get(auth, id);
  }

  async returnToPreparer(auth: AuthContext, id: string, dto: NoteDto) {
    const { sheet } = await this.locked(auth, id, async (s, em) => {
      requireMove('return', auth, factsOf(s, await em.getRepository(SheetAuthor).notIndependent(s)));
      s.state = 'being-prepared';
    });
    await this.record(auth, 'sheet-returned', sheet, { note: dto.note ?? null });
    await this.tell(
      sheet,
      [sheet.preparer],
      'sheet-returned',
      `Returned: ${sheet.number}`,
      `${auth.user.name} returned sheet ${sheet.number} to you${dto.note ? `: ${dto.note}` : '.'}`,
    );
    return this.sheets.get(auth, id);
  }

  async passCheck(auth: AuthContext, id: string) {
    const { sheet } = await this.locked(auth, id, async (s, em) => {
      const open = await em.getRepository(Sheet).openQueriesOf(s.id);
      requireMove('pass', auth, factsOf(s, await em.getRepository(SheetAuthor).notIndependent(s), open));
      s.state = 'checked';
      s.checkedAt = new Date();
    });
    await this.record(auth, 'check-passed', sheet);
    await this.tell(
      sheet,
      [sheet.preparer, sheet.approver],
      'check-passed',
      `Check passed: ${sheet.number}`,
      `${auth.user.name} passed the check of sheet ${sheet.number} "${sheet.title}".`,
    );
    return this.sheets.get(auth, id);
  }

  async approve(auth: AuthContext, id: string) {
    const { sheet } = await this.locked(auth, id, async (s, em) => {
      requireMove('approve', auth, factsOf(s, await em.getRepository(SheetAuthor).notIndependent(s)));
      s.approver = this.em.getReference(User, auth.user.id);
      s.state = 'approved';
      s.approvedAt = new Date();
    });
    await this.record(auth, 'sheet-approved', sheet);
    await this.tell(
      sheet,
      [sheet.preparer],
      'sheet-approved',
      `Approved: ${sheet.number}`,
      `${auth.user.name} approved sheet ${sheet.number} "${sheet.title}".`,
    );
    return this.sheets.get(auth, id);
  }

  /**
   * Sends a checked or approved sheet back to its checker (the approver, or an owner, who had no hand in
   * it): evaluated afresh and stored, so the checker checks again what would be issued — the way out when
   * an issue was refused because the results changed.
   */
  async returnToChecker(auth: AuthContext, id: string, dto: NoteDto) {
    const { sheet } = await this.locked(auth, id, async (s, em) => {
      requireMove('return-to-checker', auth, factsOf(s, await em.getRepository(SheetAuthor).notIndependent(s)));
      s.state = 'with-checker';
      s.checkedAt = undefined;
      s.approvedAt = undefined;
    });
    await this.sheets.refreshResults(id, auth.firm.id);
    await this.record(auth, 'sheet-returned-to-checker', sheet, { note: dto.note ?? null });
    await this.tell(
      sheet,
      [sheet.checker],
      'sheet-returned-to-checker',
      `Back for checking: ${sheet.number}`,
      `${auth.user.name} returned sheet ${sheet.number} to you to check again${dto.note ? `: ${dto.note}` : '.'}`,
    );
    return this.sheets.get(auth, id);
  }

  /**
   * Freezes the sheet as the next revision: an immutable snapshot with its SHA-256. The sheet is evaluated
   * afresh before its row is locked (nothing slow runs inside the lock); the lock then checks the move
   * and that the sheet is still at the version evaluated.
   */
  async issue(auth: AuthContext, id: string) {
    // Refused before the evaluation when the rulebook says no now; checked again under the lock.
    const current = await this.sheets.findReadable(auth, id);
    requireMove('issue', auth, factsOf(current, await this.em.getRepository(SheetAuthor).notIndependent(current)));
    const fresh = await this.revisions.evaluateForIssue(auth, id);
    const { sheet, out: revision } = await this.locked(auth, id, async (s, em) => {
      requireMove('issue', auth, factsOf(s, await em.getRepository(SheetAuthor).notIndependent(s)));
      const revision = await this.revisions.freeze(em, s, fresh);
      // The signed package is made by a worker, off this request (see PackagesService).
      em.persist(new PackageJob(revision, currentRequestId()));
      s.state = 'issued';
      return revision;
    });
    await this.record(auth, 'revision-issued', sheet, { revision: revision.code, sha256: revision.snapshotSha256 });
    await this.tell(
      sheet,
      [sheet.approver, sheet.preparer, sheet.checker],
      'revision-issued',
      `Issued: ${sheet.number} revision ${revision.code}`,
      `Sheet ${sheet.number} "${sheet.title}" was issued as revision ${revision.code}.`,
    );
    const clients = await this.em.find(ProjectPerson, { project: sheet.project.id, standing: 'client' }, { populate: ['user'] });
    const firm = sheet.project.firm.name;
    const targets: NoticeTarget[] = clients.map((c) => ({
      user: c.user,
      mail: mailTemplates.revisionIssued({
        to: c.user.email,
        firm,
        sheet: `${sheet.number} ${sheet.title}`,
        revision: revision.code,
        url: this.notifications.url('/portal'),
      }),
    }));
    await this.notifications.notify(targets, {
      kind: 'revision-issued',
      subject: `Issued: ${sheet.number} revision ${revision.code}`,
      text: `${firm} issued revision ${revision.code} of sheet ${sheet.number} "${sheet.title}".`,
      link: '/portal',
      firm,
    });
    return this.revisions.summary(revision.id);
  }

  /** A new draft after an issue: the cells as in the last issued snapshot, the next revision number. */
  async startRevision(auth: AuthContext, id: string) {
    const { sheet } = await this.locked(auth, id, async (s, em) => {
      requireMove('new-revision', auth, factsOf(s, new Map()));
      const last = await em.findOneOrFail(Revision, { sheet: s }, { orderBy: { number: 'desc' } });
      await this.revisions.restoreCells(em, last, s, em.getReference(User, auth.user.id));
      s.revisionNumber = last.number + 1;
      s.state = 'being-prepared';
      s.preparer = em.getReference(User, auth.user.id);
      s.checkRequestedAt = s.checkedAt = s.approvedAt = undefined;
    });
    await this.record(auth, 'revision-started', sheet, { revisionNumber: sheet.revisionNumber });
    return this.sheets.get(auth, id);
  }
}
