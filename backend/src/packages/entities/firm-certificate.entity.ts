import { randomUUID } from 'node:crypto';
import { Entity, ManyToOne, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import { Firm } from '../../firms/entities/firm.entity';

/** The certificate a firm signs its packages with; the password is kept sealed (AES-256-GCM). */
@Entity({ tableName: 'firm_certificate' })
export class FirmCertificate {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Firm, { deleteRule: 'cascade', unique: true })
  firm: Firm;

  @Property({ type: 'blob', lazy: true })
  p12: Buffer;

  @Property({ type: 'text' })
  passwordSealed: string;

  @Property({ length: 500 })
  subject: string;

  @Property({ length: 500 })
  issuer: string;

  @Property({ type: 'datetime' })
  notBefore: Date;

  @Property({ type: 'datetime' })
  notAfter: Date;

  @Property({ length: 64 })
  fingerprint: string;

  @Property({ type: 'boolean' })
  selfSigned: boolean;

  @Property({ type: 'datetime', length: 3, onUpdate: () => new Date() })
  updatedAt: Date & Opt = new Date();

  constructor(firm: Firm, fields: Omit<FirmCertificate, 'id' | 'firm' | 'updatedAt'>) {
    this.firm = firm;
    Object.assign(this, fields);
  }
}
