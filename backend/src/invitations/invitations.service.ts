import { EntityManager } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import type { Response } from 'express';
import { AuditService } from '../audit/audit.service';
import { PasswordService } from '../auth/password.service';
import { newToken, SessionsService } from '../auth/sessions.service';
import type { Environment } from '../config/environment';
import { AuthException, ErrorCode, InvitationException, RequestException } from '../core/errors/app-exception';
import { hashToken, type AuthContext } from '../core/guards/auth.guard';
import { Membership } from '../firms/entities/membership.entity';
import { Firm } from '../firms/entities/firm.entity';
import { Project, ProjectPerson } from '../projects/entities/project.entity';
import { MailService } from '../mail/mail.service';
import { mailTemplates } from '../mail/mail-templates';
import { User } from '../users/entities/user.entity';
import type { AcceptInvitationDto, CreateInvitationDto, InvitationResponseDto } from './dto/invitation.dto';
import { Invitation } from './entities/invitation.entity';
import { AuthErrorCode, InvitationErrorCode } from '@ampwright/common';
import type { Role } from '../core/roles';

export { InvitationErrorCode };

const VALID_DAYS = 7;
const invalid = () => new InvitationException(InvitationErrorCode.Invalid, 'This invitation has expired, been used or been withdrawn. Ask for a new one.');

const toResponse = (i: Invitation): InvitationResponseDto => ({
  id: i.id,
  email: i.email,
  roles: i.roles,
  expiresAt: i.expiresAt.toISOString(),
  acceptedAt: i.acceptedAt?.toISOString() ?? null,
  revokedAt: i.revokedAt?.toISOString() ?? null,
});

/** What the invitation page shows before it is accepted (public: the token is the key). */
export interface InvitationPreview {
  firm: string;
  email: string;
  roles: string[];
  /** The address has an account already: accepting asks for its password. */
  hasAccount: boolean;
}

/** An accepted invitation: the firm joined, with these roles (the person is signed in to it). */
export interface InvitationAccepted {
  firm: string;
  roles: Role[];
}

@Injectable()
export class InvitationsService {
  private readonly appUrl: string;

  constructor(
    private readonly em: EntityManager,
    private readonly mail: MailService,
    private readonly audit: AuditService,
    private readonly passwords: PasswordService,
    private readonly sessions: SessionsService,
    config: ConfigService<Environment, true>,
  ) {
    this.appUrl = config.get('APP_URL', { infer: true }).replace(/\/$/, '');
  }

  async invite(auth: AuthContext, dto: CreateInvitationDto): Promise<InvitationResponseDto> {
    if (dto.roles.includes('client') && dto.roles.length > 1) {
      throw new InvitationException(InvitationErrorCode.ClientWithOtherRoles, 'A client cannot also hold a role in the firm: invite them as a client only.');
    }
    const firm = this.em.getReference(Firm, auth.firm.id);
    if (dto.projectIds?.length) {
      if (!dto.roles.includes('client'))
        throw new InvitationException(InvitationErrorCode.ClientWithOtherRoles, "Projects are given to clients only: members see all of the firm's projects.");
      const found = await this.em.count(Project, { id: { $in: dto.projectIds }, firm });
      if (found !== new Set(dto.projectIds).size)
        throw new InvitationException(InvitationErrorCode.Invalid, 'One of the projects is not a project of this firm.', {
          details: [{ field: 'projectIds', message: 'no such project in this firm' }],
        });
    }
    const existing = await this.em.findOne(Membership, { firm, user: { email: dto.email } });
    if (existing) throw new InvitationException(InvitationErrorCode.AlreadyMember, `${dto.email} is already in ${auth.firm.name}: change their roles instead.`);
    const token = newToken();
    const invitation = new Invitation(
      firm,
      dto.email,
      dto.roles,
      hashToken(token),
      new Date(Date.now() + VALID_DAYS * 86_400_000),
      this.em.getReference(User, auth.user.id),
    );
    invitation.projectIds = dto.projectIds ?? [];
    await this.em.persist(invitation).flush();
    await this.mail.send(
      mailTemplates.invitation({
        to: dto.email,
        firm: auth.firm.name,
        invitedBy: auth.user.name,
        roles: dto.roles,
        url: `${this.appUrl}/accept-invitation?token=${token}`,
        expires: invitation.expiresAt,
      }),
    );
    await this.audit.record('invitation-sent', { firmId: firm.id, userId: auth.user.id, email: dto.email, detail: { roles: dto.roles } });
    return toResponse(invitation);
  }

