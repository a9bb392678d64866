import {
  BadRequestException,
  ConflictException,
  Inject,
  Injectable,
  NotFoundException,
  PayloadTooLargeException,
  UnsupportedMediaTypeException,
} from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import type { Request } from 'express';
import { DataSource } from 'typeorm';
import type { ModelVersionDto } from '@foldfolio/shared';
import { Analysis } from '../analyses/analysis.entity.js';
import { AnalysesService, analysisDto } from '../analyses/analyses.service.js';
import { newId } from '../common/tokens.js';
import { Manuscript } from '../manuscripts/manuscript.entity.js';
import { BLOB_STORE, type BlobStore, UploadTooLargeError } from '../storage/blob-store.js';
import { EmptyUploadError, NotAStructureError } from '../storage/sniff.js';
import { STORAGE_SETTINGS, type StorageSettings } from '../storage/storage.module.js';
import type { User } from '../users/user.entity.js';
import { ModelVersion } from './model-version.entity.js';
import { type ParsedUpload, receiveUpload, UploadFormError } from './upload.js';
import { type SniffedFormat, sanitizeFilename, sniffFormat } from '../storage/sniff.js';
import { Readable } from 'node:stream';
import { EventEmitter } from 'node:events';

const NOTE_MAX = 2000;

export interface VersionCreated {
  manuscriptId: string;
  version: ModelVersionDto;
  uploader: User;
}

@Injectable()
export class ModelsService {
  /** 'created' (VersionCreated): notifications and the ledger listen here */
  readonly created = new EventEmitter();

  constructor(
    @InjectDataSource() private readonly db: DataSource,
    @Inject(BLOB_STORE) private readonly store: BlobStore,
    @Inject(STORAGE_SETTINGS) private readonly storage: StorageSettings,
    private readonly analyses: AnalysesService,
  ) {}

  async upload(manuscriptId: string, user: User, req: Request): Promise<ModelVersionDto> {
    const ms = await this.db.getRepository(Manuscript).findOneBy({ id: manuscriptId });
    if (ms?.status === 'archived') {
      req.resume(); // drain the upload so the client receives this answer
      throw new ConflictException(
        'This manuscript is archived, so it takes no new versions. An owner can restore it first.',
      );
    }
    let parsed;
    try {
      parsed = await receiveUpload(req, this.store, this.storage.uploadLimitBytes);
    } catch (err) {
      if (err instanceof UploadTooLargeError) throw new PayloadTooLargeException(err.message);
      if (err instanceof NotAStructureError) throw new UnsupportedMediaTypeException(err.message);
      if (err instanceof EmptyUploadError || err instanceof UploadFormError) {
        throw new BadRequestException(err.message);
      }
      throw err;
    }
    return this.createVersion(manuscriptId, user, parsed, parsed.fields.note ?? '');
  }

  /**
   * Stores a model given as bytes (the demo seed, command-line imports) through the same checks
   * as an upload: size limit, format sniffed from content, duplicate detection, numbering.
   */
  async addFromBytes(
    manuscriptId: string,
    user: User,
    bytes: Uint8Array,
    filename: string,
    note: string,
  ): Promise<ModelVersionDto> {
    const safeName = sanitizeFilename(filename);
    let sniffed: SniffedFormat | null = null;
    const blob = await this.store.put(Readable.from([Buffer.from(bytes)]), {
      maxBytes: this.storage.uploadLimitBytes,
      inspectHead: (head) => (sniffed = sniffFormat(head, safeName)),
    });
    if (!sniffed) throw new BadRequestException('The model could not be read. Try again.');
    return this.createVersion(manuscriptId, user, { blob, sniffed, filename: safeName }, note);
  }

