import { createHash, randomUUID } from 'node:crypto';
import { EntityManager } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import type { AttachmentDto } from '@ampwright/common';
import { ErrorCode, RequestException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { ObjectStoreService } from '../files/object-store.service';
import { sniffUpload } from '../files/uploads';
import { SheetsService } from '../sheets/sheets.service';
import { User } from '../users/entities/user.entity';
import { Attachment } from './entities/attachment.entity';

const view = (a: Attachment): AttachmentDto => ({
  id: a.id,
  fileName: a.fileName,
  mediaType: a.mediaType,
  size: a.size,
  sha256: a.sha256,
  uploadedBy: a.uploadedBy?.name ?? null,
  createdAt: a.createdAt.toISOString(),
});

/** A file name safe to keep and to send back: no folders, no control characters, at most 255 characters. */
export function cleanFileName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? '';
  const clean = base
    .replace(/[\u0000-\u001F\u007F"]/g, '')
    .trim()
    .slice(-255);
  return clean && clean !== '.' && clean !== '..' ? clean : 'file';
}

@Injectable()
export class AttachmentsService {
  constructor(
    private readonly em: EntityManager,
    private readonly sheets: SheetsService,
    private readonly store: ObjectStoreService,
  ) {}

  async list(auth: AuthContext, sheetId: string): Promise<AttachmentDto[]> {
    const sheet = await this.sheets.findReadable(auth, sheetId);
    const rows = await this.em.find(Attachment, { sheet }, { orderBy: { createdAt: 'asc' }, populate: ['uploadedBy'] });
    return rows.map(view);
  }

  /** Stores the bytes in the object store first, then the record: a failed store leaves no record behind. */
  async upload(auth: AuthContext, sheetId: string, file: { buffer: Buffer; originalname: string; size: number } | undefined): Promise<AttachmentDto> {
    if (!file)
      throw new RequestException(ErrorCode.ValidationFailed, 'Attach the file in the field "file".', {
        details: [{ field: 'file', message: 'no file was sent' }],
      });
    const sheet = await this.sheets.findEditable(auth, sheetId);
    const fileName = cleanFileName(Buffer.from(file.originalname, 'latin1').toString('utf8'));
    if (file.size === 0)
      throw new RequestException(ErrorCode.ValidationFailed, `${fileName} is empty; nothing was stored.`, {
        details: [{ field: 'file', message: 'the file is empty' }],
      });
    const sniffed = await sniffUpload(file.buffer, fileName);
    if (!sniffed.ok)
      throw new RequestException(ErrorCode.UnsupportedMediaType, `${fileName} was refused: ${sniffed.reason}. Nothing was stored.`, {
        details: [{ field: 'file', message: sniffed.reason }],
      });
    const sha256 = createHash('sha256').update(file.buffer).digest('hex');
    const objectKey = `attachments/${sheet.id}/${randomUUID()}`;
    await this.store.put(objectKey, file.buffer, sniffed.mediaType);
    const attachment = new Attachment(sheet, {
      objectKey,
      fileName,
      mediaType: sniffed.mediaType,
      size: file.size,
      sha256,
      uploadedBy: this.em.getReference(User, auth.user.id),
    });
    await this.em.persist(attachment).flush();
    await this.em.populate(attachment, ['uploadedBy']);
    return view(attachment);
  }

  private async find(auth: AuthContext, id: string): Promise<Attachment> {
    const attachment = await this.em.findOne(Attachment, { id, sheet: { project: { firm: auth.firm.id } } }, { populate: ['sheet'] });
    if (!attachment) throw new RequestException(ErrorCode.NotFound, 'No such attachment.');
    return attachment;
  }

  async download(auth: AuthContext, id: string): Promise<{ attachment: Attachment; body: Buffer }> {
    const attachment = await this.find(auth, id);
    await this.sheets.findReadable(auth, attachment.sheet.id);
    const body = await this.store.get(attachment.objectKey);
    return { attachment, body };
  }

  /** Removes the record; the bytes stay in the store (an issued revision may list them by hash). */
  async remove(auth: AuthContext, id: string): Promise<void> {
    const attachment = await this.find(auth, id);
    await this.sheets.findEditable(auth, attachment.sheet.id);
    await this.em.remove(attachment).flush();
  }
}
