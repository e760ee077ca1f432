import { Body, Controller, Get, HttpCode, Param, ParseUUIDPipe, Post, Put, Res, UploadedFile, UseInterceptors } from '@nestjs/common';
import type { PackageSettingsDto } from '@ampwright/common';
import { PackageSettingsBodyDto } from './dto/package-settings.dto';
import { FileInterceptor } from '@nestjs/platform-express';
import { Throttle } from '@nestjs/throttler';
import { VERIFY_THROTTLE } from '../core/throttle/throttlers';
import type { Response } from 'express';
import { Public, Roles } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { MEMBER_ROLES } from '../core/roles';
import { SINGLE_FILE_OPTIONS, UPLOAD_OPTIONS } from '../files/uploads';
import { CertificatesService, type CertificateView } from './certificates.service';
import { PackagesService, type PackageStatus, type PortalRevision, type Verdict } from './packages.service';

const READERS = [...MEMBER_ROLES, 'client' as const];

@Controller()
export class PackagesController {
  constructor(
    private readonly packages: PackagesService,
    private readonly certificates: CertificatesService,
  ) {}

  @Roles(...READERS)
  @Get('revisions/:id/package/status')
  status(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<PackageStatus> {
    return this.packages.status(auth, id);
  }

  @Roles('owner', 'approver')
  @Post('revisions/:id/package/retry')
  @HttpCode(200)
  retry(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<PackageStatus> {
    return this.packages.retry(auth, id);
  }

  /**
   * The signed PDF (members of the firm; clients of the project).
   * @answers file
   */
  @Roles(...READERS)
  @Get('revisions/:id/package')
  async download(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Res() res: Response): Promise<void> {
    const pkg = await this.packages.download(auth, id);
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Length', String(pkg.body.length));
    res.setHeader('Content-Disposition', `attachment; filename="${pkg.fileName}"`);
    res.setHeader('X-Ampwright-Sha256', pkg.sha256);
    res.end(pkg.body);
  }

  @Roles('client')
  @Get('portal/revisions')
  portal(@CurrentAuth() auth: AuthContext): Promise<PortalRevision[]> {
    return this.packages.portal(auth);
  }

  /** Anyone may check a PDF; throttled per address. */
  @Public()
  @Throttle(VERIFY_THROTTLE)
  @Post('verify')
  @HttpCode(200)
  @UseInterceptors(FileInterceptor('file', SINGLE_FILE_OPTIONS))
  verify(@UploadedFile() file: Express.Multer.File | undefined): Promise<Verdict> {
    return this.packages.verify(file);
  }

  @Roles('owner')
  @Get('firm/package-settings')
  packageSettings(@CurrentAuth() auth: AuthContext): Promise<PackageSettingsDto> {
    return this.certificates.packageSettings(auth);
  }

  /** Whether the firm's packages, issued from now on, carry the internal query register. */
  @Roles('owner')
  @Put('firm/package-settings')
  setPackageSettings(@CurrentAuth() auth: AuthContext, @Body() dto: PackageSettingsBodyDto): Promise<PackageSettingsDto> {
    return this.certificates.setPackageSettings(auth, dto);
  }

  @Roles('owner')
  @Get('firm/certificate')
  certificate(@CurrentAuth() auth: AuthContext): Promise<CertificateView | null> {
    return this.certificates.current(auth);
  }

  /** Multipart: the .p12/.pfx in "file" and its password in "password". */
  @Roles('owner')
  @Post('firm/certificate')
  @UseInterceptors(FileInterceptor('file', UPLOAD_OPTIONS))
  upload(
    @CurrentAuth() auth: AuthContext,
    @UploadedFile() file: Express.Multer.File | undefined,
    @Body('password') password: string | undefined,
  ): Promise<CertificateView> {
    return this.certificates.upload(auth, file, password);
  }
}
