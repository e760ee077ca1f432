import { randomUUID } from 'node:crypto';
import { Entity, ManyToOne, Opt, PrimaryKey, Property, Unique } from '@mikro-orm/core';
import type { Role } from '../../core/roles';
import { User } from '../../users/entities/user.entity';
import { Firm } from './firm.entity';

/** A user in a firm with one or more roles. */
@Entity({ tableName: 'membership' })
@Unique({ properties: ['firm', 'user'] })
export class Membership {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Firm, { deleteRule: 'cascade' })
  firm: Firm;

  @ManyToOne(() => User, { deleteRule: 'cascade' })
  user: User;

  @Property({ type: 'json' })
  roles: Role[];

  @Property({ type: 'datetime' })
  createdAt: Date & Opt = new Date();

  constructor(firm: Firm, user: User, roles: Role[]) {
    this.firm = firm;
    this.user = user;
    this.roles = roles;
  }
}
