import { randomUUID } from 'node:crypto';
import { Entity, Index, ManyToOne, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import { User } from '../../users/entities/user.entity';

/** A message in the app for one person (also sent by e-mail): a check asked for, a query raised, … */
@Entity({ tableName: 'notification' })
@Index({ properties: ['user', 'createdAt'] })
export class Notification {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => User, { deleteRule: 'cascade' })
  user: User;

  @Property({ length: 40 })
  kind: string;

  @Property({ length: 500 })
  text: string;

  /** A path in the app, e.g. /projects/…/sheets/…. */
  @Property({ length: 300 })
  link: string;

  @Property({ type: 'datetime', length: 3, nullable: true })
  readAt?: Date;

  @Property({ type: 'datetime', length: 3 })
  createdAt: Date & Opt = new Date();

  constructor(user: User, kind: string, text: string, link: string) {
    this.user = user;
    this.kind = kind;
    this.text = text;
    this.link = link;
  }
}
