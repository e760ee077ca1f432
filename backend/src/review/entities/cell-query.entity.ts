import { randomUUID } from 'node:crypto';
import { Collection, Entity, Index, ManyToOne, OneToMany, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import type { QueryStatus } from '@ampwright/common';
import { Cell } from '../../sheets/entities/cell.entity';
import { Sheet } from '../../sheets/entities/sheet.entity';
import { User } from '../../users/entities/user.entity';

/** A checker's query on a cell (or one line of a calc cell), with its thread of replies. */
@Entity({ tableName: 'cell_query' })
@Index({ properties: ['sheet', 'status'] })
export class CellQuery {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Sheet, { deleteRule: 'cascade' })
  sheet: Sheet;

  /** The cell queried; kept as null if the cell is later deleted (the thread stays). */
  @ManyToOne(() => Cell, { deleteRule: 'set null', nullable: true })
  cell?: Cell;

  @Property({ type: 'integer', nullable: true })
  line?: number;

  @Property({ length: 12 })
  status: QueryStatus & Opt = 'open';

  @ManyToOne(() => User, { deleteRule: 'restrict' })
  raisedBy: User;

  /** The sheet's revision being prepared when the query was raised. */
  @Property({ type: 'integer' })
  revisionNumber: number;

  @ManyToOne(() => User, { deleteRule: 'set null', nullable: true })
  closedBy?: User;

  @Property({ type: 'datetime', length: 3, nullable: true })
  closedAt?: Date;

  @Property({ type: 'datetime', length: 3 })
  createdAt: Date & Opt = new Date();

  @OneToMany(() => QueryMessage, (m) => m.query, { orderBy: { createdAt: 'asc' } })
  messages = new Collection<QueryMessage>(this);

  constructor(sheet: Sheet, cell: Cell, line: number | undefined, raisedBy: User, revisionNumber: number) {
    this.sheet = sheet;
    this.cell = cell;
    this.line = line;
    this.raisedBy = raisedBy;
    this.revisionNumber = revisionNumber;
  }
}

@Entity({ tableName: 'query_message' })
export class QueryMessage {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => CellQuery, { deleteRule: 'cascade' })
  query: CellQuery;

  @ManyToOne(() => User, { deleteRule: 'restrict' })
  author: User;

  @Property({ type: 'text' })
  text: string;

  @Property({ type: 'datetime', length: 3 })
  createdAt: Date & Opt = new Date();

  constructor(query: CellQuery, author: User, text: string) {
    this.query = query;
    this.author = author;
    this.text = text;
  }
}
