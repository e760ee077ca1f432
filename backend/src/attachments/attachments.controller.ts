import { Controller, Delete, Get, HttpCode, Param, ParseUUIDPipe, Post, Res, UploadedFile, UseInterceptors } from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import type { Response } from 'express';
import type { AttachmentDto } from '@ampwright/common';
import { Roles } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { MEMBER_ROLES, SHEET_EDITORS } from '../core/roles';
import { UPLOAD_OPTIONS } from '../files/uploads';
import { AttachmentsService } from './attachments.service';

@Controller()
export class AttachmentsController {
  constructor(private readonly attachments: AttachmentsService) {}

  @Roles(...MEMBER_ROLES)
  @Get('sheets/:id/attachments')
  list(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<AttachmentDto[]> {
    return this.attachments.list(auth, id);
  }

  /** Multipart, field "file", at most 25 MB; its type is judged from its content. */
  @Roles(...SHEET_EDITORS)
  @Post('sheets/:id/attachments')
  @UseInterceptors(FileInterceptor('file', UPLOAD_OPTIONS))
  upload(
    @CurrentAuth() auth: AuthContext,
    @Param('id', ParseUUIDPipe) id: string,
    @UploadedFile() file: Express.Multer.File | undefined,
  ): Promise<AttachmentDto> {
    return this.attachments.upload(auth, id, file);
  }

  /**
   * The bytes, as a download (never shown inline, so an uploaded SVG or HTML cannot run in our origin).
   * @answers file
   */
  @Roles(...MEMBER_ROLES)
  @Get('attachments/:id/download')
  async download(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Res() res: Response): Promise<void> {
    const { attachment, body } = await this.attachments.download(auth, id);
    res.setHeader('Content-Type', attachment.mediaType);
    res.setHeader('Content-Length', String(body.length));
    res.setHeader(
      'Content-Disposition',
      `attachment; filename="${attachment.fileName.replace(/[^\x20-\x7E]/g, '_')}"; filename*=UTF-8''${encodeURIComponent(attachment.fileName)}`,
    );
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Content-Security-Policy', "default-src 'none'; sandbox");
    res.setHeader('X-Ampwright-Sha256', attachment.sha256);
    res.end(body);
  }

  @Roles(...SHEET_EDITORS)
  @Delete('attachments/:id')
  @HttpCode(204)
  remove(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<void> {
    return this.attachments.remove(auth, id);
  }
}
