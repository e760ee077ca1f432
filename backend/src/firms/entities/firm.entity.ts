import { randomUUID } from 'node:crypto';
import { Entity, Opt, PrimaryKey, Property } from '@mikro-orm/core';

/** A consultancy using Ampwright: everything else (members, projects, its certificate) belongs to one. */
@Entity({ tableName: 'firm' })
export class Firm {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @Property({ length: 200 })
  name: string;

  @Property({ type: 'datetime' })
  createdAt: Date & Opt = new Date();

  /** Whether issued packages carry the internal query register (off unless the owner turns it on). */
  @Property({ type: 'boolean' })
  packageQueryRegister: boolean & Opt = false;

  constructor(name: string) {
    this.name = name;
  }
}
