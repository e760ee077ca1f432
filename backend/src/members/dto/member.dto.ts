import { ArrayMinSize, ArrayUnique, IsArray, IsIn } from 'class-validator';
import { ROLES, type Role } from '../../core/roles';

export class UpdateRolesDto {
  @IsArray()
  @ArrayMinSize(1, { message: 'roles must name at least one role' })
  @ArrayUnique()
  @IsIn(ROLES, { each: true, message: `each role must be one of ${ROLES.join(', ')}` })
  roles: Role[];
}

export class MemberResponseDto {
  id: string;
  user: { id: string; email: string; name: string };
  roles: Role[];
  since: string;
}
