import { Transform } from 'class-transformer';
import { IsEmail, IsNotEmpty, IsString, Length, MaxLength, MinLength, ValidateBy } from 'class-validator';
import { MAX_PASSWORD_BYTES } from '@ampwright/common';
import { MIN_PASSWORD_LENGTH } from '../password.service';

const lower = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim().toLowerCase() : value);
const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class LoginDto {
  @Transform(lower)
  @IsEmail({}, { message: 'email must be an e-mail address' })
  email: string;

  @IsString()
  @IsNotEmpty({ message: 'password must not be empty' })
  @MaxLength(200)
  password: string;
}

/** At most `max` bytes once encoded as UTF-8 (what bcrypt reads), whatever the number of characters. */
const MaxUtf8Bytes = (max: number, message: string) =>
  ValidateBy({
    name: 'maxUtf8Bytes',
    validator: { validate: (value: unknown) => typeof value === 'string' && Buffer.byteLength(value, 'utf8') <= max, defaultMessage: () => message },
  });

export class NewPasswordFields {
  @IsString()
  @MinLength(MIN_PASSWORD_LENGTH, { message: `password must be at least ${MIN_PASSWORD_LENGTH} characters` })
  @MaxUtf8Bytes(
    MAX_PASSWORD_BYTES,
    `password must be at most ${MAX_PASSWORD_BYTES} bytes: about ${MAX_PASSWORD_BYTES} letters and digits, fewer with accents or symbols (bcrypt reads no further)`,
  )
  password: string;
}

export class RegisterFirmDto extends NewPasswordFields {
  @Transform(trim)
  @IsString()
  @Length(2, 200, { message: 'firmName must be 2 to 200 characters' })
  firmName: string;

  @Transform(trim)
  @IsString()
  @Length(1, 200, { message: 'name must be 1 to 200 characters' })
  name: string;

  @Transform(lower)
  @IsEmail({}, { message: 'email must be an e-mail address' })
  @MaxLength(254)
  email: string;
}

export class ForgotPasswordDto {
  @Transform(lower)
  @IsEmail({}, { message: 'email must be an e-mail address' })
  email: string;
}

export class ResetPasswordDto extends NewPasswordFields {
  @IsString()
  @Length(20, 200, { message: 'token is not a valid reset token' })
  token: string;
}

export class ChangeProfileDto {
  @Transform(trim)
  @IsString()
  @Length(1, 200, { message: 'name must be 1 to 200 characters' })
  name: string;
}

export class ConfirmRegistrationDto {
  @IsString()
  @Length(20, 200, { message: 'token is not a valid registration token' })
  token: string;
}
