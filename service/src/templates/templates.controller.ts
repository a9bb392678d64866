import { Body, Controller, Get, Param, ParseIntPipe, Post, Put, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiTags } from '@nestjs/swagger';
import { CurrentUser } from '../common/request-user.js';
import { AnyMember, ManuscriptRoles } from '../manuscripts/manuscript-roles.js';
import { User } from '../users/user.entity.js';
import { DiffQueryDto, ForkTemplateDto, PinDto, SaveVersionDto } from './dto/template.dto.js';
import { parseRef, TemplatesService } from './templates.service.js';

/**
 * Versioned templates as one manuscript sees them: the built-ins, the lab library and its own
 * forks. Every member reads; owners and editors fork, save versions and pin.
 */
@ApiTags('templates')
@ApiBearerAuth()
@Controller('manuscripts/:manuscriptId')
export class TemplatesController {
  constructor(private readonly templates: TemplatesService) {}

  @AnyMember()
  @Get('templates')
  list(@Param('manuscriptId') manuscriptId: string) {
    return this.templates.list(manuscriptId);
  }

  /** Line diff between any two versions (?from=<id>@<n>&to=<id>@<n>). */
  @AnyMember()
  @Get('templates/diff')
  diff(@Param('manuscriptId') manuscriptId: string, @Query() q: DiffQueryDto) {
    return this.templates.diff(manuscriptId, parseRef(q.from), parseRef(q.to));
  }

  @AnyMember()
  @Get('templates/:templateId')
  get(@Param('manuscriptId') manuscriptId: string, @Param('templateId') templateId: string) {
    return this.templates.get(manuscriptId, templateId);
  }

  @AnyMember()
  @Get('templates/:templateId/versions/:n')
  version(
    @Param('manuscriptId') manuscriptId: string,
    @Param('templateId') templateId: string,
    @Param('n', ParseIntPipe) n: number,
  ) {
    return this.templates.version(manuscriptId, { templateId, n });
  }

  /** Fork a version into this manuscript or the lab library. */
  @ManuscriptRoles('owner', 'editor')
  @Post('templates')
  fork(
    @Param('manuscriptId') manuscriptId: string,
    @CurrentUser() user: User,
    @Body() body: ForkTemplateDto,
  ) {
    return this.templates.fork(manuscriptId, user, body);
  }

  /** Save a new immutable version. */
  @ManuscriptRoles('owner', 'editor')
  @Post('templates/:templateId/versions')
  save(
    @Param('manuscriptId') manuscriptId: string,
    @Param('templateId') templateId: string,
    @CurrentUser() user: User,
    @Body() body: SaveVersionDto,
  ) {
    return this.templates.save(manuscriptId, user, templateId, body);
  }

  @AnyMember()
  @Get('template-pins')
  pins(@Param('manuscriptId') manuscriptId: string) {
    return this.templates.pinsFor(manuscriptId);
  }

  @ManuscriptRoles('owner', 'editor')
  @Put('template-pins/:key')
  pin(
    @Param('manuscriptId') manuscriptId: string,
    @Param('key') key: string,
    @CurrentUser() user: User,
    @Body() body: PinDto,
  ) {
    return this.templates.pin(manuscriptId, user, key, parseRef(body.version));
  }
}
