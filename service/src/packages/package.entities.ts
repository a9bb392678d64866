import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';

export type PackageStatus = 'queued' | 'building' | 'done' | 'failed';

/** A frozen review package of a manuscript; the zip itself lives in the blob store. */
@Entity('review_packages')
export class ReviewPackage {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ name: 'manuscript_id', type: 'char', length: 36 })
  manuscriptId: string;

  @Column({ type: 'varchar', length: 16 })
  status: PackageStatus;

  @Column({ type: 'int' })
  progress: number;

  @Column({ type: 'varchar', length: 200, nullable: true })
  step: string | null;

  @Column({ type: 'text', nullable: true })
  error: string | null;

  /** JSON array of model version ids, in version order */
  @Column({ name: 'model_version_ids', type: 'text' })
  modelVersionIds: string;

  @Column({ name: 'include_model', type: 'boolean' })
  includeModel: boolean;

  @Column({ type: 'boolean' })
  anonymised: boolean;

  @Column({ name: 'zip_sha256', type: 'char', length: 64, nullable: true })
  zipSha256: string | null;

  @Column({
    name: 'size_bytes',
    type: 'bigint',
    nullable: true,
    transformer: {
      to: (v: number | null) => v,
      from: (v: string | number | null) => (v === null ? null : Number(v)),
    },
  })
  sizeBytes: number | null;

  /** the manifest.json text of the finished package (the reviewer page lists files from it) */
  @Column({ name: 'manifest_json', type: 'mediumtext', nullable: true, select: false })
  manifestJson: string | null;

  @Column({ name: 'created_by', type: 'char', length: 36, nullable: true })
  createdBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;

  @Column({ name: 'finished_at', type: 'datetime', precision: 3, nullable: true })
  finishedAt: Date | null;
}

/** A reviewer link to one package: `<id>.<secret>`; only the secret's SHA-256 is stored. */
@Entity('review_links')
export class ReviewLink {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ name: 'package_id', type: 'char', length: 36 })
  packageId: string;

  @Column({ name: 'manuscript_id', type: 'char', length: 36 })
  manuscriptId: string;

  @Column({ name: 'secret_hash', type: 'char', length: 64, select: false })
  secretHash: string;

  @Column({ type: 'varchar', length: 200 })
  label: string;

  @Column({ name: 'expires_at', type: 'datetime', precision: 3 })
  expiresAt: Date;

  @Column({ name: 'revoked_at', type: 'datetime', precision: 3, nullable: true })
  revokedAt: Date | null;

  @Column({ name: 'created_by', type: 'char', length: 36, nullable: true })
  createdBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}

export type AuditAction =
  | 'package-requested'
  | 'package-built'
  | 'package-failed'
  | 'package-downloaded'
  | 'link-created'
  | 'link-revoked'
  | 'reviewer-opened'
  | 'reviewer-file'
  | 'reviewer-downloaded'
  | 'refused-expired'
  | 'refused-revoked'
  | 'refused-wrong-secret'
  | 'refused-unknown-link';

/**
 * Who did what to a package or link. Refusals of a link id that does not exist have no
 * manuscript (nothing to attribute them to); they are still kept.
 */
@Entity('package_audit_events')
export class PackageAuditEvent {
  @PrimaryColumn({ type: 'char', length: 36 })
  id: string;

  @Column({ name: 'manuscript_id', type: 'char', length: 36, nullable: true })
  manuscriptId: string | null;

  @Column({ name: 'package_id', type: 'char', length: 36, nullable: true })
  packageId: string | null;

  @Column({ name: 'link_id', type: 'char', length: 36, nullable: true })
  linkId: string | null;

  @Column({ type: 'varchar', length: 32 })
  action: AuditAction;

  /** signed-in user, null for reviewers following a link */
  @Column({ name: 'user_id', type: 'char', length: 36, nullable: true })
  userId: string | null;

  @Column({ type: 'varchar', length: 300 })
  detail: string;

  @Column({ type: 'varchar', length: 64, nullable: true })
  ip: string | null;

  @Column({ name: 'user_agent', type: 'varchar', length: 300, nullable: true })
  userAgent: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'datetime', precision: 3 })
  createdAt: Date;
}
