import { randomUUID } from 'node:crypto';
import { Entity, EntityRepositoryType, ManyToOne, Opt, PrimaryKey, Property, Unique } from '@mikro-orm/core';
import { User } from '../../users/entities/user.entity';
import { SheetAuthorRepository } from '../sheet-author.repository';
import { Sheet } from './sheet.entity';

/**
 * Someone who had a hand in one revision of a sheet besides its preparer: a co-preparer the preparer
 * named (`named`), or anyone whose save was stored (`edited`). Neither may check or approve that
 * revision; a co-preparer taken off the list stays here if they edited.
 */
@Entity({ tableName: 'sheet_author', repository: () => SheetAuthorRepository })
@Unique({ properties: ['sheet', 'revisionNumber', 'user'] })
export class SheetAuthor {
  [EntityRepositoryType]?: SheetAuthorRepository;

  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Sheet, { deleteRule: 'cascade' })
  sheet: Sheet;

  @Property({ type: 'integer' })
  revisionNumber: number;

  @ManyToOne(() => User, { deleteRule: 'cascade' })
  user: User;

  @Property({ type: 'boolean' })
  named: boolean & Opt = false;

  @Property({ type: 'boolean' })
  edited: boolean & Opt = false;

  constructor(sheet: Sheet, revisionNumber: number, user: User) {
    this.sheet = sheet;
    this.revisionNumber = revisionNumber;
    this.user = user;
  }
}
