import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';

/**
 * One refresh token. Each refresh revokes the presented token and issues a new one in the same
 * family; presenting a revoked token again means it was stolen, so the whole family is revoked.
 */
@Entity('refresh_tokens')
export class RefreshToken {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ name: 'user_id', type: 'char', length: 36 })
  userId: string;

  @Column({ name: 'family_id', type: 'char', length: 36 })
  familyId: string;

  @Column({ name: 'token_hash', type: 'char', length: 64 })
  tokenHash: string;

  @Column({ name: 'expires_at', type: 'datetime', precision: 3 })
  expiresAt: Date;

  @Column({ name: 'revoked_at', type: 'datetime', precision: 3, nullable: true })
  revokedAt: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}
