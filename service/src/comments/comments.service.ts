import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { EventEmitter } from 'node:events';
import { DataSource } from 'typeorm';
import type { CommentAnchor, CommentDto, CommentThreadDto } from '@foldfolio/shared';
import { newId } from '../common/tokens.js';
import { Manuscript } from '../manuscripts/manuscript.entity.js';
import { ModelVersion } from '../models/model-version.entity.js';
import type { User } from '../users/user.entity.js';
import { Comment } from './comment.entity.js';
import type { AnchorDto, ListCommentsQuery } from './dto/comment.dto.js';
import { mentionTokens, renderMarkdown } from './markdown.js';

/** Emitted as 'mentioned' after a comment naming members is stored. */
export interface MentionEvent {
  manuscriptId: string;
  comment: CommentDto;
  author: User;
  mentionedUserIds: string[];
}

// Roles that can read comments: reviewers never see the team's discussion.
const READERS = ['owner', 'editor', 'commenter'];

interface MemberRow {
  user_id: string;
  email: string;
  display_name: string;
}

@Injectable()
export class CommentsService {
  readonly events = new EventEmitter();

  constructor(@InjectDataSource() private readonly db: DataSource) {}

  /** Checks the anchor and returns its stable key and the version it belongs to. */
  private async anchorKey(
    manuscriptId: string,
    a: AnchorDto,
  ): Promise<{ key: string; versionId: string | null }> {
    const need = (ok: boolean, what: string) => {
      if (!ok) throw new BadRequestException(`A ${a.type} comment needs ${what}.`);
    };
    let versionId: string | null = null;
    if (a.modelVersionId) {
      const v = await this.db
        .getRepository(ModelVersion)
        .findOneBy({ id: a.modelVersionId, manuscriptId });
      if (!v) {
        throw new NotFoundException(
          'This manuscript has no model version with that id. Reload the page and try again.',
        );
      }
      versionId = v.id;
    }
    switch (a.type) {
      case 'version':
        need(!!versionId, 'modelVersionId');
        return { key: `version:${versionId}`, versionId };
      case 'residue':
        need(!!versionId && !!a.chain && a.seq !== undefined, 'modelVersionId, chain and seq');
        return { key: `residue:${versionId}:${a.chain}:${a.seq}:${a.icode ?? ''}`, versionId };
      case 'figure':
        need(!!a.figureId, 'figureId');
        return { key: `figure:${a.figureId}`, versionId };
      case 'table-cell':
        need(!!a.tableId && !!a.row && !!a.column, 'tableId, row and column');
        return { key: `table-cell:${a.tableId}:${a.row}:${a.column}`, versionId };
    }
  }

  private async members(manuscriptId: string): Promise<MemberRow[]> {
    return this.db.query(
      `SELECT m.user_id, u.email, u.display_name FROM memberships m JOIN users u ON u.id = m.user_id
       WHERE m.manuscript_id = ? AND m.role IN (${READERS.map(() => '?').join(',')})`,
      [manuscriptId, ...READERS],
    );
  }

  /**
   * Members a comment names: `@` + the part of their e-mail address before the `@`, or their
   * display name without spaces (case-insensitive). Reviewers cannot be mentioned.
   */
  private async resolveMentions(manuscriptId: string, md: string): Promise<MemberRow[]> {
    const tokens = mentionTokens(md);
    if (tokens.length === 0) return [];
    const members = await this.members(manuscriptId);
    return members.filter((m) => {
      const local = m.email.split('@')[0].toLowerCase();
      const compact = m.display_name.replace(/\s+/g, '').toLowerCase();
      return tokens.includes(local) || tokens.includes(compact);
    });
  }

  async create(
    manuscriptId: string,
    author: User,
    anchor: AnchorDto,
    body: string,
  ): Promise<CommentThreadDto> {
    const { key, versionId } = await this.anchorKey(manuscriptId, anchor);
    const id = await this.insert(manuscriptId, author, null, anchor.type, key, versionId, body);
    return this.thread(manuscriptId, id);
  }

  async reply(
    manuscriptId: string,
    author: User,
    threadId: string,
    body: string,
  ): Promise<CommentThreadDto> {
    const root = await this.findRoot(manuscriptId, threadId);
    await this.insert(
      manuscriptId,
      author,
      root.id,
      root.anchorType,
      root.anchorKey,
      root.modelVersionId,
      body,
    );
    // a reply reopens nothing by itself; resolving stays an explicit act
    return this.thread(manuscriptId, root.id);
  }

  private async insert(
    manuscriptId: string,
    author: User,
    threadId: string | null,
    anchorType: Comment['anchorType'],
    anchorKey: string,
    versionId: string | null,
    body: string,
  ): Promise<string> {
    const id = newId();
    const mentioned = await this.resolveMentions(manuscriptId, body);
    await this.db.transaction(async (m) => {
      await m.insert(Comment, {
        id,
        manuscriptId,
        threadId,
        modelVersionId: versionId,
        anchorType,
        anchorKey,
        authorId: author.id,
        bodyMd: body,
        bodyHtml: renderMarkdown(body),
        resolvedAt: null,
        resolvedBy: null,
      });
      await m.update(Manuscript, { id: manuscriptId }, { lastActivityAt: new Date() });
    });
    const others = mentioned.filter((x) => x.user_id !== author.id).map((x) => x.user_id);
    if (others.length > 0) {
      const stored = await this.db.getRepository(Comment).findOneByOrFail({ id });
      const dto = (await this.toDtos([stored]))[0];
      this.events.emit('mentioned', {
        manuscriptId,
        comment: dto,
        author,
        mentionedUserIds: others,
      } as MentionEvent);
    }
    return id;
  }

