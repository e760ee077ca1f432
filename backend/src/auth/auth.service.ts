import { randomBytes } from 'node:crypto';
import { EntityManager } from '@mikro-orm/core';
import { Injectable, Logger } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { Response } from 'express';
import { AuditService } from '../audit/audit.service';
import type { Environment } from '../config/environment';
import { AuthException } from '../core/errors/app-exception';
import { authContextOf, hashToken, type AuthContext } from '../core/guards/auth.guard';
import { Firm } from '../firms/entities/firm.entity';
import { Membership } from '../firms/entities/membership.entity';
import { MailService } from '../mail/mail.service';
import { mailTemplates } from '../mail/mail-templates';
import { User } from '../users/entities/user.entity';
import type { ChangeProfileDto, ConfirmRegistrationDto, ForgotPasswordDto, LoginDto, RegisterFirmDto, ResetPasswordDto } from './dto/auth.dto';
import type { MeResponseDto } from './dto/me-response.dto';
import { PasswordReset } from './entities/password-reset.entity';
import { PendingRegistration } from './entities/pending-registration.entity';
import { PasswordService } from './password.service';
import { SessionsService } from './sessions.service';
import { SignInThrottle } from './sign-in-throttle.service';
import { AuthErrorCode } from '@ampwright/common';

export { AuthErrorCode };

const RESET_MINUTES = 60;

/** Takes a single-use link by one conditional UPDATE: true for exactly one of any number of simultaneous uses. */
async function takeOnce(em: EntityManager, link: typeof PasswordReset | typeof PendingRegistration, tokenHash: string): Promise<boolean> {
  const now = new Date();
  return (await em.nativeUpdate(link, { tokenHash, usedAt: null, expiresAt: { $gt: now } }, { usedAt: now })) === 1;
}
const REGISTRATION_HOURS = 24;

@Injectable()
export class AuthService {
  private readonly logger = new Logger(AuthService.name);
  private readonly appUrl: string;

  constructor(
    private readonly em: EntityManager,
    private readonly passwords: PasswordService,
    private readonly sessions: SessionsService,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly signInThrottle: SignInThrottle,
    config: ConfigService<Environment, true>,
  ) {
    this.appUrl = config.get('APP_URL', { infer: true }).replace(/\/$/, '');
  }

  /**
   * Registering answers the same, at once, whatever the address: the work is done after the answer. For
   * a new address the registration waits for its e-mail to be confirmed (the firm is made then); an
   * address with an account is told so by e-mail, never in the answer.
   */
  register(dto: RegisterFirmDto, ip?: string): { message: string } {
    void this.startRegistration(dto, ip).catch((err: Error) => this.logger.error(`registration for a requested address failed: ${err.message}`));
    return { message: 'Check your e-mail: follow the link we sent to confirm the address, and the firm is ready.' };
  }

  private async startRegistration(dto: RegisterFirmDto, ip?: string): Promise<void> {
    const em = this.em.fork();
    // Registrations never confirmed are cleared out as new ones come, so the table does not grow.
    await em.nativeDelete(PendingRegistration, { expiresAt: { $lt: new Date() } });
    if (await em.count(User, { email: dto.email })) {
      await this.mail.send(mailTemplates.alreadyRegistered({ to: dto.email, url: `${this.appUrl}/sign-in` }));
      return;
    }
    const token = randomBytes(32).toString('base64url');
    const expires = new Date(Date.now() + REGISTRATION_HOURS * 3600_000);
    await em
      .persist(
        new PendingRegistration(hashToken(token), {
          firmName: dto.firmName,
          name: dto.name,
          email: dto.email,
          passwordHash: await this.passwords.hash(dto.password),
          expiresAt: expires,
        }),
      )
      .flush();
    await this.mail.send(
      mailTemplates.confirmRegistration({ to: dto.email, firm: dto.firmName, url: `${this.appUrl}/confirm-registration?token=${token}`, expires }),
    );
    await this.audit.record('registration-requested', { email: dto.email, ip });
  }

  /** Following the e-mailed link makes the firm and its owner, once, and signs the owner in. */
  async confirmRegistration(dto: ConfirmRegistrationDto, res: Response, ip?: string): Promise<MeResponseDto> {
    const invalid = () =>
      new AuthException(AuthErrorCode.RegistrationInvalid, 'This registration link has expired or has been used. Register again, or sign in.');
    const pending = await this.em.findOne(PendingRegistration, { tokenHash: hashToken(dto.token) });
    if (!pending) throw invalid();
    if (!(await takeOnce(this.em, PendingRegistration, pending.tokenHash))) throw invalid();
    if (await this.em.count(User, { email: pending.email })) {
      throw new AuthException(AuthErrorCode.EmailTaken, 'This address has an account already: sign in instead.');
    }
    const firm = new Firm(pending.firmName);
    const user = new User(pending.email, pending.name, pending.passwordHash);
    const membership = new Membership(firm, user, ['owner']);
    await this.em.persist([firm, user, membership]).flush();
    const session = await this.sessions.open(user, firm, res);
    await this.audit.record('firm-registered', { firmId: firm.id, userId: user.id, email: user.email, ip });
    return this.me(authContextOf(session, membership.roles));
  }

