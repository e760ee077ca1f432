import type { ProjectDto } from '@ampwright/common';
import { Transform } from 'class-transformer';
import { ArrayMaxSize, IsArray, IsOptional, IsString, IsUUID, Length, Matches } from 'class-validator';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class CreateProjectDto {
  @Transform(trim)
  @IsString()
  @Length(1, 40, { message: 'jobNumber must be 1 to 40 characters' })
  @Matches(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, { message: 'jobNumber may hold letters, digits and . _ / - only' })
  jobNumber: string;

  @Transform(trim)
  @IsString()
  @Length(1, 200, { message: 'title must be 1 to 200 characters' })
  title: string;

  @Transform(trim)
  @IsString()
  @Length(1, 200, { message: 'clientOrganisation must be 1 to 200 characters' })
  clientOrganisation: string;

  @Transform(trim)
  @IsString()
  @Length(1, 200, { message: 'site must be 1 to 200 characters' })
  site: string;
}

export class UpdateProjectDto {
  @IsOptional()
  @Transform(trim)
  @IsString()
  @Length(1, 40, { message: 'jobNumber must be 1 to 40 characters' })
  @Matches(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, { message: 'jobNumber may hold letters, digits and . _ / - only' })
  jobNumber?: string;

  @IsOptional()
  @Transform(trim)
  @IsString()
  @Length(1, 200, { message: 'title must be 1 to 200 characters' })
  title?: string;

  @IsOptional()
  @Transform(trim)
  @IsString()
  @Length(1, 200, { message: 'clientOrganisation must be 1 to 200 characters' })
  clientOrganisation?: string;

  @IsOptional()
  @Transform(trim)
  @IsString()
  @Length(1, 200, { message: 'site must be 1 to 200 characters' })
  site?: string;
}

/** The body of a project in responses (shared with the app). */
export type ProjectResponseDto = ProjectDto;

export class ProjectMembersDto {
  @IsArray({ message: 'userIds must be a list of member ids' })
  @ArrayMaxSize(200)
  @IsUUID('4', { each: true, message: 'each of userIds must be the id of a member' })
  userIds: string[];
}