  private async findRoot(manuscriptId: string, id: string): Promise<Comment> {
    const c = await this.db.getRepository(Comment).findOneBy({ id, manuscriptId });
    if (!c) {
      throw new NotFoundException(
        'This comment does not exist on this manuscript. Reload the discussion.',
      );
    }
    if (c.threadId) return this.findRoot(manuscriptId, c.threadId);
    return c;
  }

  async setResolved(
    manuscriptId: string,
    user: User,
    id: string,
    resolved: boolean,
  ): Promise<CommentThreadDto> {
    const root = await this.findRoot(manuscriptId, id);
    await this.db
      .getRepository(Comment)
      .update(
        { id: root.id },
        resolved
          ? { resolvedAt: new Date(), resolvedBy: user.id }
          : { resolvedAt: null, resolvedBy: null },
      );
    return this.thread(manuscriptId, root.id);
  }

  async thread(manuscriptId: string, rootId: string): Promise<CommentThreadDto> {
    const root = await this.findRoot(manuscriptId, rootId);
    const replies = await this.db.getRepository(Comment).find({
      where: { threadId: root.id },
      order: { createdAt: 'ASC', id: 'ASC' },
    });
    const [r, ...rs] = await this.toDtos([root, ...replies]);
    return { ...r, replies: rs };
  }

  async list(manuscriptId: string, q: ListCommentsQuery): Promise<CommentThreadDto[]> {
    const qb = this.db
      .getRepository(Comment)
      .createQueryBuilder('c')
      .where('c.manuscriptId = :manuscriptId AND c.threadId IS NULL', { manuscriptId });
    if (q.modelVersionId) qb.andWhere('c.modelVersionId = :v', { v: q.modelVersionId });
    if (q.anchorKey) qb.andWhere('c.anchorKey = :k', { k: q.anchorKey });
    if (q.status === 'open' || q.status === undefined) qb.andWhere('c.resolvedAt IS NULL');
    else if (q.status === 'resolved') qb.andWhere('c.resolvedAt IS NOT NULL');
    const roots = await qb
      .orderBy('c.createdAt', 'DESC')
      .addOrderBy('c.id', 'ASC')
      .limit(500)
      .getMany();
    if (roots.length === 0) return [];
    const replies = await this.db
      .getRepository(Comment)
      .createQueryBuilder('c')
      .where('c.threadId IN (:...ids)', { ids: roots.map((r) => r.id) })
      .orderBy('c.createdAt', 'ASC')
      .addOrderBy('c.id', 'ASC')
      .getMany();
    const dtos = await this.toDtos([...roots, ...replies]);
    const byId = new Map(dtos.map((d) => [d.id, d]));
    return roots.map((r) => ({
      ...byId.get(r.id)!,
      replies: replies.filter((x) => x.threadId === r.id).map((x) => byId.get(x.id)!),
    }));
  }

  /** Open thread counts per anchor key of one version (the residue table marks them). */
  async openCounts(manuscriptId: string, versionId: string): Promise<Record<string, number>> {
    const rows: { anchor_key: string; n: number | string }[] = await this.db.query(
      `SELECT anchor_key, COUNT(*) AS n FROM comments WHERE manuscript_id = ? AND model_version_id = ?
       AND thread_id IS NULL AND resolved_at IS NULL GROUP BY anchor_key`,
      [manuscriptId, versionId],
    );
    return Object.fromEntries(rows.map((r) => [r.anchor_key, Number(r.n)]));
  }

  private async toDtos(rows: Comment[]): Promise<CommentDto[]> {
    const ids = [...new Set(rows.map((r) => r.authorId).filter((x): x is string => !!x))];
    const users: { id: string; display_name: string; email: string }[] = ids.length
      ? await this.db.query(
          `SELECT id, display_name, email FROM users WHERE id IN (${ids.map(() => '?').join(',')})`,
          ids,
        )
      : [];
    const manuscriptIds = [...new Set(rows.map((r) => r.manuscriptId))];
    const members = manuscriptIds.length === 1 ? await this.members(manuscriptIds[0]) : [];
    return rows.map((c) => {
      const u = users.find((x) => x.id === c.authorId);
      const tokens = mentionTokens(c.bodyMd);
      const mentions = members
        .filter(
          (m) =>
            tokens.includes(m.email.split('@')[0].toLowerCase()) ||
            tokens.includes(m.display_name.replace(/\s+/g, '').toLowerCase()),
        )
        .map((m) => m.display_name);
      return {
        id: c.id,
        threadId: c.threadId,
        anchor: anchorFromKey(c.anchorKey),
        anchorKey: c.anchorKey,
        author: u ? { id: u.id, displayName: u.display_name } : null,
        bodyMarkdown: c.bodyMd,
        bodyHtml: c.bodyHtml,
        mentions,
        resolvedAt: c.resolvedAt?.toISOString() ?? null,
        createdAt: c.createdAt.toISOString(),
      };
    });
  }
}

/** The anchor described by a stored key (the inverse of anchorKey). */
export function anchorFromKey(key: string): CommentAnchor {
  const [type, ...rest] = key.split(':');
  switch (type) {
    case 'version':
      return { type: 'version', modelVersionId: rest[0] };
    case 'residue':
      return {
        type: 'residue',
        modelVersionId: rest[0],
        chain: rest[1],
        seq: Number(rest[2]),
        icode: rest[3] ?? '',
      };
    case 'figure':
      return { type: 'figure', figureId: rest.join(':') };
    default:
      return {
        type: 'table-cell',
        tableId: rest[0],
        row: rest[1],
        column: rest.slice(2).join(':'),
      };
  }
}
