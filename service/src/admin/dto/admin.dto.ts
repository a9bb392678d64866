import { ApiProperty } from '@nestjs/swagger';
import { IsIn } from 'class-validator';
import type { ChangeSiteRoleBody, SiteRole } from '@foldfolio/shared';

export class ChangeSiteRoleDto implements ChangeSiteRoleBody {
  @ApiProperty({ enum: ['admin', 'user'] })
  @IsIn(['admin', 'user'], { message: 'Choose the site role admin or user.' })
  siteRole: SiteRole;
}
