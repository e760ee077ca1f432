import { Entity, EntityRepositoryType, ManyToOne, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import { Firm } from '../../firms/entities/firm.entity';
import { User } from '../../users/entities/user.entity';
import { SessionRepository } from '../session.repository';

/**
 * A signed-in session, kept in MariaDB so any app server can serve it. The cookie holds a random
 * token; only its SHA-256 is stored, so a database read does not yield a usable cookie.
 */
@Entity({ tableName: 'session', repository: () => SessionRepository })
export class Session {
  [EntityRepositoryType]?: SessionRepository;

  @PrimaryKey({ length: 64 })
  tokenHash: string;

  @ManyToOne(() => User, { deleteRule: 'cascade' })
  user: User;

  @ManyToOne(() => Firm, { deleteRule: 'cascade' })
  firm: Firm;

  /** Sent by the app in a header with every state-changing request. */
  @Property({ length: 64 })
  csrfToken: string;

  @Property({ type: 'datetime' })
  createdAt: Date & Opt = new Date();

  @Property({ type: 'datetime' })
  expiresAt: Date;

  constructor(tokenHash: string, user: User, firm: Firm, csrfToken: string, expiresAt: Date) {
    this.tokenHash = tokenHash;
    this.user = user;
    this.firm = firm;
    this.csrfToken = csrfToken;
    this.expiresAt = expiresAt;
  }
}
