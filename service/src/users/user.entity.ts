import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';
import type { SiteRole, UserDto } from '@foldfolio/shared';

@Entity('users')
export class User {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  /** Stored lower-cased and trimmed; unique. */
  @Column({ type: 'varchar', length: 254 })
  email: string;

  @Column({ name: 'display_name', type: 'varchar', length: 100 })
  displayName: string;

  @Column({ name: 'password_hash', type: 'varchar', length: 100 })
  passwordHash: string;

  @Column({ name: 'site_role', type: 'varchar', length: 16 })
  siteRole: SiteRole;

  /** Bumped when the password changes: access tokens carrying an older value are refused. */
  @Column({ name: 'token_version', type: 'int' })
  tokenVersion: number;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}

export function toUserDto(u: User): UserDto {
  return {
    id: u.id,
    email: u.email,
    displayName: u.displayName,
    siteRole: u.siteRole,
    createdAt: u.createdAt.toISOString(),
  };
}
