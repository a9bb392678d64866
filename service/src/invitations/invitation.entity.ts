import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';
import type { MembershipRole } from '@foldfolio/shared';

/** An e-mailed invitation; only the SHA-256 of its token is stored. Single use, 7 days. */
@Entity('invitations')
export class Invitation {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ name: 'manuscript_id', type: 'char', length: 36 })
  manuscriptId: string;

  @Column({ type: 'varchar', length: 254 })
  email: string;

  @Column({ type: 'varchar', length: 16 })
  role: MembershipRole;

  @Column({ name: 'token_hash', type: 'char', length: 64 })
  tokenHash: string;

  @Column({ name: 'invited_by', type: 'char', length: 36, nullable: true })
  invitedBy: string | null;

  @Column({ name: 'expires_at', type: 'datetime', precision: 3 })
  expiresAt: Date;

  @Column({ name: 'accepted_at', type: 'datetime', precision: 3, nullable: true })
  acceptedAt: Date | null;

  @Column({ name: 'accepted_by', type: 'char', length: 36, nullable: true })
  acceptedBy: string | null;

  @Column({ name: 'revoked_at', type: 'datetime', precision: 3, nullable: true })
  revokedAt: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}
