import { createHash } from 'node:crypto';
import { EntityManager } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import {
  canonicalJson,
  diffCells,
  revisionCode,
  type CellResult,
  type DiffDto,
  type HistoryEventDto,
  type QueryDto,
  type RevisionSummaryDto,
  type SheetFile,
  type SnapshotCell,
  WorkflowCode,
} from '@ampwright/common';
import { Attachment } from '../attachments/entities/attachment.entity';
import { AuditEvent } from '../audit/entities/audit-event.entity';
import { ErrorCode, RequestException, SheetException, WorkflowException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { EvaluationService } from '../evaluation/evaluation.service';
import { SheetEvaluator } from '../evaluation/sheet-evaluator';
import { SheetErrorCode } from '@ampwright/common';
import { Cell } from '../sheets/entities/cell.entity';
import { Sheet } from '../sheets/entities/sheet.entity';
import { SheetsService } from '../sheets/sheets.service';
import { User } from '../users/entities/user.entity';
import { CellQuery } from './entities/cell-query.entity';
import { Revision } from './entities/revision.entity';
import { queryView } from './queries.service';
import { Firm } from '../firms/entities/firm.entity';

export const SNAPSHOT_FORMAT = 'ampwright.revision/1';

/** What an issued revision holds; its canonical JSON's SHA-256 is the revision's identity. */
export interface RevisionSnapshot {
  format: typeof SNAPSHOT_FORMAT;
  revision: { code: string; number: number };
  firm: string;
  project: { jobNumber: string; title: string; clientOrganisation: string; site: string };
  sheetNumber: string;
  sheet: SheetFile;
  cellIds: string[];
  results: (CellResult | null)[];
  engineVersion: string;
  people: { preparedBy: string; checkedBy: string; approvedBy: string };
  dates: { checkRequestedAt: string | null; checkedAt: string | null; approvedAt: string | null; issuedAt: string };
  queries: QueryDto[];
  attachments: { id: string; fileName: string; mediaType: string; size: number; sha256: string }[];
  /** How the package is laid out, fixed at issue (absent in older snapshots, whose packages carry the register). */
  packageOptions?: { queryRegister: boolean };
}

/** A sheet evaluated afresh for its issue, at `version`. */
export interface FreshEvaluation {
  version: number;
  engineVersion: string;
  cells: CellResult[];
}

export const sha256Of = (value: unknown) => createHash('sha256').update(canonicalJson(value)).digest('hex');

const iso = (d?: Date) => d?.toISOString() ?? null;

@Injectable()
export class RevisionsService {
  constructor(
    private readonly em: EntityManager,
    private readonly sheets: SheetsService,
    private readonly evaluation: EvaluationService,
    private readonly evaluator: SheetEvaluator,
  ) {}

  /** The firm's choice, read from its row (the request's firm entity may be partly loaded). */
  private async firmShowsQueryRegister(em: EntityManager, firmId: string): Promise<boolean> {
    return (await em.findOneOrFail(Firm, firmId, { refresh: true })).packageQueryRegister;
  }

  /**
   * Evaluates a sheet afresh (never from a cache) for its issue, outside any lock: what this engine gives
   * for the sheet as it stands at the version returned. freeze() then checks, under the lock, that the
   * sheet is still at that version.
   */
  async evaluateForIssue(auth: AuthContext, id: string): Promise<FreshEvaluation> {
    const em = this.em.fork();
    const sheet = await em.findOneOrFail(Sheet, { id, project: { firm: auth.firm.id } });
    const cells = await em.find(Cell, { sheet }, { orderBy: { position: 'asc' }, exclude: ['results'] });
    const outcome = await this.evaluator.evaluate(this.sheets.toFile(sheet, cells), { firm: auth.firm.id });
    if (!outcome.ok) throw this.evaluation.failure(outcome.reason, outcome.message, true);
    return { version: sheet.version, engineVersion: outcome.engineVersion, cells: outcome.results };
  }

  /**
   * Builds and stores the snapshot of a sheet (locked by the caller) as its next revision, with the results
   * of `fresh` (evaluateForIssue, run before the lock was taken). Refused when the sheet moved on since.
   */
  async freeze(em: EntityManager, sheet: Sheet, fresh: FreshEvaluation): Promise<Revision> {
    if (sheet.version !== fresh.version) {
      throw new SheetException(SheetErrorCode.StaleVersion, 'The sheet changed while it was being evaluated for issue, so nothing was issued. Issue it again.');
    }
    const cells = await em.find(Cell, { sheet }, { orderBy: { position: 'asc' } });
    const file = this.sheets.toFile(sheet, cells);
    // What was checked is what is issued: the fresh results must be the ones stored, which the checker saw.
    const stable = (v: unknown) => canonicalJson(JSON.parse(JSON.stringify(v ?? null)));
    const drifted = cells.map((c, k) => ({ position: k + 1, same: stable(c.results) === stable(fresh.cells[k]) })).filter((c) => !c.same);
    if (drifted.length) {
      const list = drifted.map((c) => c.position).join(', ');
      throw new WorkflowException({
        code: WorkflowCode.ResultsChanged,
        kind: 'conflict',
        message: `The sheet cannot be issued: evaluated afresh, ${drifted.length === 1 ? `cell ${list} gives` : `cells ${list} give`} results other than those the checker saw. Nothing was issued; tell the checker and the preparer.`,
        details: drifted.map((c) => ({ field: `cells[${c.position - 1}]`, message: 'its results differ from the checked ones' })),
      });
    }
    const queries = await em.find(
      CellQuery,
      { sheet, revisionNumber: sheet.revisionNumber },
      { orderBy: { createdAt: 'asc' }, populate: ['messages', 'messages.author', 'raisedBy', 'closedBy', 'cell'] },
    );
    const attachments = await em.find(Attachment, { sheet }, { orderBy: { createdAt: 'asc' } });
    const issuedAt = new Date();
    const code = revisionCode(sheet.revisionNumber);
    const snapshot: RevisionSnapshot = {
      format: SNAPSHOT_FORMAT,
      revision: { code, number: sheet.revisionNumber },
      firm: sheet.project.firm.name,
      project: {
        jobNumber: sheet.project.jobNumber,
        title: sheet.project.title,
        clientOrganisation: sheet.project.clientOrganisation,
        site: sheet.project.site,
      },
      sheetNumber: sheet.number,
      sheet: file,
      cellIds: cells.map((c) => c.id),
      results: fresh.cells,
      engineVersion: fresh.engineVersion,
      people: { preparedBy: sheet.preparer.name, checkedBy: sheet.checker!.name, approvedBy: sheet.approver!.name },
      dates: {
        checkRequestedAt: iso(sheet.checkRequestedAt),
        checkedAt: iso(sheet.checkedAt),
        approvedAt: iso(sheet.approvedAt),
        issuedAt: issuedAt.toISOString(),
      },
      queries: queries.map(queryView),
      attachments: attachments.map((a) => ({ id: a.id, fileName: a.fileName, mediaType: a.mediaType, size: a.size, sha256: a.sha256 })),
      packageOptions: { queryRegister: await this.firmShowsQueryRegister(em, sheet.project.firm.id) },
    };
    const revision = new Revision(sheet, {
      number: sheet.revisionNumber,
      code,
      snapshot: JSON.parse(canonicalJson(snapshot)),
      snapshotSha256: sha256Of(snapshot),
      engineVersion: fresh.engineVersion,
      preparedBy: sheet.preparer,
      checkedBy: sheet.checker!,
      approvedBy: sheet.approver!,
      checkRequestedAt: sheet.checkRequestedAt,
      checkedAt: sheet.checkedAt,
      approvedAt: sheet.approvedAt,
      issuedAt,
    });
    em.persist(revision);
    return revision;
  }

  /** Puts the sheet's cells back as in a revision's snapshot, keeping their ids (so diffs match cells). */
  async restoreCells(em: EntityManager, revision: Revision, sheet: Sheet, by: User): Promise<void> {
    const snap = revision.snapshot as unknown as RevisionSnapshot;
    const existing = new Map((await em.find(Cell, { sheet })).map((c) => [c.id, c]));
    snap.sheet.cells.forEach((fileCell, position) => {
      const { kind, ...fields } = fileCell as Record<string, unknown> & { kind: string };
      const id = snap.cellIds[position];
      let cell = existing.get(id);
      if (!cell) {
        cell = new Cell(sheet, position, kind, fields, by);
        cell.id = id;
        em.persist(cell);
      }
      existing.delete(id);
      Object.assign(cell, {
        position,
        kind,
        fields,
        results: snap.results[position] ?? undefined,
        agreedBy: undefined,
        agreedAt: undefined,
        changedAfterAgreement: false,
      });
    });
    for (const extra of existing.values()) em.remove(extra);
    // The stored results are now the snapshot's, not those of an evaluation of a version.
    sheet.resultsVersion = null;
    sheet.resultsFingerprint = null;
  }

  toSummary(r: Revision): RevisionSummaryDto {
    return {
      id: r.id,
      code: r.code,
      number: r.number,
      snapshotSha256: r.snapshotSha256,
      pdfSha256: r.pdfSha256 ?? null,
      engineVersion: r.engineVersion,
      preparedBy: r.preparedBy.name,
      checkedBy: r.checkedBy.name,
      approvedBy: r.approvedBy.name,
      checkRequestedAt: iso(r.checkRequestedAt),
      checkedAt: iso(r.checkedAt),
      approvedAt: iso(r.approvedAt),
      issuedAt: r.issuedAt.toISOString(),
    };
  }

  async summary(id: string): Promise<RevisionSummaryDto> {
    return this.toSummary(await this.em.findOneOrFail(Revision, id, { populate: ['preparedBy', 'checkedBy', 'approvedBy'] }));
  }

  /** Every issued revision of a sheet, oldest first (no access check: for the package maker). */
  async summaries(sheetId: string): Promise<RevisionSummaryDto[]> {
    const rows = await this.em.find(Revision, { sheet: sheetId }, { orderBy: { number: 'asc' }, populate: ['preparedBy', 'checkedBy', 'approvedBy'] });
    return rows.map((r) => this.toSummary(r));
  }

  async list(auth: AuthContext, sheetId: string): Promise<RevisionSummaryDto[]> {
    const sheet = await this.sheets.findReadable(auth, sheetId);
    const rows = await this.em.find(Revision, { sheet }, { orderBy: { number: 'asc' }, populate: ['preparedBy', 'checkedBy', 'approvedBy'] });
    return rows.map((r) => this.toSummary(r));
  }

  private async find(auth: AuthContext, id: string): Promise<Revision> {
    const r = await this.em.findOne(
      Revision,
      { id, sheet: { project: { firm: auth.firm.id } } },
      { populate: ['preparedBy', 'checkedBy', 'approvedBy', 'sheet'] },
    );
    if (!r) throw new RequestException(ErrorCode.NotFound, 'No such revision.');
    return r;
  }

  async get(auth: AuthContext, id: string): Promise<RevisionSummaryDto & { snapshot: RevisionSnapshot }> {
    const r = await this.find(auth, id);
    return { ...this.toSummary(r), snapshot: r.snapshot as unknown as RevisionSnapshot };
  }

  private snapshotCells(snap: RevisionSnapshot): SnapshotCell[] {
    return snap.sheet.cells.map((c, i) => {
      const { kind, ...fields } = c as Record<string, unknown> & { kind: string };
      return { id: snap.cellIds[i], kind, fields, results: snap.results[i] ?? null };
    });
  }

  /** `from` and `to` are revision ids, or `draft` for the sheet as it is now. */
  async diff(auth: AuthContext, sheetId: string, from: string, to: string): Promise<DiffDto> {
    const sheet = await this.sheets.findReadable(auth, sheetId);
    const side = async (ref: string): Promise<{ label: string; cells: SnapshotCell[] }> => {
      if (ref === 'draft') {
        const cells = await this.em.find(Cell, { sheet }, { orderBy: { position: 'asc' } });
        return {
          label: `${revisionCode(sheet.revisionNumber)} (${sheet.state === 'issued' ? 'issued' : 'draft'})`,
          cells: cells.map((c) => ({ id: c.id, kind: c.kind, fields: c.fields, results: (c.results as CellResult | undefined) ?? null })),
        };
      }
      const r = await this.em.findOne(Revision, { id: ref, sheet });
      if (!r) throw new RequestException(ErrorCode.NotFound, `No revision ${ref} of this sheet.`);
      return { label: r.code, cells: this.snapshotCells(r.snapshot as unknown as RevisionSnapshot) };
    };
    const [a, b] = await Promise.all([side(from), side(to)]);
    return { from: a.label, to: b.label, cells: diffCells(a.cells, b.cells) };
  }

  /** The sheet's audit trail: every state change and query, with who and when. */
  async history(auth: AuthContext, sheetId: string): Promise<HistoryEventDto[]> {
    const sheet = await this.sheets.findReadable(auth, sheetId);
    const events = await this.em.find(AuditEvent, { subjectId: sheet.id, firmId: auth.firm.id }, { orderBy: { createdAt: 'asc' } });
    const users = new Map((await this.em.find(User, { id: { $in: events.map((e) => e.userId).filter((x): x is string => !!x) } })).map((u) => [u.id, u.name]));
    return events.map((e) => ({
      id: e.id,
      type: e.type,
      who: e.userId ? (users.get(e.userId) ?? null) : null,
      detail: e.detail ?? null,
      createdAt: e.createdAt.toISOString(),
    }));
  }
}
