import { Controller, Get, Param, ParseUUIDPipe, Post, Req, Res } from '@nestjs/common';
import { ApiBearerAuth, ApiConsumes, ApiTags } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import { gunzipSync } from 'node:zlib';
import type { AnalysisDto, ModelVersionDto } from '@foldfolio/shared';
import { CurrentUser } from '../common/request-user.js';
import { AnyMember, ManuscriptRoles } from '../manuscripts/manuscript-roles.js';
import { User } from '../users/user.entity.js';
import { AnalysesService, analysisDto } from '../analyses/analyses.service.js';
import { ModelsService } from './models.service.js';

@ApiTags('models')
@ApiBearerAuth()
@Controller('manuscripts/:manuscriptId/models')
export class ModelsController {
  constructor(
    private readonly models: ModelsService,
    private readonly analyses: AnalysesService,
  ) {}

  /** Upload a new model version: multipart/form-data with `file` and an optional `note`. */
  @ManuscriptRoles('owner', 'editor')
  @ApiConsumes('multipart/form-data')
  @Post()
  upload(
    @Param('manuscriptId') manuscriptId: string,
    @CurrentUser() user: User,
    @Req() req: Request,
  ): Promise<ModelVersionDto> {
    return this.models.upload(manuscriptId, user, req);
  }

  @AnyMember()
  @Get()
  list(@Param('manuscriptId') manuscriptId: string): Promise<ModelVersionDto[]> {
    return this.models.list(manuscriptId);
  }

  @AnyMember()
  @Get(':versionId')
  get(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
  ): Promise<ModelVersionDto> {
    return this.models.get(manuscriptId, versionId);
  }

  /** State and progress of the version's analysis (the UI polls this while it runs). */
  @AnyMember()
  @Get(':versionId/analysis')
  async analysis(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
  ): Promise<AnalysisDto | null> {
    await this.models.findVersion(manuscriptId, versionId);
    return analysisDto(await this.analyses.get(versionId));
  }

  /**
   * The full report (foldfolio.report/1) of a finished analysis. Sent as the stored gzip when the
   * client accepts it (browsers do), so a large report is neither re-parsed nor re-compressed.
   */
  @AnyMember()
  @Get(':versionId/report')
  async report(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
    @Req() req: Request,
    @Res() res: Response,
  ): Promise<void> {
    await this.models.findVersion(manuscriptId, versionId);
    const gz = await this.analyses.reportGzip(versionId);
    res.setHeader('Content-Type', 'application/json; charset=utf-8');
    res.setHeader('Vary', 'Accept-Encoding');
    // a version's report never changes: private caching is safe
    res.setHeader('Cache-Control', 'private, max-age=31536000, immutable');
    if (/\bgzip\b/.test(String(req.headers['accept-encoding'] ?? ''))) {
      res.setHeader('Content-Encoding', 'gzip');
      res.send(gz);
    } else {
      res.send(gunzipSync(gz));
    }
  }

  /** The uploaded file itself, byte for byte. */
  @AnyMember()
  @Get(':versionId/file')
  async file(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
    @Res() res: Response,
  ): Promise<void> {
    const v = await this.models.findVersion(manuscriptId, versionId);
    const bytes = await this.models.readBytes(v);
    res.setHeader('Content-Type', 'application/octet-stream');
    res.setHeader('Content-Disposition', `attachment; filename="${v.filename}"`);
    res.setHeader('X-Content-SHA256', v.sha256);
    res.send(bytes);
  }
}
