import { Body, Controller, Get, Param, ParseUUIDPipe, Post, Put, Query, Res } from '@nestjs/common';
import { ApiBearerAuth, ApiTags } from '@nestjs/swagger';
import type { Response } from 'express';
import { CurrentUser } from '../common/request-user.js';
import { AnyMember, ManuscriptRoles } from '../manuscripts/manuscript-roles.js';
import { TablesService } from '../tables/tables.service.js';
import { builtinByKey, builtinTemplates, sha256Text } from '../templates/builtins.js';
import { checkTemplateBody, TemplateBodyError } from '../templates/compile-check.js';
import {
  FigureExportQueryDto,
  FigureQueryDto,
  MethodsFormDto,
  PreviewDto,
  TableExportQueryDto,
  TableQueryDto,
} from '../templates/dto/template.dto.js';
import { TemplatesService } from '../templates/templates.service.js';
import { User } from '../users/user.entity.js';
import { FiguresService } from './figures.service.js';
import {
  BadRequestException,
  NotFoundException,
  UnprocessableEntityException,
} from '@nestjs/common';

function send(res: Response, bytes: Buffer, type: string, filename: string): void {
  res.setHeader('Content-Type', type);
  res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
  res.send(bytes);
}

/** Figures and the methods table of a manuscript's model versions, and live template previews. */
@ApiTags('figures')
@ApiBearerAuth()
@Controller('manuscripts/:manuscriptId')
export class FiguresController {
  constructor(
    private readonly figures: FiguresService,
    private readonly tables: TablesService,
    private readonly templates: TemplatesService,
  ) {}

  /** The figure slots with their parameters and pinned versions, and the presets. */
  @AnyMember()
  @Get('figures')
  async catalog(@Param('manuscriptId') manuscriptId: string) {
    const pins = await this.templates.pinsFor(manuscriptId);
    return {
      presets: this.figures.presets(),
      figures: builtinTemplates()
        .filter((b) => b.kind === 'figure')
        .map((b) => {
          const p = pins.find((x) => x.key === b.key)!;
          return {
            key: b.key,
            title: b.figure!.title,
            description: b.figure!.description,
            parameters: b.figure!.parameters,
            needsComparison: !!b.figure!.needsComparison,
            template: {
              templateId: p.templateId,
              n: p.n,
              name: p.templateName,
              isDefault: p.isDefault,
            },
          };
        }),
    };
  }

  @AnyMember()
  @Get('models/:versionId/figures/:key')
  figure(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
    @Param('key') key: string,
    @Query() q: FigureQueryDto,
  ) {
    return this.figures.render(
      manuscriptId,
      versionId,
      key,
      q.preset ?? 'single',
      this.figures.parseParams(q.params),
    );
  }

  /** The figure as a file: SVG, PDF (fonts embedded) or PNG at a dpi. */
  @AnyMember()
  @Get('models/:versionId/figures/:key/export')
  async exportFigure(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
    @Param('key') key: string,
    @Query() q: FigureExportQueryDto,
    @Res() res: Response,
  ): Promise<void> {
    const preset = q.preset ?? 'single';
    const fig = await this.figures.render(
      manuscriptId,
      versionId,
      key,
      preset,
      this.figures.parseParams(q.params),
    );
    const { bytes, type } = await this.figures.exportBytes(
      fig,
      q.format,
      q.dpi ?? 300,
      builtinByKey(key)?.name ?? key,
    );
    send(res, bytes, type, `${key}.${preset}.${q.format}`);
  }

  @AnyMember()
  @Get('models/:versionId/methods-table')
  async methodsTable(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
    @Query() q: TableQueryDto,
  ) {
    return (await this.tables.render(manuscriptId, versionId, q.template)).dto;
  }

  @AnyMember()
  @Get('models/:versionId/methods-table/export')
  async exportTable(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
    @Query() q: TableExportQueryDto,
    @Res() res: Response,
  ): Promise<void> {
    const { table, dto } = await this.tables.render(manuscriptId, versionId, q.template);
    const { bytes, type, ext } = await this.tables.exportBytes(table, q.format);
    send(res, bytes, type, `${dto.key}.${ext}`);
  }

  @AnyMember()
  @Get('models/:versionId/methods-form')
  form(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
  ) {
    return this.tables.form(manuscriptId, versionId);
  }

  @ManuscriptRoles('owner', 'editor')
  @Put('models/:versionId/methods-form')
  saveForm(
    @Param('manuscriptId') manuscriptId: string,
    @Param('versionId', ParseUUIDPipe) versionId: string,
    @CurrentUser() user: User,
    @Body() body: MethodsFormDto,
  ) {
    for (const v of Object.values(body.values))
      if (v !== null && typeof v !== 'string' && typeof v !== 'number')
        throw new BadRequestException('Each form value must be a number, a text or null.');
    return this.tables.saveForm(manuscriptId, versionId, user, body.values);
  }

  /**
   * Renders an unsaved draft of a template (the editor's live preview). Errors come back as
   * 422 with the line of the problem.
   */
  @ManuscriptRoles('owner', 'editor')
  @Post('templates/preview')
  async preview(@Param('manuscriptId') manuscriptId: string, @Body() body: PreviewDto) {
    const b = builtinByKey(body.key);
    if (!b) throw new NotFoundException(`There is no template slot "${body.key}".`);
    try {
      checkTemplateBody(b.kind, body.body);
    } catch (e) {
      if (e instanceof TemplateBodyError)
        throw new UnprocessableEntityException({
          statusCode: 422,
          message: e.message,
          line: e.line,
        });
      throw e;
    }
    // a draft is labelled as the version it would become when saved
    const n = body.templateId
      ? (await this.templates.get(manuscriptId, body.templateId)).latest + 1
      : 0;
    const draft = this.templates.withBody(
      b,
      { templateId: body.templateId ?? 'draft', n },
      body.body,
      sha256Text(body.body),
    );
    if (b.kind === 'figure') {
      const fig = await this.figures.render(
        manuscriptId,
        body.modelVersionId,
        b.key,
        body.preset ?? 'single',
        {},
        draft,
      );
      return { kind: 'figure', svg: fig.svg, readiness: fig.readiness };
    }
    const { dto } = await this.tables.render(manuscriptId, body.modelVersionId, b.key, draft);
    return { kind: 'table', html: dto.html };
  }
}
