import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Review packages, reviewer links (hashed secrets) and their audit log. */
export class Packages1764700000000 implements MigrationInterface {
  name = 'Packages1764700000000';

  public async up(q: QueryRunner): Promise<void> {
    const opts = 'ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci';
    await q.query(`CREATE TABLE review_packages (
      id CHAR(36) NOT NULL PRIMARY KEY,
      manuscript_id CHAR(36) NOT NULL,
      status VARCHAR(16) NOT NULL,
      progress INT NOT NULL DEFAULT 0,
      step VARCHAR(200) NULL,
      error TEXT NULL,
      model_version_ids TEXT NOT NULL,
      include_model TINYINT(1) NOT NULL,
      anonymised TINYINT(1) NOT NULL,
      zip_sha256 CHAR(64) NULL,
      size_bytes BIGINT NULL,
      manifest_json MEDIUMTEXT NULL,
      created_by CHAR(36) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      finished_at DATETIME(3) NULL,
      KEY ix_review_package_manuscript (manuscript_id, created_at),
      CONSTRAINT fk_review_package_manuscript FOREIGN KEY (manuscript_id) REFERENCES manuscripts (id) ON DELETE CASCADE,
      CONSTRAINT fk_review_package_user FOREIGN KEY (created_by) REFERENCES users (id) ON DELETE SET NULL
    ) ${opts}`);
    await q.query(`CREATE TABLE review_links (
      id CHAR(36) NOT NULL PRIMARY KEY,
      package_id CHAR(36) NOT NULL,
      manuscript_id CHAR(36) NOT NULL,
      secret_hash CHAR(64) NOT NULL,
      label VARCHAR(200) NOT NULL DEFAULT '',
      expires_at DATETIME(3) NOT NULL,
      revoked_at DATETIME(3) NULL,
      created_by CHAR(36) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      KEY ix_review_link_package (package_id),
      CONSTRAINT fk_review_link_package FOREIGN KEY (package_id) REFERENCES review_packages (id) ON DELETE CASCADE,
      CONSTRAINT fk_review_link_manuscript FOREIGN KEY (manuscript_id) REFERENCES manuscripts (id) ON DELETE CASCADE,
      CONSTRAINT fk_review_link_user FOREIGN KEY (created_by) REFERENCES users (id) ON DELETE SET NULL
    ) ${opts}`);
    await q.query(`CREATE TABLE package_audit_events (
      id CHAR(36) NOT NULL PRIMARY KEY,
      manuscript_id CHAR(36) NULL,
      package_id CHAR(36) NULL,
      link_id CHAR(36) NULL,
      action VARCHAR(32) NOT NULL,
      user_id CHAR(36) NULL,
      detail VARCHAR(300) NOT NULL DEFAULT '',
      ip VARCHAR(64) NULL,
      user_agent VARCHAR(300) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      KEY ix_package_audit_manuscript (manuscript_id, created_at),
      CONSTRAINT fk_package_audit_manuscript FOREIGN KEY (manuscript_id) REFERENCES manuscripts (id) ON DELETE CASCADE
    ) ${opts}`);
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query('DROP TABLE package_audit_events');
    await q.query('DROP TABLE review_links');
    await q.query('DROP TABLE review_packages');
  }
}
