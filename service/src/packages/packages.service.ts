import {
  BadRequestException,
  GoneException,
  Inject,
  Injectable,
  NotFoundException,
  type OnModuleDestroy,
} from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Queue } from 'bullmq';
import { timingSafeEqual } from 'node:crypto';
import { In, Repository } from 'typeorm';
import type {
  CreatedReviewLinkDto,
  PackageAuditEventDto,
  ReviewerPackageDto,
  ReviewLinkDto,
  ReviewPackageDto,
} from '@foldfolio/shared';
import { queuePrefix, redisConnection, workerSettings } from '../analyses/queue.js';
import { hashToken, isUuid, newId, newToken } from '../common/tokens.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { ModelVersion } from '../models/model-version.entity.js';
import { User } from '../users/user.entity.js';
import { BLOB_STORE, type BlobStore } from '../storage/blob-store.js';
import type { CreatePackageDto, CreateReviewLinkDto } from './dto/package.dto.js';
import type { Manifest } from './build.js';
import {
  PackageAuditEvent,
  ReviewLink,
  ReviewPackage,
  type AuditAction,
} from './package.entities.js';
import { PACKAGE_QUEUE, type PackageJobData } from './queue.js';
import { readZip } from './zip.js';

/** Who is calling, for the audit log. */
export interface Caller {
  userId?: string | null;
  ip?: string | null;
  userAgent?: string | null;
}

const BAD_LINK =
  'This review link is not valid. Check that you copied the whole link, or ask the authors for a new one.';

function linkState(l: ReviewLink, now = Date.now()): ReviewLinkDto['state'] {
  if (l.revokedAt) return 'revoked';
  return l.expiresAt.getTime() <= now ? 'expired' : 'active';
}

export function linkDto(l: ReviewLink): ReviewLinkDto {
  return {
    id: l.id,
    label: l.label,
    expiresAt: l.expiresAt.toISOString(),
    revokedAt: l.revokedAt?.toISOString() ?? null,
    createdAt: l.createdAt.toISOString(),
    state: linkState(l),
  };
}

@Injectable()
export class PackagesService implements OnModuleDestroy {
  private queue: Queue<PackageJobData> | null = null;
  /** parsed zips by sha256 (the reviewer page asks for one file at a time) */
  private readonly zipCache = new Map<string, Map<string, Buffer>>();

  constructor(
    @Inject(APP_CONFIG) private readonly cfg: AppConfig,
    @Inject(BLOB_STORE) private readonly store: BlobStore,
    @InjectRepository(ReviewPackage) private readonly packages: Repository<ReviewPackage>,
    @InjectRepository(ReviewLink) private readonly links: Repository<ReviewLink>,
    @InjectRepository(PackageAuditEvent) private readonly events: Repository<PackageAuditEvent>,
    @InjectRepository(ModelVersion) private readonly versions: Repository<ModelVersion>,
    @InjectRepository(User) private readonly users: Repository<User>,
  ) {}

  private getQueue(): Queue<PackageJobData> {
    this.queue ??= new Queue<PackageJobData>(PACKAGE_QUEUE, {
      connection: redisConnection(this.cfg),
      prefix: queuePrefix(this.cfg),
    });
    return this.queue;
  }

  async onModuleDestroy(): Promise<void> {
    await this.queue?.close();
  }

  async audit(
    action: AuditAction,
    where: { manuscriptId: string | null; packageId?: string | null; linkId?: string | null },
    caller: Caller,
    detail = '',
  ): Promise<void> {
    await this.events.insert({
      id: newId(),
      manuscriptId: where.manuscriptId,
      packageId: where.packageId ?? null,
      linkId: where.linkId ?? null,
      action,
      userId: caller.userId ?? null,
      detail: detail.slice(0, 300),
      ip: caller.ip?.slice(0, 64) ?? null,
      userAgent: caller.userAgent?.slice(0, 300) ?? null,
    });
  }

  async create(
    manuscriptId: string,
    dto: CreatePackageDto,
    caller: Caller,
  ): Promise<ReviewPackageDto> {
    const ids = [...new Set(dto.modelVersionIds)];
    const found = await this.versions.find({
      where: { manuscriptId, id: In(ids) },
      order: { n: 'ASC' },
    });
    if (found.length !== ids.length)
      throw new BadRequestException(
        'Some of the chosen model versions are not versions of this manuscript; reload the page and choose again.',
      );
    const pkg = this.packages.create({
      id: newId(),
      manuscriptId,
      status: 'queued',
      progress: 0,
      step: null,
      error: null,
      modelVersionIds: JSON.stringify(found.map((v) => v.id)),
      includeModel: dto.includeModel,
      anonymised: dto.anonymise,
      zipSha256: null,
      sizeBytes: null,
      manifestJson: null,
      createdBy: caller.userId ?? null,
      finishedAt: null,
    });
    await this.packages.insert(pkg);
    await this.audit(
      'package-requested',
      { manuscriptId, packageId: pkg.id },
      caller,
      `versions ${found.map((v) => v.n).join(', ')}${dto.anonymise ? ', anonymised' : ''}${dto.includeModel ? ', with model file' : ''}`,
    );
    await this.getQueue().add(
      'build',
      { packageId: pkg.id },
      {
        jobId: pkg.id,
        attempts: workerSettings().attempts,
        backoff: { type: 'exponential', delay: 2000 },
        removeOnComplete: { age: 24 * 3600 },
        removeOnFail: { age: 7 * 24 * 3600 },
      },
    );
    return this.get(manuscriptId, pkg.id);
  }

