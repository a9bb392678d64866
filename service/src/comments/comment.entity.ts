import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';
import type { CommentAnchorType } from '@foldfolio/shared';

/** A thread's first comment has threadId null; replies point at it. */
@Entity('comments')
export class Comment {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ name: 'manuscript_id', type: 'char', length: 36 })
  manuscriptId: string;

  @Column({ name: 'thread_id', type: 'char', length: 36, nullable: true })
  threadId: string | null;

  @Column({ name: 'model_version_id', type: 'char', length: 36, nullable: true })
  modelVersionId: string | null;

  @Column({ name: 'anchor_type', type: 'varchar', length: 16 })
  anchorType: CommentAnchorType;

  @Column({ name: 'anchor_key', type: 'varchar', length: 200 })
  anchorKey: string;

  @Column({ name: 'author_id', type: 'char', length: 36, nullable: true })
  authorId: string | null;

  @Column({ name: 'body_md', type: 'text' })
  bodyMd: string;

  @Column({ name: 'body_html', type: 'text' })
  bodyHtml: string;

  @Column({ name: 'resolved_at', type: 'datetime', precision: 3, nullable: true })
  resolvedAt: Date | null;

  @Column({ name: 'resolved_by', type: 'char', length: 36, nullable: true })
  resolvedBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}
