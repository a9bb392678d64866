import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsIn, IsOptional, IsString, MaxLength, MinLength } from 'class-validator';
import {
  MEMBERSHIP_ROLES,
  type ChangeRoleBody,
  type CreateManuscriptBody,
  type MembershipRole,
  type RenameManuscriptBody,
} from '@foldfolio/shared';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);
export const TITLE_MAX = 300;

export class TitleDto implements CreateManuscriptBody, RenameManuscriptBody {
  @ApiProperty({ maxLength: TITLE_MAX, example: 'Structure of an invented flavin reductase' })
  @Transform(trim)
  @IsString({ message: 'Give the manuscript a title.' })
  @MinLength(1, { message: 'Give the manuscript a title.' })
  @MaxLength(TITLE_MAX, { message: `Shorten the title to at most ${TITLE_MAX} characters.` })
  title: string;
}

export class ListManuscriptsQuery {
  @ApiPropertyOptional({ enum: ['true', 'false'] })
  @IsOptional()
  @IsIn(['true', 'false'], { message: 'includeArchived must be true or false.' })
  includeArchived?: 'true' | 'false';
}

const ROLE_MSG = `Choose one of the roles ${MEMBERSHIP_ROLES.join(', ')}.`;

export class ChangeRoleDto implements ChangeRoleBody {
  @ApiProperty({ enum: MEMBERSHIP_ROLES })
  @IsIn(MEMBERSHIP_ROLES as MembershipRole[], { message: ROLE_MSG })
  role: MembershipRole;
}
