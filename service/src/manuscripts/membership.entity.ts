import { Column, CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import type { MembershipRole } from '@foldfolio/shared';
import { User } from '../users/user.entity.js';

@Entity('memberships')
export class Membership {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ name: 'manuscript_id', type: 'char', length: 36 })
  manuscriptId: string;

  @Column({ name: 'user_id', type: 'char', length: 36 })
  userId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user?: User;

  @Column({ type: 'varchar', length: 16 })
  role: MembershipRole;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}