  private async toDtos(rows: ReviewPackage[]): Promise<ReviewPackageDto[]> {
    const allIds = rows.flatMap((r) => JSON.parse(r.modelVersionIds) as string[]);
    const vs = allIds.length ? await this.versions.findBy({ id: In(allIds) }) : [];
    const nOf = new Map(vs.map((v) => [v.id, v.n]));
    const links = rows.length
      ? await this.links.find({
          where: { packageId: In(rows.map((r) => r.id)) },
          order: { createdAt: 'ASC' },
        })
      : [];
    return rows.map((r) => ({
      id: r.id,
      status: r.status,
      progress: r.progress,
      step: r.step,
      error: r.error,
      modelVersions: (JSON.parse(r.modelVersionIds) as string[]).map((id) => ({
        id,
        n: nOf.get(id) ?? 0,
      })),
      includeModel: r.includeModel,
      anonymised: r.anonymised,
      zipSha256: r.zipSha256,
      sizeBytes: r.sizeBytes,
      createdAt: r.createdAt.toISOString(),
      finishedAt: r.finishedAt?.toISOString() ?? null,
      links: links.filter((l) => l.packageId === r.id).map(linkDto),
    }));
  }

  async list(manuscriptId: string): Promise<ReviewPackageDto[]> {
    return this.toDtos(
      await this.packages.find({ where: { manuscriptId }, order: { createdAt: 'DESC' } }),
    );
  }

  private async find(manuscriptId: string, packageId: string): Promise<ReviewPackage> {
    const p = await this.packages.findOneBy({ id: packageId, manuscriptId });
    if (!p)
      throw new NotFoundException(
        'There is no such package in this manuscript; reload the Review packages tab.',
      );
    return p;
  }

  async get(manuscriptId: string, packageId: string): Promise<ReviewPackageDto> {
    return (await this.toDtos([await this.find(manuscriptId, packageId)]))[0];
  }

  private async zipOf(p: ReviewPackage): Promise<Buffer> {
    if (p.status !== 'done' || !p.zipSha256)
      throw new BadRequestException(
        'The package is not built yet; wait until its progress bar completes.',
      );
    return this.store.read(p.zipSha256);
  }

  async download(
    manuscriptId: string,
    packageId: string,
    caller: Caller,
  ): Promise<{ bytes: Buffer; pkg: ReviewPackage }> {
    const pkg = await this.find(manuscriptId, packageId);
    const bytes = await this.zipOf(pkg);
    await this.audit('package-downloaded', { manuscriptId, packageId }, caller);
    return { bytes, pkg };
  }

  async createLink(
    manuscriptId: string,
    packageId: string,
    dto: CreateReviewLinkDto,
    caller: Caller,
  ): Promise<CreatedReviewLinkDto> {
    const pkg = await this.find(manuscriptId, packageId);
    if (pkg.status !== 'done')
      throw new BadRequestException(
        'Share the package once it is built; wait until its progress bar completes.',
      );
    const secret = newToken();
    const link = this.links.create({
      id: newId(),
      packageId,
      manuscriptId,
      secretHash: hashToken(secret),
      label: dto.label?.trim() ?? '',
      expiresAt: new Date(Date.now() + dto.expiresInDays * 24 * 3600 * 1000),
      revokedAt: null,
      createdBy: caller.userId ?? null,
    });
    await this.links.insert(link);
    const saved = await this.links.findOneByOrFail({ id: link.id });
    await this.audit(
      'link-created',
      { manuscriptId, packageId, linkId: link.id },
      caller,
      `expires ${saved.expiresAt.toISOString()}${link.label ? `, label "${link.label}"` : ''}`,
    );
    const token = `${link.id}.${secret}`;
    return {
      link: linkDto(saved),
      token,
      url: `${this.cfg.publicUrl.replace(/\/$/, '')}/review/${token}`,
    };
  }

  async revokeLink(manuscriptId: string, linkId: string, caller: Caller): Promise<ReviewLinkDto> {
    const link = await this.links.findOneBy({ id: linkId, manuscriptId });
    if (!link)
      throw new NotFoundException(
        'There is no such review link in this manuscript; reload the tab.',
      );
    if (!link.revokedAt) {
      await this.links.update({ id: linkId }, { revokedAt: new Date() });
      await this.audit('link-revoked', { manuscriptId, packageId: link.packageId, linkId }, caller);
    }
    return linkDto(await this.links.findOneByOrFail({ id: linkId }));
  }

