import { randomUUID } from 'node:crypto';
import { Entity, ManyToOne, Opt, PrimaryKey, Property, Unique } from '@mikro-orm/core';
import { Sheet } from '../../sheets/entities/sheet.entity';
import { User } from '../../users/entities/user.entity';

/**
 * An issued revision: an immutable snapshot of the sheet. Nothing of it changes after issue except
 * that the package's PDF hash and key are filled in once. The service never writes it again, and
 * MariaDB triggers (migration Migration20261202014614) refuse any other update and any delete.
 */
@Entity({ tableName: 'revision' })
@Unique({ properties: ['sheet', 'number'] })
export class Revision {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  /** Restrict: a sheet with issued revisions cannot be deleted. */
  @ManyToOne(() => Sheet, { deleteRule: 'restrict' })
  sheet: Sheet;

  @Property({ type: 'integer' })
  number: number;

  @Property({ length: 8 })
  code: string;

  /** The canonical snapshot (see RevisionsService.snapshot): sheet file, cell ids, results, engine, queries, attachments. */
  @Property({ type: 'json' })
  snapshot: Record<string, unknown>;

  /** SHA-256 of the canonical JSON of `snapshot`. */
  @Property({ length: 64 })
  snapshotSha256: string;

  @Property({ length: 20 })
  engineVersion: string;

  @ManyToOne(() => User, { deleteRule: 'restrict' })
  preparedBy: User;

  @ManyToOne(() => User, { deleteRule: 'restrict' })
  checkedBy: User;

  @ManyToOne(() => User, { deleteRule: 'restrict' })
  approvedBy: User;

  @Property({ type: 'datetime', length: 3, nullable: true })
  checkRequestedAt?: Date;

  @Property({ type: 'datetime', length: 3, nullable: true })
  checkedAt?: Date;

  @Property({ type: 'datetime', length: 3, nullable: true })
  approvedAt?: Date;

  @Property({ type: 'datetime', length: 3 })
  issuedAt: Date & Opt = new Date();

  /** The signed package, once made (issue 7): set once, never changed. */
  @Property({ length: 64, nullable: true })
  pdfSha256?: string;

  @Property({ length: 200, nullable: true })
  pdfObjectKey?: string;

  constructor(
    sheet: Sheet,
    fields: Pick<
      Revision,
      | 'number'
      | 'code'
      | 'snapshot'
      | 'snapshotSha256'
      | 'engineVersion'
      | 'preparedBy'
      | 'checkedBy'
      | 'approvedBy'
      | 'checkRequestedAt'
      | 'checkedAt'
      | 'approvedAt'
      | 'issuedAt'
    >,
  ) {
    this.sheet = sheet;
    Object.assign(this, fields);
  }
}
