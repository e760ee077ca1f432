import { Body, Controller, Delete, Get, HttpCode, Param, ParseUUIDPipe, Patch } from '@nestjs/common';
import { Roles } from '../core/decorators/access.decorator';
import { CurrentAuth } from '../core/decorators/current-auth.decorator';
import type { AuthContext } from '../core/guards/auth.guard';
import { MEMBER_ROLES } from '../core/roles';
import { MemberResponseDto, UpdateRolesDto } from './dto/member.dto';
import { MembersService } from './members.service';

@Controller('members')
export class MembersController {
  constructor(private readonly members: MembersService) {}

  @Roles(...MEMBER_ROLES)
  @Get()
  list(@CurrentAuth() auth: AuthContext): Promise<MemberResponseDto[]> {
    return this.members.list(auth);
  }

  @Roles('owner')
  @Patch(':id')
  updateRoles(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string, @Body() dto: UpdateRolesDto): Promise<MemberResponseDto> {
    return this.members.updateRoles(auth, id, dto);
  }

  @Roles('owner')
  @Delete(':id')
  @HttpCode(204)
  remove(@CurrentAuth() auth: AuthContext, @Param('id', ParseUUIDPipe) id: string): Promise<void> {
    return this.members.remove(auth, id);
  }
}
