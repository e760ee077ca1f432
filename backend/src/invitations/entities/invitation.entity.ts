import { randomUUID } from 'node:crypto';
import { Entity, ManyToOne, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import type { Role } from '../../core/roles';
import { Firm } from '../../firms/entities/firm.entity';
import { User } from '../../users/entities/user.entity';

/** An e-mailed invitation to join a firm with roles (or as a client of some projects). */
@Entity({ tableName: 'invitation' })
export class Invitation {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Firm, { deleteRule: 'cascade' })
  firm: Firm;

  @Property({ length: 254 })
  email: string;

  @Property({ type: 'json' })
  roles: Role[];

  /** For a client: the projects they may see (project ids; linked once projects exist). */
  @Property({ type: 'json' })
  projectIds: string[] & Opt = [];

  @Property({ length: 64, unique: true, hidden: true })
  tokenHash: string;

  @ManyToOne(() => User, { deleteRule: 'set null', nullable: true })
  invitedBy?: User;

  @Property({ type: 'datetime' })
  expiresAt: Date;

  @Property({ type: 'datetime', nullable: true })
  acceptedAt?: Date;

  /** Set when the owner withdrew the invitation: its link no longer works. */
  @Property({ type: 'datetime', nullable: true })
  revokedAt?: Date;

  @Property({ type: 'datetime' })
  createdAt: Date & Opt = new Date();

  constructor(firm: Firm, email: string, roles: Role[], tokenHash: string, expiresAt: Date, invitedBy?: User) {
    this.firm = firm;
    this.email = email.toLowerCase();
    this.roles = roles;
    this.tokenHash = tokenHash;
    this.expiresAt = expiresAt;
    this.invitedBy = invitedBy;
  }
}
