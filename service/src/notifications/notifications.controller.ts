import { Body, Controller, Get, Param, Put } from '@nestjs/common';
import { ApiBearerAuth, ApiTags } from '@nestjs/swagger';
import type { NotificationSettingsDto } from '@foldfolio/shared';
import { CurrentUser } from '../common/request-user.js';
import { AnyMember } from '../manuscripts/manuscript-roles.js';
import { User } from '../users/user.entity.js';
import { NotificationSettingsBody } from './notifications.dto.js';
import { NotificationsService } from './notifications.service.js';

@ApiTags('notifications')
@ApiBearerAuth()
@Controller('manuscripts/:manuscriptId/notifications')
export class NotificationsController {
  constructor(private readonly notifications: NotificationsService) {}

  /** The caller's own e-mail setting for this manuscript. */
  @AnyMember()
  @Get()
  async get(
    @Param('manuscriptId') manuscriptId: string,
    @CurrentUser() user: User,
  ): Promise<NotificationSettingsDto> {
    return { muted: await this.notifications.isMuted(manuscriptId, user.id) };
  }

  @AnyMember()
  @Put()
  async set(
    @Param('manuscriptId') manuscriptId: string,
    @CurrentUser() user: User,
    @Body() body: NotificationSettingsBody,
  ): Promise<NotificationSettingsDto> {
    await this.notifications.setMuted(manuscriptId, user.id, body.muted);
    return { muted: body.muted };
  }
}
