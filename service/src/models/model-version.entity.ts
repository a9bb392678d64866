import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';
import type { InputFormat } from '@foldfolio/shared';

/** One uploaded model file of a manuscript. Immutable once written (no update path exists). */
@Entity('model_versions')
export class ModelVersion {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ name: 'manuscript_id', type: 'char', length: 36 })
  manuscriptId: string;

  /** 1, 2, 3… per manuscript */
  @Column({ type: 'int' })
  n: number;

  @Column({ type: 'char', length: 64 })
  sha256: string;

  @Column({ type: 'varchar', length: 8 })
  format: InputFormat;

  @Column({ type: 'boolean' })
  gzip: boolean;

  @Column({ type: 'varchar', length: 200 })
  filename: string;

  // BIGINT comes back from mysql2 as a string; the transformer keeps it a number (< 2^53).
  @Column({
    name: 'size_bytes',
    type: 'bigint',
    transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) },
  })
  sizeBytes: number;

  @Column({ type: 'varchar', length: 2000 })
  note: string;

  @Column({ name: 'uploaded_by', type: 'char', length: 36, nullable: true })
  uploadedBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}
