import { Body, Controller, Delete, Get, HttpCode, Param, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiTags } from '@nestjs/swagger';
import type {
  AcceptInvitationResult,
  InvitationDto,
  InvitationPreviewDto,
} from '@foldfolio/shared';
import { CurrentUser, Public } from '../common/request-user.js';
import { idParam } from '../common/validation.js';
import { ManuscriptRoles } from '../manuscripts/manuscript-roles.js';
import { User } from '../users/user.entity.js';
import { InviteDto } from './dto/invitation.dto.js';
import { InvitationsService } from './invitations.service.js';

@ApiTags('invitations')
@ApiBearerAuth()
@Controller('manuscripts/:manuscriptId/invitations')
export class ManuscriptInvitationsController {
  constructor(private readonly invitations: InvitationsService) {}

  @ManuscriptRoles('owner')
  @Get()
  list(@Param('manuscriptId') id: string): Promise<InvitationDto[]> {
    return this.invitations.list(id);
  }

  @ManuscriptRoles('owner')
  @Post()
  invite(
    @Param('manuscriptId') id: string,
    @CurrentUser() user: User,
    @Body() dto: InviteDto,
  ): Promise<InvitationDto> {
    return this.invitations.invite(id, user, dto.email, dto.role);
  }

  @ManuscriptRoles('owner')
  @HttpCode(204)
  @Delete(':invitationId')
  async revoke(
    @Param('manuscriptId') id: string,
    @Param('invitationId', idParam('invitation')) invitationId: string,
  ): Promise<void> {
    await this.invitations.revoke(id, invitationId);
  }
}

/** The invitee's side: look at an invitation by its token, then accept it. */
@ApiTags('invitations')
@Controller('invitations')
export class InvitationsController {
  constructor(private readonly invitations: InvitationsService) {}

  @Public()
  @Get(':token')
  preview(@Param('token') token: string): Promise<InvitationPreviewDto> {
    return this.invitations.preview(token);
  }

  @ApiBearerAuth()
  @HttpCode(200)
  @Post(':token/accept')
  accept(
    @Param('token') token: string,
    @CurrentUser() user: User,
  ): Promise<AcceptInvitationResult> {
    return this.invitations.accept(token, user);
  }
}
