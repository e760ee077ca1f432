import { Entity, Opt, PrimaryKey, Property } from '@mikro-orm/core';

/**
 * A firm registration waiting for its e-mail address to be confirmed: the firm is made only when the
 * link is followed, so registering answers the same whether or not the address has an account. Only
 * the token's SHA-256 and the password's bcrypt hash are stored.
 */
@Entity({ tableName: 'pending_registration' })
export class PendingRegistration {
  @PrimaryKey({ length: 64 })
  tokenHash: string;

  @Property({ length: 200 })
  firmName: string;

  @Property({ length: 200 })
  name: string;

  @Property({ length: 254 })
  email: string;

  @Property({ length: 100, hidden: true })
  passwordHash: string;

  @Property({ type: 'datetime' })
  expiresAt: Date;

  @Property({ type: 'datetime', nullable: true })
  usedAt?: Date;

  @Property({ type: 'datetime' })
  createdAt: Date & Opt = new Date();

  constructor(tokenHash: string, fields: { firmName: string; name: string; email: string; passwordHash: string; expiresAt: Date }) {
    this.tokenHash = tokenHash;
    this.firmName = fields.firmName;
    this.name = fields.name;
    this.email = fields.email;
    this.passwordHash = fields.passwordHash;
    this.expiresAt = fields.expiresAt;
  }
}
