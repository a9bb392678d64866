import { Body, Controller, Delete, Get, HttpCode, Param, Patch, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiTags } from '@nestjs/swagger';
import type { MemberDto } from '@foldfolio/shared';
import { CurrentUser } from '../common/request-user.js';
import { idParam } from '../common/validation.js';
import { User } from '../users/user.entity.js';
import { ChangeRoleDto } from './dto/manuscript.dto.js';
import { AnyMember, ManuscriptRoles } from './manuscript-roles.js';
import { ManuscriptsService } from './manuscripts.service.js';

@ApiTags('members')
@ApiBearerAuth()
@Controller('manuscripts/:manuscriptId')
export class MembersController {
  constructor(private readonly manuscripts: ManuscriptsService) {}

  @AnyMember()
  @Get('members')
  list(@Param('manuscriptId') id: string): Promise<MemberDto[]> {
    return this.manuscripts.members(id);
  }

  @ManuscriptRoles('owner')
  @Patch('members/:userId')
  changeRole(
    @Param('manuscriptId') id: string,
    @Param('userId', idParam('member')) userId: string,
    @Body() dto: ChangeRoleDto,
  ): Promise<MemberDto> {
    return this.manuscripts.changeRole(id, userId, dto.role);
  }

  @ManuscriptRoles('owner')
  @HttpCode(204)
  @Delete('members/:userId')
  async remove(
    @Param('manuscriptId') id: string,
    @Param('userId', idParam('member')) userId: string,
  ): Promise<void> {
    await this.manuscripts.removeMember(id, userId);
  }

  /** Any member may leave; the last owner may not. */
  @AnyMember()
  @HttpCode(204)
  @Post('leave')
  async leave(@Param('manuscriptId') id: string, @CurrentUser() user: User): Promise<void> {
    await this.manuscripts.removeMember(id, user.id);
  }
}
