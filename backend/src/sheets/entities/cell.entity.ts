import { randomUUID } from 'node:crypto';
import { Entity, Index, ManyToOne, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import { User } from '../../users/entities/user.entity';
import { Sheet } from './sheet.entity';

/** One cell of a sheet: its kind, its fields as in the sheet file, and the results the server computed. */
@Entity({ tableName: 'cell' })
@Index({ properties: ['sheet', 'position'] })
export class Cell {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Sheet, { deleteRule: 'cascade' })
  sheet: Sheet;

  @Property({ type: 'integer' })
  position: number;

  @Property({ length: 20 })
  kind: string;

  /** The cell as in the sheet file, without `kind` (unknown fields kept). */
  @Property({ type: 'json' })
  fields: Record<string, unknown>;

  @Property({ type: 'json', nullable: true })
  results?: unknown;

  @ManyToOne(() => User, { deleteRule: 'set null', nullable: true })
  changedBy?: User;

  @Property({ type: 'datetime', length: 3 })
  changedAt: Date & Opt = new Date();

  /** The checker who agreed this cell as it stands; cleared by an edit. */
  @ManyToOne(() => User, { deleteRule: 'set null', nullable: true })
  agreedBy?: User;

  @Property({ type: 'datetime', length: 3, nullable: true })
  agreedAt?: Date;

  /** Edited after the checker agreed it, so the checker should look again. */
  @Property({ type: 'boolean' })
  changedAfterAgreement: boolean & Opt = false;

  constructor(sheet: Sheet, position: number, kind: string, fields: Record<string, unknown>, changedBy?: User) {
    this.sheet = sheet;
    this.position = position;
    this.kind = kind;
    this.fields = fields;
    this.changedBy = changedBy;
  }
}
