import { Transform } from 'class-transformer';
import { IsEmail, IsNotEmpty, IsString, Length, MaxLength, MinLength } from 'class-validator';
import { MIN_PASSWORD_LENGTH } from '../password.service';

const lower = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim().toLowerCase() : value);
const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class LoginDto {
  @Transform(lower) @IsEmail({}, { message: 'email must be an e-mail address' })
  email: string;

  @IsString() @IsNotEmpty({ message: 'password must not be empty' }) @MaxLength(200)
  password: string;
}

export class NewPasswordFields {
  @IsString()
  @MinLength(MIN_PASSWORD_LENGTH, { message: `password must be at least ${MIN_PASSWORD_LENGTH} characters` })
  @MaxLength(200, { message: 'password must be at most 200 characters' })
  password: string;
}

export class RegisterFirmDto extends NewPasswordFields {
  @Transform(trim) @IsString() @Length(2, 200, { message: 'firmName must be 2 to 200 characters' })
  firmName: string;

  @Transform(trim) @IsString() @Length(1, 200, { message: 'name must be 1 to 200 characters' })
  name: string;

  @Transform(lower) @IsEmail({}, { message: 'email must be an e-mail address' }) @MaxLength(254)
  email: string;
}

export class ForgotPasswordDto {
  @Transform(lower) @IsEmail({}, { message: 'email must be an e-mail address' })
  email: string;
}

export class ResetPasswordDto extends NewPasswordFields {
  @IsString() @Length(20, 200, { message: 'token is not a valid reset token' })
  token: string;
}

export class ChangeProfileDto {
  @Transform(trim) @IsString() @Length(1, 200, { message: 'name must be 1 to 200 characters' })
  name: string;
}
