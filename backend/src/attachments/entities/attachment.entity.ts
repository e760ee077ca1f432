import { randomUUID } from 'node:crypto';
import { Entity, ManyToOne, Opt, PrimaryKey, Property } from '@mikro-orm/core';
import { Sheet } from '../../sheets/entities/sheet.entity';
import { User } from '../../users/entities/user.entity';

/** A document kept with a sheet (a datasheet, a drawing, site data): the bytes live in the object store. */
@Entity({ tableName: 'attachment' })
export class Attachment {
  @PrimaryKey({ type: 'uuid' })
  id: string & Opt = randomUUID();

  @ManyToOne(() => Sheet, { deleteRule: 'cascade' })
  sheet: Sheet;

  /** The key in the private bucket; never shown to the browser. */
  @Property({ length: 200 })
  objectKey: string;

  @Property({ length: 255 })
  fileName: string;

  /** Judged from the content, not from the name or the browser's word. */
  @Property({ length: 120 })
  mediaType: string;

  @Property({ type: 'bigint', runtimeType: 'number' })
  size: number;

  /** Hex SHA-256 of the bytes, recorded at upload and listed in the package. */
  @Property({ length: 64 })
  sha256: string;

  @ManyToOne(() => User, { deleteRule: 'set null', nullable: true })
  uploadedBy?: User;

  @Property({ type: 'datetime', length: 3 })
  createdAt: Date & Opt = new Date();

  constructor(sheet: Sheet, fields: { objectKey: string; fileName: string; mediaType: string; size: number; sha256: string; uploadedBy?: User }) {
    this.sheet = sheet;
    this.objectKey = fields.objectKey;
    this.fileName = fields.fileName;
    this.mediaType = fields.mediaType;
    this.size = fields.size;
    this.sha256 = fields.sha256;
    this.uploadedBy = fields.uploadedBy;
  }
}
