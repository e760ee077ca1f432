import { randomUUID } from 'node:crypto';
import { Entity, Opt, PrimaryKey, Property } from '@mikro-orm/core';

/** A person who signs in. E-mail addresses are stored lower-case and are unique. */
@Entity({ tableName: 'app_user' })
export class User {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @Property({ length: 254, unique: true })
  email: string;

  @Property({ length: 200 })
  name: string;

  @Property({ length: 100, hidden: true })
  passwordHash: string;

  @Property({ type: 'datetime' })
  createdAt: Date & Opt = new Date();

  constructor(email: string, name: string, passwordHash: string) {
    this.email = email.toLowerCase();
    this.name = name;
    this.passwordHash = passwordHash;
  }
}