  async login(dto: LoginDto, res: Response, ip?: string): Promise<MeResponseDto> {
    await this.signInThrottle.check(dto.email, ip);
    const user = await this.em.findOne(User, { email: dto.email });
    const ok = await this.passwords.verify(dto.password, user?.passwordHash);
    const membership = user && ok ? await this.em.findOne(Membership, { user }, { populate: ['firm'], orderBy: { createdAt: 'asc' } }) : null;
    if (!user || !ok || !membership) {
      await this.signInThrottle.failed(dto.email, ip);
      await this.audit.record('sign-in-failed', { email: dto.email, userId: user?.id, ip });
      throw new AuthException(AuthErrorCode.BadCredentials, 'The e-mail address or the password is not right.');
    }
    await this.signInThrottle.succeeded(dto.email, ip);
    const session = await this.sessions.open(user, membership.firm, res);
    await this.audit.record('sign-in', { firmId: membership.firm.id, userId: user.id, email: user.email, ip });
    return this.me(authContextOf(session, membership.roles));
  }

  async logout(auth: AuthContext, res: Response): Promise<void> {
    await this.sessions.close(auth.session.tokenHash, res);
    await this.audit.record('sign-out', { firmId: auth.firm.id, userId: auth.user.id, email: auth.user.email });
  }

  me(auth: AuthContext): MeResponseDto {
    const { user, firm } = auth;
    return {
      user: { id: user.id, email: user.email, name: user.name },
      firm: { id: firm.id, name: firm.name },
      roles: auth.roles,
      csrfToken: auth.session.csrfToken,
    };
  }

  async changeProfile(auth: AuthContext, dto: ChangeProfileDto): Promise<MeResponseDto> {
    await this.em.nativeUpdate(User, { id: auth.user.id }, { name: dto.name });
    auth.user.name = dto.name;
    return this.me(auth);
  }

  /**
   * Answers the same, and in the same time, whether or not the address has an account: the answer goes
   * at once, and the link is made and queued for e-mail after it.
   */
  async forgotPassword(dto: ForgotPasswordDto, ip?: string): Promise<void> {
    void this.sendResetLink(dto.email, ip).catch((err: Error) => this.logger.error(`password reset for a requested address failed: ${err.message}`));
  }

  private async sendResetLink(email: string, ip?: string): Promise<void> {
    const em = this.em.fork();
    const user = await em.findOne(User, { email });
    if (!user) return;
    const membership = await em.findOne(Membership, { user }, { populate: ['firm'] });
    const token = randomBytes(32).toString('base64url');
    const expires = new Date(Date.now() + RESET_MINUTES * 60_000);
    await em.persist(new PasswordReset(hashToken(token), user, expires)).flush();
    await this.audit.record('password-reset-requested', { firmId: membership?.firm.id, userId: user.id, email: user.email, ip });
    await this.mail.send(
      mailTemplates.passwordReset({ to: user.email, firm: membership?.firm.name ?? 'Ampwright', url: `${this.appUrl}/reset-password?token=${token}`, expires }),
    );
  }

  /**
   * A reset link works once: it is taken by one conditional UPDATE (of two uses at once exactly one
   * wins), and using it revokes the account's other reset links and ends all its sessions.
   */
  async resetPassword(dto: ResetPasswordDto, ip?: string): Promise<void> {
    const invalid = () => new AuthException(AuthErrorCode.ResetInvalid, 'This reset link has expired or has been used. Ask for a new one.');
    const reset = await this.em.findOne(PasswordReset, { tokenHash: hashToken(dto.token) }, { populate: ['user'] });
    if (!reset) throw invalid();
    const passwordHash = await this.passwords.hash(dto.password);
    await this.em.transactional(async (em) => {
      if (!(await takeOnce(em, PasswordReset, reset.tokenHash))) throw invalid();
      await em.nativeUpdate(User, { id: reset.user.id }, { passwordHash });
      await em.nativeUpdate(PasswordReset, { user: reset.user.id, usedAt: null }, { usedAt: new Date() });
    });
    await this.sessions.closeAllOf(reset.user);
    await this.audit.record('password-reset', { userId: reset.user.id, email: reset.user.email, ip });
  }
}
