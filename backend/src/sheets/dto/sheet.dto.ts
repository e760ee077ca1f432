import { Transform, Type } from 'class-transformer';
import { ArrayMaxSize, IsArray, IsInt, IsObject, IsOptional, IsString, IsUUID, Length, Matches, Min } from 'class-validator';
import type { CoPreparersBody } from '@ampwright/common';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class CreateSheetDto {
  @Transform(trim)
  @IsString()
  @Length(1, 40, { message: 'number must be 1 to 40 characters' })
  @Matches(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, { message: 'number may hold letters, digits and . _ / - only' })
  number: string;

  @IsOptional()
  @Transform(trim)
  @IsString()
  @Length(1, 200, { message: 'title must be 1 to 200 characters' })
  title?: string;

  /** Start from a template of templates/ (by its file name without .json). */
  @IsOptional()
  @IsString()
  @Length(1, 100)
  templateId?: string;

  /** Or import a sheet file (the ampwright.sheet/1 format). */
  @IsOptional()
  @IsObject({ message: 'sheet must be a sheet file object' })
  sheet?: Record<string, unknown>;
}

export class VersionDto {
  /** The sheet version this change is based on. */
  @IsInt({ message: 'version must be a whole number' })
  @Min(1)
  version: number;
}

export class UpdateSheetDto extends VersionDto {
  @IsOptional()
  @Transform(trim)
  @IsString()
  @Length(1, 200, { message: 'title must be 1 to 200 characters' })
  title?: string;

  @IsOptional()
  @IsObject({ message: 'settings must be an object' })
  settings?: Record<string, unknown>;
}

export class AddCellDto extends VersionDto {
  @IsInt({ message: 'position must be a whole number' })
  @Min(0)
  position: number;

  /** The cell as in the sheet file ({ kind, ... }); checked against the format. */
  @IsObject({ message: 'cell must be an object' })
  cell: Record<string, unknown>;
}

export class UpdateCellDto extends VersionDto {
  @IsObject({ message: 'cell must be an object' })
  cell: Record<string, unknown>;
}

export class MoveCellDto extends VersionDto {
  @IsInt({ message: 'position must be a whole number' })
  @Min(0)
  position: number;
}

/** The form fields beside a CSV upload (multipart, so they arrive as text). */
export class ImportCsvDto {
  @Type(() => Number)
  @IsInt({ message: 'version must be a whole number' })
  @Min(1)
  version: number;

  @Type(() => Number)
  @IsInt({ message: 'position must be a whole number' })
  @Min(0)
  position: number;
}

export class CoPreparersDto implements CoPreparersBody {
  @IsArray()
  @ArrayMaxSize(50)
  @IsUUID('4', { each: true, message: 'userIds must hold the ids of members of the firm' })
  userIds: string[];
}
