import {
  BadRequestException,
  Body,
  Controller,
  Get,
  HttpCode,
  Inject,
  Param,
  ParseUUIDPipe,
  Post,
  Query,
  Req,
  Res,
} from '@nestjs/common';
import { ApiBearerAuth, ApiConsumes, ApiTags } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import type {
  CreatedReviewLinkDto,
  PackageAuditEventDto,
  ReviewerPackageDto,
  ReviewLinkDto,
  ReviewPackageDto,
  VerifyResultDto,
} from '@foldfolio/shared';
import { CurrentUser, Public } from '../common/request-user.js';
import { ManuscriptRoles } from '../manuscripts/manuscript-roles.js';
import { STORAGE_SETTINGS, type StorageSettings } from '../storage/storage.module.js';
import { User } from '../users/user.entity.js';
import { CreatePackageDto, CreateReviewLinkDto } from './dto/package.dto.js';
import { type Caller, PackagesService } from './packages.service.js';
import { PackageVerifyError, verifyPackage } from './verify.js';
import { receiveVerifyUpload, VerifyUploadError } from './verify-upload.js';
import { ZipSafetyError } from './zip.js';

function caller(req: Request, user?: User | null): Caller {
  return { userId: user?.id ?? null, ip: req.ip ?? null, userAgent: req.get('user-agent') ?? null };
}

function zipName(pkgId: string): string {
  return `review-package-${pkgId.slice(0, 8)}.zip`;
}

@ApiTags('packages')
@ApiBearerAuth()
@Controller('manuscripts/:manuscriptId')
export class PackagesController {
  constructor(private readonly packages: PackagesService) {}

  /** Freeze a package (background job; poll the package for progress). */
  @ManuscriptRoles('owner', 'editor')
  @Post('packages')
  create(
    @Param('manuscriptId') manuscriptId: string,
    @Body() dto: CreatePackageDto,
    @CurrentUser() user: User,
    @Req() req: Request,
  ): Promise<ReviewPackageDto> {
    return this.packages.create(manuscriptId, dto, caller(req, user));
  }

  @ManuscriptRoles('owner', 'editor')
  @Get('packages')
  list(@Param('manuscriptId') manuscriptId: string): Promise<ReviewPackageDto[]> {
    return this.packages.list(manuscriptId);
  }

  @ManuscriptRoles('owner', 'editor')
  @Get('packages/:packageId')
  get(
    @Param('manuscriptId') manuscriptId: string,
    @Param('packageId', ParseUUIDPipe) packageId: string,
  ): Promise<ReviewPackageDto> {
    return this.packages.get(manuscriptId, packageId);
  }

  @ManuscriptRoles('owner', 'editor')
  @Get('packages/:packageId/zip')
  async zip(
    @Param('manuscriptId') manuscriptId: string,
    @Param('packageId', ParseUUIDPipe) packageId: string,
    @CurrentUser() user: User,
    @Req() req: Request,
    @Res() res: Response,
  ): Promise<void> {
    const { bytes, pkg } = await this.packages.download(manuscriptId, packageId, caller(req, user));
    res.setHeader('Content-Type', 'application/zip');
    res.setHeader('Content-Disposition', `attachment; filename="${zipName(pkg.id)}"`);
    res.setHeader('X-Content-SHA256', pkg.zipSha256!);
    res.send(bytes);
  }

  /** A reviewer link; the token is in the answer once and never again. */
  @ManuscriptRoles('owner')
  @Post('packages/:packageId/links')
  createLink(
    @Param('manuscriptId') manuscriptId: string,
    @Param('packageId', ParseUUIDPipe) packageId: string,
    @Body() dto: CreateReviewLinkDto,
    @CurrentUser() user: User,
    @Req() req: Request,
  ): Promise<CreatedReviewLinkDto> {
    return this.packages.createLink(manuscriptId, packageId, dto, caller(req, user));
  }