  async auditLog(manuscriptId: string): Promise<PackageAuditEventDto[]> {
    const rows = await this.events.find({
      where: { manuscriptId },
      order: { createdAt: 'DESC', id: 'ASC' },
      take: 500,
    });
    const uids = [...new Set(rows.map((r) => r.userId).filter((x): x is string => !!x))];
    const names = new Map(
      (uids.length ? await this.users.findBy({ id: In(uids) }) : []).map((u) => [
        u.id,
        u.displayName,
      ]),
    );
    return rows.map((r) => ({
      id: r.id,
      action: r.action,
      packageId: r.packageId,
      linkId: r.linkId,
      userName: r.userId ? (names.get(r.userId) ?? null) : null,
      detail: r.detail,
      ip: r.ip,
      createdAt: r.createdAt.toISOString(),
    }));
  }

  /**
   * Resolves a reviewer token `<link id>.<secret>`; every refusal is written to the audit log
   * (of the manuscript when the link id is known) before the error is thrown.
   */
  async resolveToken(
    token: string,
    caller: Caller,
  ): Promise<{ link: ReviewLink; pkg: ReviewPackage }> {
    const dot = token.indexOf('.');
    const id = dot > 0 ? token.slice(0, dot) : '';
    const secret = dot > 0 ? token.slice(dot + 1) : '';
    const link = isUuid(id)
      ? await this.links
          .createQueryBuilder('l')
          .addSelect('l.secretHash')
          .where('l.id = :id', { id })
          .getOne()
      : null;
    if (!link) {
      await this.audit(
        'refused-unknown-link',
        { manuscriptId: null },
        caller,
        `link id ${id.slice(0, 40) || '(none)'}`,
      );
      throw new NotFoundException(BAD_LINK);
    }
    const where = { manuscriptId: link.manuscriptId, packageId: link.packageId, linkId: link.id };
    const a = Buffer.from(hashToken(secret), 'hex');
    const b = Buffer.from(link.secretHash, 'hex');
    if (secret.length === 0 || a.length !== b.length || !timingSafeEqual(a, b)) {
      await this.audit('refused-wrong-secret', where, caller);
      throw new NotFoundException(BAD_LINK);
    }
    if (link.revokedAt) {
      await this.audit('refused-revoked', where, caller);
      throw new GoneException(
        'The authors withdrew this review link. Ask them for a new one if you still need the package.',
      );
    }
    if (link.expiresAt.getTime() <= Date.now()) {
      await this.audit('refused-expired', where, caller);
      throw new GoneException(
        `This review link expired on ${link.expiresAt.toISOString().slice(0, 10)}. Ask the authors for a new one.`,
      );
    }
    const pkg = await this.packages
      .createQueryBuilder('p')
      .addSelect('p.manifestJson')
      .where('p.id = :id', { id: link.packageId })
      .getOne();
    if (!pkg || pkg.status !== 'done') {
      await this.audit('refused-unknown-link', where, caller, 'package missing');
      throw new NotFoundException(BAD_LINK);
    }
    return { link, pkg };
  }

  async reviewerView(token: string, caller: Caller): Promise<ReviewerPackageDto> {
    const { link, pkg } = await this.resolveToken(token, caller);
    await this.audit(
      'reviewer-opened',
      { manuscriptId: link.manuscriptId, packageId: pkg.id, linkId: link.id },
      caller,
    );
    const manifest = JSON.parse(pkg.manifestJson ?? '{}') as Manifest;
    return {
      title: manifest.title,
      anonymised: manifest.anonymised,
      expiresAt: link.expiresAt.toISOString(),
      zipSha256: pkg.zipSha256!,
      sizeBytes: pkg.sizeBytes!,
      files: manifest.files.map((f) => ({
        path: f.path,
        kind: f.kind,
        sizeBytes: f.sizeBytes,
        description: f.description,
      })),
    };
  }

  async reviewerFile(token: string, path: string, caller: Caller): Promise<Buffer> {
    const { link, pkg } = await this.resolveToken(token, caller);
    let entries = this.zipCache.get(pkg.zipSha256!);
    if (!entries) {
      entries = await readZip(await this.store.read(pkg.zipSha256!));
      if (this.zipCache.size >= 4) this.zipCache.delete(this.zipCache.keys().next().value!);
      this.zipCache.set(pkg.zipSha256!, entries);
    }
    const bytes = entries.get(path);
    if (!bytes)
      throw new NotFoundException(
        `The package has no file "${path.slice(0, 200)}"; choose one from the list.`,
      );
    await this.audit(
      'reviewer-file',
      { manuscriptId: link.manuscriptId, packageId: pkg.id, linkId: link.id },
      caller,
      path,
    );
    return bytes;
  }

  async reviewerZip(token: string, caller: Caller): Promise<{ bytes: Buffer; pkg: ReviewPackage }> {
    const { link, pkg } = await this.resolveToken(token, caller);
    const bytes = await this.zipOf(pkg);
    await this.audit(
      'reviewer-downloaded',
      { manuscriptId: link.manuscriptId, packageId: pkg.id, linkId: link.id },
      caller,
    );
    return { bytes, pkg };
  }
}
