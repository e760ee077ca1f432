import { Entity, ManyToOne, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import { User } from '../../users/entities/user.entity';

/** A single-use, expiring password-reset link; only the token's SHA-256 is stored. */
@Entity({ tableName: 'password_reset' })
export class PasswordReset {
  @PrimaryKey({ length: 64 })
  tokenHash: string;

  @ManyToOne(() => User, { deleteRule: 'cascade' })
  user: User;

  @Property({ type: 'datetime' })
  expiresAt: Date;

  @Property({ type: 'datetime', nullable: true })
  usedAt?: Date;

  @Property({ type: 'datetime' })
  createdAt: Date & Opt = new Date();

  constructor(tokenHash: string, user: User, expiresAt: Date) {
    this.tokenHash = tokenHash;
    this.user = user;
    this.expiresAt = expiresAt;
  }
}