  @ManuscriptRoles('owner')
  @HttpCode(200)
  @Post('review-links/:linkId/revoke')
  revoke(
    @Param('manuscriptId') manuscriptId: string,
    @Param('linkId', ParseUUIDPipe) linkId: string,
    @CurrentUser() user: User,
    @Req() req: Request,
  ): Promise<ReviewLinkDto> {
    return this.packages.revokeLink(manuscriptId, linkId, caller(req, user));
  }

  @ManuscriptRoles('owner')
  @Get('package-audit')
  audit(@Param('manuscriptId') manuscriptId: string): Promise<PackageAuditEventDto[]> {
    return this.packages.auditLog(manuscriptId);
  }
}

const CONTENT_TYPES: Record<string, string> = {
  svg: 'image/svg+xml',
  pdf: 'application/pdf',
  json: 'application/json; charset=utf-8',
  csv: 'text/csv; charset=utf-8',
  md: 'text/markdown; charset=utf-8',
  tex: 'text/plain; charset=utf-8',
  html: 'text/html; charset=utf-8',
  docx: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document',
};

/** The reviewer's side: no sign-in, the token is the only key. */
@ApiTags('review')
@Controller('review/:token')
export class ReviewerController {
  constructor(private readonly packages: PackagesService) {}

  @Public()
  @Get()
  view(@Param('token') token: string, @Req() req: Request): Promise<ReviewerPackageDto> {
    return this.packages.reviewerView(token, caller(req));
  }

  /** One file of the package, e.g. ?path=v1/figures/torsion-plot.svg */
  @Public()
  @Get('file')
  async file(
    @Param('token') token: string,
    @Query('path') path: string | undefined,
    @Req() req: Request,
    @Res() res: Response,
  ): Promise<void> {
    if (!path)
      throw new BadRequestException('Say which file to show with ?path=… (see the file list).');
    const bytes = await this.packages.reviewerFile(token, path, caller(req));
    const ext = path.slice(path.lastIndexOf('.') + 1);
    const type = CONTENT_TYPES[ext] ?? 'application/octet-stream';
    res.setHeader('Content-Type', type);
    // package files are shown, never run: no scripts, no same-origin access
    res.setHeader(
      'Content-Security-Policy',
      "sandbox; default-src 'none'; img-src data:; style-src 'unsafe-inline'; font-src data:",
    );
    res.setHeader('X-Content-Type-Options', 'nosniff');
    const inline = ['svg', 'pdf', 'html', 'md', 'csv', 'json', 'tex'].includes(ext);
    const base = path.slice(path.lastIndexOf('/') + 1).replace(/[^A-Za-z0-9._-]/g, '_');
    res.setHeader('Content-Disposition', `${inline ? 'inline' : 'attachment'}; filename="${base}"`);
    res.send(bytes);
  }

  @Public()
  @Get('zip')
  async zip(
    @Param('token') token: string,
    @Req() req: Request,
    @Res() res: Response,
  ): Promise<void> {
    const { bytes, pkg } = await this.packages.reviewerZip(token, caller(req));
    res.setHeader('Content-Type', 'application/zip');
    res.setHeader('Content-Disposition', `attachment; filename="${zipName(pkg.id)}"`);
    res.setHeader('X-Content-SHA256', pkg.zipSha256!);
    res.send(bytes);
  }
}

/** Check a package: any signed-in user (it rebuilds everything, so not open to the world). */
@ApiTags('packages')
@ApiBearerAuth()
@Controller('packages')
export class VerifyController {
  constructor(@Inject(STORAGE_SETTINGS) private readonly storage: StorageSettings) {}

  @ApiConsumes('multipart/form-data')
  @HttpCode(200)
  @Post('verify')
  async verify(@Req() req: Request): Promise<VerifyResultDto> {
    try {
      const { pkg, model } = await receiveVerifyUpload(req, this.storage.uploadLimitBytes);
      return await verifyPackage(pkg, { model });
    } catch (e) {
      if (
        e instanceof VerifyUploadError ||
        e instanceof ZipSafetyError ||
        e instanceof PackageVerifyError
      )
        throw new BadRequestException(e.message);
      throw e;
    }
  }
}
