import { randomUUID } from 'node:crypto';
import { Entity, Index, ManyToOne, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import type { SheetFile } from '@ampwright/common';
import { Firm } from '../../firms/entities/firm.entity';
import { User } from '../../users/entities/user.entity';

/** A firm's own sheet template, saved from one of its sheets (the built-in ones are the files in templates/). */
@Entity({ tableName: 'sheet_template' })
@Index({ properties: ['firm', 'title'] })
export class Template {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Firm, { deleteRule: 'cascade' })
  firm: Firm;

  @Property({ length: 200 })
  title: string;

  /** The sheet in the ampwright.sheet/1 format, without results. */
  @Property({ type: 'json' })
  sheet: SheetFile;

  @ManyToOne(() => User, { deleteRule: 'set null', nullable: true })
  createdBy?: User;

  @Property({ type: 'datetime', length: 3 })
  createdAt: Date & Opt = new Date();

  constructor(firm: Firm, title: string, sheet: SheetFile, createdBy?: User) {
    this.firm = firm;
    this.title = title;
    this.sheet = sheet;
    this.createdBy = createdBy;
  }
}
