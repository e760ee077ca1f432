import { EntityManager } from '@mikro-orm/core';
import { Injectable } from '@nestjs/common';
import { AuditService } from '../audit/audit.service';
import { ErrorCode, MemberException, RequestException } from '../core/errors/app-exception';
import type { AuthContext } from '../core/guards/auth.guard';
import { Session } from '../auth/entities/session.entity';
import { Membership } from '../firms/entities/membership.entity';
import type { MemberResponseDto, UpdateRolesDto } from './dto/member.dto';
import { MemberErrorCode } from '@ampwright/common';

export { MemberErrorCode };

const toResponse = (m: Membership): MemberResponseDto => ({
  id: m.id,
  user: { id: m.user.id, email: m.user.email, name: m.user.name },
  roles: m.roles,
  since: m.createdAt.toISOString(),
});

@Injectable()
export class MembersService {
  constructor(
    private readonly em: EntityManager,
    private readonly audit: AuditService,
  ) {}

  async list(auth: AuthContext): Promise<MemberResponseDto[]> {
    const members = await this.em.find(Membership, { firm: auth.firm.id }, { populate: ['user'], orderBy: { createdAt: 'asc' } });
    return members.map(toResponse);
  }

  /** A member of the caller's firm; another firm's id is "not found", never "forbidden". */
  private async find(auth: AuthContext, id: string): Promise<Membership> {
    const m = await this.em.findOne(Membership, { id, firm: auth.firm.id }, { populate: ['user'] });
    if (!m) throw new RequestException(ErrorCode.NotFound, 'No such member in this firm.');
    return m;
  }

  private async assertOwnerRemains(auth: AuthContext, changed: Membership, newRoles: string[] | null): Promise<void> {
    if (!changed.roles.includes('owner') || newRoles?.includes('owner')) return;
    const owners = await this.em.count(Membership, { firm: auth.firm.id, roles: { $like: '%"owner"%' } });
    if (owners <= 1) throw new MemberException(MemberErrorCode.LastOwner, 'A firm must keep at least one owner: make someone else owner first.');
  }

  async updateRoles(auth: AuthContext, id: string, dto: UpdateRolesDto): Promise<MemberResponseDto> {
    if (dto.roles.includes('client') && dto.roles.length > 1) {
      throw new MemberException(MemberErrorCode.ClientWithOtherRoles, 'A client cannot also hold a role in the firm.');
    }
    const m = await this.find(auth, id);
    await this.assertOwnerRemains(auth, m, dto.roles);
    const before = m.roles;
    m.roles = dto.roles;
    await this.em.flush();
    await this.audit.record('role-changed', {
      firmId: auth.firm.id,
      userId: auth.user.id,
      email: m.user.email,
      detail: { before, after: dto.roles },
    });
    return toResponse(m);
  }

  async remove(auth: AuthContext, id: string): Promise<void> {
    const m = await this.find(auth, id);
    await this.assertOwnerRemains(auth, m, null);
    await this.em.nativeDelete(Session, { user: m.user, firm: auth.firm.id });
    await this.em.remove(m).flush();
    await this.audit.record('member-removed', { firmId: auth.firm.id, userId: auth.user.id, email: m.user.email, detail: { roles: m.roles } });
  }
}
