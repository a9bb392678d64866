import { Body, Controller, Get, HttpCode, Param, ParseUUIDPipe, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiTags } from '@nestjs/swagger';
import type { CommentThreadDto } from '@foldfolio/shared';
import { CurrentUser } from '../common/request-user.js';
import { ManuscriptRoles } from '../manuscripts/manuscript-roles.js';
import { User } from '../users/user.entity.js';
import { CommentsService } from './comments.service.js';
import { CreateCommentDto, ListCommentsQuery, ReplyDto } from './dto/comment.dto.js';

/** Commenters and up may read and write; reviewers never see the team's discussion. */
const Discussants = () => ManuscriptRoles('owner', 'editor', 'commenter');

@ApiTags('comments')
@ApiBearerAuth()
@Controller('manuscripts/:manuscriptId/comments')
export class CommentsController {
  constructor(private readonly comments: CommentsService) {}

  @Discussants()
  @Get()
  list(
    @Param('manuscriptId') manuscriptId: string,
    @Query() q: ListCommentsQuery,
  ): Promise<CommentThreadDto[]> {
    return this.comments.list(manuscriptId, q);
  }

  /** Open-thread counts per anchor key for one version: the residue table marks those rows. */
  @Discussants()
  @Get('counts/:versionId')
  counts(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
  ): Promise<Record<string, number>> {
    return this.comments.openCounts(manuscriptId, versionId);
  }

  @Discussants()
  @Post()
  create(
    @Param('manuscriptId') manuscriptId: string,
    @CurrentUser() user: User,
    @Body() dto: CreateCommentDto,
  ): Promise<CommentThreadDto> {
    return this.comments.create(manuscriptId, user, dto.anchor, dto.body);
  }

  @Discussants()
  @Post(':commentId/replies')
  reply(
    @Param('manuscriptId') manuscriptId: string,
    @Param('commentId', ParseUUIDPipe) commentId: string,
    @CurrentUser() user: User,
    @Body() dto: ReplyDto,
  ): Promise<CommentThreadDto> {
    return this.comments.reply(manuscriptId, user, commentId, dto.body);
  }

  @Discussants()
  @HttpCode(200)
  @Post(':commentId/resolve')
  resolve(
    @Param('manuscriptId') manuscriptId: string,
    @Param('commentId', ParseUUIDPipe) commentId: string,
    @CurrentUser() user: User,
  ): Promise<CommentThreadDto> {
    return this.comments.setResolved(manuscriptId, user, commentId, true);
  }

  @Discussants()
  @HttpCode(200)
  @Post(':commentId/reopen')
  reopen(
    @Param('manuscriptId') manuscriptId: string,
    @Param('commentId', ParseUUIDPipe) commentId: string,
    @CurrentUser() user: User,
  ): Promise<CommentThreadDto> {
    return this.comments.setResolved(manuscriptId, user, commentId, false);
  }
}
