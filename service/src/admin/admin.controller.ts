import { Body, Controller, Delete, Get, HttpCode, Param, Patch } from '@nestjs/common';
import { ApiBearerAuth, ApiTags } from '@nestjs/swagger';
import type { AdminUserDto, MailMessageDto, MailMessageSummaryDto } from '@foldfolio/shared';
import { AdminOnly } from '../auth/guards.js';
import { CurrentUser } from '../common/request-user.js';
import { idParam } from '../common/validation.js';
import { OutboxService } from '../mail/outbox.service.js';
import { User } from '../users/user.entity.js';
import { UsersService } from '../users/users.service.js';
import { ChangeSiteRoleDto } from './dto/admin.dto.js';

@ApiTags('admin')
@ApiBearerAuth()
@AdminOnly()
@Controller('admin')
export class AdminController {
  constructor(
    private readonly users: UsersService,
    private readonly outbox: OutboxService,
  ) {}

  @Get('users')
  listUsers(): Promise<AdminUserDto[]> {
    return this.users.listForAdmin();
  }

  @Patch('users/:userId')
  setSiteRole(
    @CurrentUser() actor: User,
    @Param('userId', idParam('user')) userId: string,
    @Body() dto: ChangeSiteRoleDto,
  ): Promise<AdminUserDto> {
    return this.users.setSiteRole(actor, userId, dto.siteRole);
  }

  @HttpCode(204)
  @Delete('users/:userId')
  async deleteUser(@Param('userId', idParam('user')) userId: string): Promise<void> {
    await this.users.delete(userId);
  }

  @Get('outbox')
  listMail(): Promise<MailMessageSummaryDto[]> {
    return this.outbox.list();
  }

  @Get('outbox/:messageId')
  getMail(@Param('messageId', idParam('message')) id: string): Promise<MailMessageDto> {
    return this.outbox.get(id);
  }
}
