import { ApiProperty } from '@nestjs/swagger';
import { IsIn } from 'class-validator';
import { MEMBERSHIP_ROLES, type InviteBody, type MembershipRole } from '@foldfolio/shared';
import { EmailField } from '../../auth/dto/auth.dto.js';

export class InviteDto extends EmailField implements InviteBody {
  @ApiProperty({ enum: MEMBERSHIP_ROLES })
  @IsIn(MEMBERSHIP_ROLES as MembershipRole[], {
    message: `Choose one of the roles ${MEMBERSHIP_ROLES.join(', ')}.`,
  })
  role: MembershipRole;
}
