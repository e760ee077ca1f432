import { randomUUID } from 'node:crypto';
import { Entity, Index, Opt, PrimaryKey, Property } from '@mikro-orm/core';

export type AuditType =
  | 'sign-in'
  | 'sign-in-failed'
  | 'sign-out'
  | 'registration-requested'
  | 'firm-registered'
  | 'role-changed'
  | 'member-removed'
  | 'invitation-sent'
  | 'invitation-accepted'
  | 'invitation-revoked'
  | 'password-reset-requested'
  | 'password-reset'
  | 'check-requested'
  | 'sheet-returned'
  | 'sheet-returned-to-checker'
  | 'check-passed'
  | 'sheet-approved'
  | 'revision-issued'
  | 'revision-started'
  | 'query-raised'
  | 'query-replied'
  | 'query-closed'
  | 'cell-agreed'
  | 'agreement-withdrawn'
  | 'co-preparers-named';

/** Who did what and when. Ids, not references, so the record outlives what it names. */
@Entity({ tableName: 'audit_event' })
@Index({ properties: ['firmId', 'createdAt'] })
export class AuditEvent {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @Property({ length: 40 })
  type: AuditType;

  @Property({ type: 'uuid', nullable: true })
  firmId?: string;

  @Property({ type: 'uuid', nullable: true })
  userId?: string;

  /** The e-mail address concerned (for failed sign-ins, where no user may exist). */
  @Property({ length: 254, nullable: true })
  email?: string;

  /** What the event is about (a sheet's id), for that thing's history. */
  @Property({ type: 'uuid', nullable: true, index: true })
  subjectId?: string;

  @Property({ type: 'json', nullable: true })
  detail?: Record<string, unknown>;

  @Property({ length: 64, nullable: true })
  ip?: string;

  /** To the millisecond, so events of one second keep their order. */
  @Property({ type: 'datetime', length: 3 })
  createdAt: Date & Opt = new Date();

  constructor(type: AuditType, fields: Partial<Pick<AuditEvent, 'firmId' | 'userId' | 'email' | 'detail' | 'ip' | 'subjectId'>> = {}) {
    this.type = type;
    Object.assign(this, fields);
  }
}
