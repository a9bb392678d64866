import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';
import type { ManuscriptStatus } from '@foldfolio/shared';

@Entity('manuscripts')
export class Manuscript {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ type: 'varchar', length: 300 })
  title: string;

  @Column({ type: 'varchar', length: 16 })
  status: ManuscriptStatus;

  @Column({ name: 'created_by', type: 'char', length: 36, nullable: true })
  createdBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;

  /** Updated by every change to the manuscript or its members; the Desk sorts by it. */
  @Column({ name: 'last_activity_at', type: 'datetime', precision: 3 })
  lastActivityAt: Date;
}
