import { Transform } from 'class-transformer';
import { IsInt, IsOptional, IsString, IsUUID, Length, Min } from 'class-validator';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class RequestCheckDto {
  @IsUUID('4', { message: 'checkerId must be the id of a member' })
  checkerId: string;

  @IsOptional()
  @IsUUID('4', { message: 'approverId must be the id of a member' })
  approverId?: string;
}

export class NoteDto {
  @IsOptional()
  @Transform(trim)
  @IsString()
  @Length(1, 4000, { message: 'note must be 1 to 4000 characters' })
  note?: string;
}

export class RaiseQueryDto {
  @IsUUID('4', { message: 'cellId must be the id of a cell of this sheet' })
  cellId: string;

  @IsOptional()
  @IsInt({ message: 'line must be a whole number' })
  @Min(1, { message: 'line starts at 1' })
  line?: number;

  @Transform(trim)
  @IsString({ message: 'text must be text' })
  @Length(1, 4000, { message: 'text must be 1 to 4000 characters' })
  text: string;
}

export class ReplyDto {
  @Transform(trim)
  @IsString({ message: 'text must be text' })
  @Length(1, 4000, { message: 'text must be 1 to 4000 characters' })
  text: string;
}
