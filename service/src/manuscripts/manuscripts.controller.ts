import { Body, Controller, Get, HttpCode, Param, Patch, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiTags } from '@nestjs/swagger';
import type { ManuscriptDto } from '@foldfolio/shared';
import { CurrentUser } from '../common/request-user.js';
import { User } from '../users/user.entity.js';
import { ListManuscriptsQuery, TitleDto } from './dto/manuscript.dto.js';
import { AnyMember, ManuscriptRoles } from './manuscript-roles.js';
import { ManuscriptsService } from './manuscripts.service.js';

@ApiTags('manuscripts')
@ApiBearerAuth()
@Controller('manuscripts')
export class ManuscriptsController {
  constructor(private readonly manuscripts: ManuscriptsService) {}

  /** The Desk: the caller's manuscripts with their role. */
  @Get()
  list(@CurrentUser() user: User, @Query() q: ListManuscriptsQuery): Promise<ManuscriptDto[]> {
    return this.manuscripts.listForUser(user.id, q.includeArchived === 'true');
  }

  @Post()
  create(@CurrentUser() user: User, @Body() dto: TitleDto): Promise<ManuscriptDto> {
    return this.manuscripts.create(user, dto.title);
  }

  @AnyMember()
  @Get(':manuscriptId')
  get(@Param('manuscriptId') id: string, @CurrentUser() user: User): Promise<ManuscriptDto> {
    return this.manuscripts.getForUser(id, user.id);
  }

  @ManuscriptRoles('owner', 'editor')
  @Patch(':manuscriptId')
  rename(
    @Param('manuscriptId') id: string,
    @CurrentUser() user: User,
    @Body() dto: TitleDto,
  ): Promise<ManuscriptDto> {
    return this.manuscripts.rename(id, user.id, dto.title);
  }

  @ManuscriptRoles('owner')
  @HttpCode(200)
  @Post(':manuscriptId/archive')
  archive(@Param('manuscriptId') id: string, @CurrentUser() user: User): Promise<ManuscriptDto> {
    return this.manuscripts.setStatus(id, user.id, 'archived');
  }

  @ManuscriptRoles('owner')
  @HttpCode(200)
  @Post(':manuscriptId/restore')
  restore(@Param('manuscriptId') id: string, @CurrentUser() user: User): Promise<ManuscriptDto> {
    return this.manuscripts.setStatus(id, user.id, 'active');
  }
}
