import { Transform } from 'class-transformer';
import { ArrayMaxSize, ArrayMinSize, ArrayUnique, IsArray, IsEmail, IsIn, IsOptional, IsString, IsUUID, Length } from 'class-validator';
import { ROLES, type Role } from '../../core/roles';
import { NewPasswordFields } from '../../auth/dto/auth.dto';

export class CreateInvitationDto {
  @Transform(({ value }) => (typeof value === 'string' ? value.trim().toLowerCase() : value))
  @IsEmail({}, { message: 'email must be an e-mail address' })
  email: string;

  @IsArray()
  @ArrayMinSize(1, { message: 'roles must name at least one role' })
  @ArrayUnique()
  @IsIn(ROLES, { each: true, message: `each role must be one of ${ROLES.join(', ')}` })
  roles: Role[];

  /** For a client: the projects they may see. */
  @IsOptional()
  @IsArray()
  @ArrayMaxSize(100)
  @IsUUID('4', { each: true, message: 'projectIds must be project ids' })
  projectIds?: string[];
}

export class AcceptInvitationDto extends NewPasswordFields {
  @IsString()
  @Length(20, 200, { message: 'token is not a valid invitation token' })
  token: string;

  @Transform(({ value }) => (typeof value === 'string' ? value.trim() : value))
  @IsString()
  @Length(1, 200, { message: 'name must be 1 to 200 characters' })
  name: string;
}

export class InvitationResponseDto {
  id: string;
  email: string;
  roles: Role[];
  expiresAt: string;
  acceptedAt: string | null;
  revokedAt: string | null;
}