  private async createVersion(
    manuscriptId: string,
    user: User,
    parsed: Pick<ParsedUpload, 'blob' | 'sniffed' | 'filename'>,
    rawNote: string,
  ): Promise<ModelVersionDto> {
    const note = rawNote.trim();
    if (note.length > NOTE_MAX) {
      throw new BadRequestException(`Shorten the note to ${NOTE_MAX} characters or fewer.`);
    }
    const id = newId();
    await this.db.transaction(async (m) => {
      // Lock the manuscript row: two uploads at once still get consecutive numbers.
      await m
        .getRepository(Manuscript)
        .createQueryBuilder('ms')
        .setLock('pessimistic_write')
        .where('ms.id = :id', { id: manuscriptId })
        .getOne();
      const dup = await m.findOne(ModelVersion, {
        where: { manuscriptId, sha256: parsed.blob.sha256 },
        order: { n: 'ASC' },
      });
      if (dup) {
        throw new ConflictException({
          statusCode: 409,
          message: `This file is identical to version ${dup.n} (${dup.filename}); no new version was made. Upload the changed model, or add a comment to version ${dup.n}.`,
          duplicateOf: { id: dup.id, n: dup.n },
        });
      }
      const [{ next }] = (await m.query(
        'SELECT COALESCE(MAX(n), 0) + 1 AS next FROM model_versions WHERE manuscript_id = ?',
        [manuscriptId],
      )) as { next: number | string }[];
      await m.insert(ModelVersion, {
        id,
        manuscriptId,
        n: Number(next),
        sha256: parsed.blob.sha256,
        format: parsed.sniffed.format,
        gzip: parsed.sniffed.gzip,
        filename: parsed.filename,
        sizeBytes: parsed.blob.sizeBytes,
        note,
        uploadedBy: user.id,
      });
      await m.insert(Analysis, {
        modelVersionId: id,
        status: 'queued',
        progress: 0,
        attempts: 0,
        completions: 0,
        queuedAt: new Date(),
      });
      await m.update(Manuscript, { id: manuscriptId }, { lastActivityAt: new Date() });
    });
    try {
      await this.analyses.enqueue(id);
    } catch {
      // Redis down: the version is kept as queued and is enqueued when the service restarts.
    }
    const dto = await this.get(manuscriptId, id);
    this.created.emit('created', { manuscriptId, version: dto, uploader: user } as VersionCreated);
    return dto;
  }

  async list(manuscriptId: string): Promise<ModelVersionDto[]> {
    const versions = await this.db.getRepository(ModelVersion).find({
      where: { manuscriptId },
      order: { n: 'DESC' },
    });
    return this.toDtos(versions);
  }

  async get(manuscriptId: string, id: string): Promise<ModelVersionDto> {
    const v = await this.findVersion(manuscriptId, id);
    return (await this.toDtos([v]))[0];
  }

  async findVersion(manuscriptId: string, id: string): Promise<ModelVersion> {
    const v = await this.db.getRepository(ModelVersion).findOneBy({ manuscriptId, id });
    if (!v) {
      throw new NotFoundException(
        'This manuscript has no model version with that id. Reload the Models tab to see the current list.',
      );
    }
    return v;
  }

  /** The version numbered just before `n`, if any. */
  async previous(manuscriptId: string, n: number): Promise<ModelVersion | null> {
    return this.db
      .getRepository(ModelVersion)
      .createQueryBuilder('v')
      .where('v.manuscriptId = :manuscriptId AND v.n < :n', { manuscriptId, n })
      .orderBy('v.n', 'DESC')
      .getOne();
  }

  private async toDtos(versions: ModelVersion[]): Promise<ModelVersionDto[]> {
    if (versions.length === 0) return [];
    const ids = versions.map((v) => v.id);
    const analyses = await this.db
      .getRepository(Analysis)
      .createQueryBuilder('a')
      .where('a.modelVersionId IN (:...ids)', { ids })
      .getMany();
    const userIds = [...new Set(versions.map((v) => v.uploadedBy).filter((x): x is string => !!x))];
    const users: { id: string; display_name: string }[] = userIds.length
      ? await this.db.query(
          `SELECT id, display_name FROM users WHERE id IN (${userIds.map(() => '?').join(',')})`,
          userIds,
        )
      : [];
    return versions.map((v) => {
      const u = users.find((x) => x.id === v.uploadedBy);
      return {
        id: v.id,
        manuscriptId: v.manuscriptId,
        n: v.n,
        sha256: v.sha256,
        format: v.format,
        gzip: v.gzip,
        filename: v.filename,
        sizeBytes: v.sizeBytes,
        note: v.note,
        uploadedBy: u ? { id: u.id, displayName: u.display_name } : null,
        createdAt: v.createdAt.toISOString(),
        analysis: analysisDto(analyses.find((a) => a.modelVersionId === v.id) ?? null),
      };
    });
  }

  /** The stored bytes of a version (for downloads and the ledger). */
  readBytes(v: ModelVersion): Promise<Buffer> {
    return this.store.read(v.sha256);
  }
}
