import { EntityManager } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { CertificateDto, PackageSettingsDto } from '@ampwright/common';
import type { Environment } from '../config/environment';
import { ErrorCode, PackageException, RequestException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { Firm } from '../firms/entities/firm.entity';
import { FirmCertificate } from './entities/firm-certificate.entity';
import { EvaluationService } from '../evaluation/evaluation.service';
import { makeSelfSignedP12, openSecret, readP12, sealSecret } from './signing';
import { randomBytes } from 'node:crypto';
import { PackageErrorCode } from '@ampwright/common';

export type CertificateView = CertificateDto;

const view = (c: FirmCertificate): CertificateView => ({
  subject: c.subject,
  issuer: c.issuer,
  notBefore: c.notBefore.toISOString(),
  notAfter: c.notAfter.toISOString(),
  fingerprint: c.fingerprint,
  selfSigned: c.selfSigned,
});

@Injectable()
export class CertificatesService {
  private readonly secret: string;

  constructor(
    private readonly em: EntityManager,
    private readonly evaluation: EvaluationService,
    config: ConfigService<Environment, true>,
  ) {
    this.secret = config.get('CERTIFICATE_SECRET', { infer: true });
  }

  /** What the firm's packages carry: the query register only if the owner turned it on. */
  async packageSettings(auth: AuthContext): Promise<PackageSettingsDto> {
    // Read from its row: the request's firm was mapped from the session's read without this column.
    return { queryRegister: (await this.em.findOneOrFail(Firm, auth.firm.id, { refresh: true })).packageQueryRegister };
  }

  async setPackageSettings(auth: AuthContext, dto: PackageSettingsDto): Promise<PackageSettingsDto> {
    await this.em.nativeUpdate(Firm, { id: auth.firm.id }, { packageQueryRegister: dto.queryRegister });
    return this.packageSettings(auth);
  }

  async current(auth: AuthContext): Promise<CertificateView | null> {
    const c = await this.em.findOne(FirmCertificate, { firm: auth.firm.id });
    return c ? view(c) : null;
  }

  /** The owner's upload of the firm's PKCS#12 certificate, refused with the reason if it cannot sign. */
  async upload(auth: AuthContext, file: { buffer: Buffer } | undefined, password: string | undefined): Promise<CertificateView> {
    if (!file)
      throw new RequestException(ErrorCode.ValidationFailed, 'Attach the .p12 or .pfx file in the field "file".', {
        details: [{ field: 'file', message: 'no file was sent' }],
      });
    if (typeof password !== 'string')
      throw new RequestException(ErrorCode.ValidationFailed, 'Give the certificate\'s password in the field "password".', {
        details: [{ field: 'password', message: 'required' }],
      });
    // Opened in an evaluation process with a deadline: a hostile file's key iterations never run here.
    const opened = await this.evaluation.readCertificate(auth.firm.id, file.buffer, password);
    if (!opened.ok) {
      throw new PackageException(PackageErrorCode.CertificateRefused, `The certificate was refused: ${opened.problem}`, {
        details: [{ field: opened.problem.includes('password') ? 'password' : 'file', message: opened.problem }],
      });
    }
    return view(await this.store(this.em.getReference(Firm, auth.firm.id), file.buffer, password, opened.facts, false));
  }

  private async store(firm: Firm, p12: Buffer, password: string, facts: ReturnType<typeof readP12>, selfSigned: boolean): Promise<FirmCertificate> {
    const em = this.em.fork();
    await em.nativeDelete(FirmCertificate, { firm: firm.id });
    const c = new FirmCertificate(em.getReference(Firm, firm.id), { p12, passwordSealed: sealSecret(password, this.secret), ...facts, selfSigned });
    await em.persist(c).flush();
    return c;
  }

  /** The firm's certificate and its password for signing; a self-signed one is made if the firm has none. */
  async forSigning(firm: Firm): Promise<{ p12: Buffer; password: string; selfSigned: boolean }> {
    const em = this.em.fork();
    let c = await em.findOne(FirmCertificate, { firm: firm.id }, { populate: ['p12'] });
    if (!c || c.notAfter < new Date()) {
      const password = randomBytes(18).toString('base64url');
      const p12 = makeSelfSignedP12(firm.name, password);
      c = await this.store(firm, p12, password, readP12(p12, password), true);
    }
    return { p12: c.p12, password: openSecret(c.passwordSealed, this.secret), selfSigned: c.selfSigned };
  }
}