  async list(auth: AuthContext): Promise<InvitationResponseDto[]> {
    const list = await this.em.find(Invitation, { firm: auth.firm.id }, { orderBy: { createdAt: 'desc' } });
    return list.map(toResponse);
  }

  /** The owner withdraws an invitation not yet accepted; its link stops working at once. */
  async revoke(auth: AuthContext, id: string): Promise<InvitationResponseDto> {
    const invitation = await this.em.findOne(Invitation, { id, firm: auth.firm.id });
    if (!invitation) throw new RequestException(ErrorCode.NotFound, 'No such invitation.');
    const withdrawn = await this.em.nativeUpdate(Invitation, { id, acceptedAt: null, revokedAt: null }, { revokedAt: new Date() });
    if (withdrawn !== 1)
      throw new RequestException(
        ErrorCode.Conflict,
        invitation.acceptedAt ? 'This invitation was accepted already; remove the member instead.' : 'This invitation was withdrawn already.',
      );
    await this.audit.record('invitation-revoked', { firmId: auth.firm.id, userId: auth.user.id, email: invitation.email });
    await this.em.refresh(invitation);
    return toResponse(invitation);
  }

  private async findOpen(token: string): Promise<Invitation> {
    const invitation = await this.em.findOne(Invitation, { tokenHash: hashToken(token) }, { populate: ['firm'] });
    if (!invitation || invitation.acceptedAt || invitation.revokedAt || invitation.expiresAt.getTime() < Date.now()) throw invalid();
    return invitation;
  }

  async preview(token: string): Promise<InvitationPreview> {
    const invitation = await this.findOpen(token);
    const hasAccount = (await this.em.count(User, { email: invitation.email })) > 0;
    return { firm: invitation.firm.name, email: invitation.email, roles: invitation.roles, hasAccount };
  }

  /** Accepting sets the password (a new account), or checks it (an existing account), and signs in. */
  async accept(dto: AcceptInvitationDto, res: Response, ip?: string): Promise<InvitationAccepted> {
    const invitation = await this.findOpen(dto.token);
    let user = await this.em.findOne(User, { email: invitation.email });
    if (user) {
      if (!(await this.passwords.verify(dto.password, user.passwordHash))) {
        throw new AuthException(AuthErrorCode.BadCredentials, 'This address has an account already: enter its password to accept.');
      }
    } else {
      user = new User(invitation.email, dto.name, await this.passwords.hash(dto.password));
      this.em.persist(user);
    }
    // Taken by one conditional UPDATE: an invitation withdrawn (or accepted) a moment ago is not accepted now.
    const taken = await this.em.nativeUpdate(Invitation, { id: invitation.id, acceptedAt: null, revokedAt: null }, { acceptedAt: new Date() });
    if (taken !== 1) throw invalid();
    const membership = new Membership(invitation.firm, user, invitation.roles);
    this.em.persist(membership);
    // A client is given the projects they were invited to (those that are still the firm's).
    if (invitation.roles.includes('client') && invitation.projectIds.length) {
      const projects = await this.em.find(Project, { id: { $in: invitation.projectIds }, firm: invitation.firm });
      for (const project of projects) this.em.persist(new ProjectPerson(project, user, 'client'));
    }
    await this.em.flush();
    await this.sessions.open(user, invitation.firm, res);
    await this.audit.record('invitation-accepted', { firmId: invitation.firm.id, userId: user.id, email: user.email, ip, detail: { roles: invitation.roles } });
    return { firm: invitation.firm.name, roles: invitation.roles };
  }
}
