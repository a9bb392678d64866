import { ApiProperty } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsEmail, IsString, MaxLength, MinLength } from 'class-validator';
import type {
  PasswordResetConfirmBody,
  PasswordResetRequestBody,
  RegisterBody,
  SignInBody,
} from '@foldfolio/shared';

const trimLower = ({ value }: { value: unknown }) =>
  typeof value === 'string' ? value.trim().toLowerCase() : value;
const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

// 254 characters: the longest usable address (RFC 5321 path limit, via RFC 3696 errata).
const EMAIL_MAX = 254;
const EMAIL_MSG = 'Enter an e-mail address such as name@example.org.';
// 10 characters minimum: NIST SP 800-63B asks for at least 8; we ask a little more.
const PASSWORD_MIN = 10;
const PASSWORD_MAX = 200;

export class EmailField {
  @ApiProperty({ example: 'ada@lab.example', maxLength: EMAIL_MAX })
  @Transform(trimLower)
  @IsString({ message: EMAIL_MSG })
  @MaxLength(EMAIL_MAX, { message: `Use an e-mail address of at most ${EMAIL_MAX} characters.` })
  @IsEmail({}, { message: EMAIL_MSG })
  email: string;
}

export class RegisterDto extends EmailField implements RegisterBody {
  @ApiProperty({ example: 'Ada Quarrington', maxLength: 100 })
  @Transform(trim)
  @IsString({ message: 'Enter your name as coauthors should see it.' })
  @MinLength(1, { message: 'Enter your name as coauthors should see it.' })
  @MaxLength(100, { message: 'Shorten your name to at most 100 characters.' })
  displayName: string;

  @ApiProperty({ minLength: PASSWORD_MIN, maxLength: PASSWORD_MAX })
  @IsString({ message: `Choose a password of at least ${PASSWORD_MIN} characters.` })
  @MinLength(PASSWORD_MIN, { message: `Choose a password of at least ${PASSWORD_MIN} characters.` })
  @MaxLength(PASSWORD_MAX, { message: `Use a password of at most ${PASSWORD_MAX} characters.` })
  password: string;
}

export class SignInDto extends EmailField implements SignInBody {
  @ApiProperty()
  @IsString({ message: 'Enter your password.' })
  @MinLength(1, { message: 'Enter your password.' })
  @MaxLength(PASSWORD_MAX, { message: `Use a password of at most ${PASSWORD_MAX} characters.` })
  password: string;
}

export class PasswordResetRequestDto extends EmailField implements PasswordResetRequestBody {}

export class PasswordResetConfirmDto implements PasswordResetConfirmBody {
  @ApiProperty()
  @IsString({ message: 'Open the link from the reset e-mail again.' })
  @MinLength(20, {
    message: 'Open the link from the reset e-mail again; this token is incomplete.',
  })
  @MaxLength(100, { message: 'Open the link from the reset e-mail again; this token is not ours.' })
  token: string;

  @ApiProperty({ minLength: PASSWORD_MIN, maxLength: PASSWORD_MAX })
  @IsString({ message: `Choose a password of at least ${PASSWORD_MIN} characters.` })
  @MinLength(PASSWORD_MIN, { message: `Choose a password of at least ${PASSWORD_MIN} characters.` })
  @MaxLength(PASSWORD_MAX, { message: `Use a password of at most ${PASSWORD_MAX} characters.` })
  password: string;
}
