import { randomUUID } from 'node:crypto';
import { Entity, EntityRepositoryType, ManyToOne, Opt, PrimaryKey, Property, Unique } from '@mikro-orm/core';
import type { SheetState } from '@ampwright/common';
import { Project } from '../../projects/entities/project.entity';
import { User } from '../../users/entities/user.entity';
import { SheetRepository } from '../sheet.repository';

/** Where a sheet is in its life (see README, "Sheet states"). */
export type { SheetState };

@Entity({ tableName: 'sheet', repository: () => SheetRepository })
@Unique({ properties: ['project', 'number'] })
export class Sheet {
  [EntityRepositoryType]?: SheetRepository;

  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Project, { deleteRule: 'cascade' })
  project: Project;

  /** The sheet's number in the project, e.g. "C-101". */
  @Property({ length: 40 })
  number: string;

  @Property({ length: 200 })
  title: string;

  @Property({ type: 'json' })
  settings: Record<string, unknown> & Opt = {};

  /** Top-level fields of an imported sheet file that we do not know, kept for export. */
  @Property({ type: 'json' })
  extra: Record<string, unknown> & Opt = {};

  @Property({ length: 20 })
  state: SheetState & Opt = 'being-prepared';

  @ManyToOne(() => User, { deleteRule: 'restrict' })
  preparer: User;

  @ManyToOne(() => User, { deleteRule: 'set null', nullable: true })
  checker?: User;

  @ManyToOne(() => User, { deleteRule: 'set null', nullable: true })
  approver?: User;

  /** The revision being prepared (1 = A); raised when a new revision is started after an issue. */
  @Property({ type: 'integer' })
  revisionNumber: number & Opt = 1;

  @Property({ type: 'datetime', length: 3, nullable: true })
  checkRequestedAt?: Date;

  @Property({ type: 'datetime', length: 3, nullable: true })
  checkedAt?: Date;

  @Property({ type: 'datetime', length: 3, nullable: true })
  approvedAt?: Date;

  /** Raised by every saved change; a save based on an older version is refused (409). */
  @Property({ type: 'integer' })
  version: number & Opt = 1;

  @Property({ length: 20, nullable: true })
  engineVersion?: string;

  /**
   * The version whose evaluation the cells' stored results are (null when not known: restored from a
   * revision, seeded, or the evaluation failed). A save writes its change with its results, and only the
   * results that differ when these are of the version it changed (SheetRepository.saveCellEdit).
   */
  @Property({ type: 'integer', nullable: true })
  resultsVersion?: number | null;

  /**
   * The fingerprint (sheetFingerprint: settings and cells) of the content whose evaluation the stored results
   * are, as the evaluation process computed it; null when not known. A one-cell edit names it to the
   * process that keeps the sheet's evaluation, so it sends only the edited cell (SheetsService.editCell).
   */
  @Property({ length: 64, nullable: true })
  resultsFingerprint?: string | null;

  @Property({ type: 'datetime' })
  createdAt: Date & Opt = new Date();

  @Property({ type: 'datetime', onUpdate: () => new Date() })
  updatedAt: Date & Opt = new Date();

  constructor(project: Project, number: string, title: string, preparer: User) {
    this.project = project;
    this.number = number;
    this.title = title;
    this.preparer = preparer;
  }
}
