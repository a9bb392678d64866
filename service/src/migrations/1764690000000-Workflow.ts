import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Model versions, their analyses, anchored comments and per-manuscript notification mutes. */
export class Workflow1764690000000 implements MigrationInterface {
  name = 'Workflow1764690000000';

  public async up(q: QueryRunner): Promise<void> {
    const opts = 'ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_unicode_ci';
    await q.query(`CREATE TABLE model_versions (
      id CHAR(36) NOT NULL PRIMARY KEY,
      manuscript_id CHAR(36) NOT NULL,
      n INT NOT NULL,
      sha256 CHAR(64) NOT NULL,
      format VARCHAR(8) NOT NULL,
      gzip TINYINT(1) NOT NULL,
      filename VARCHAR(200) NOT NULL,
      size_bytes BIGINT NOT NULL,
      note VARCHAR(2000) NOT NULL DEFAULT '',
      uploaded_by CHAR(36) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      UNIQUE KEY uq_model_version_n (manuscript_id, n),
      KEY ix_model_version_sha (manuscript_id, sha256),
      CONSTRAINT fk_model_version_manuscript FOREIGN KEY (manuscript_id) REFERENCES manuscripts (id) ON DELETE CASCADE,
      CONSTRAINT fk_model_version_user FOREIGN KEY (uploaded_by) REFERENCES users (id) ON DELETE SET NULL
    ) ${opts}`);
    await q.query(`CREATE TABLE analyses (
      model_version_id CHAR(36) NOT NULL PRIMARY KEY,
      status VARCHAR(16) NOT NULL,
      stage VARCHAR(16) NULL,
      progress INT NOT NULL DEFAULT 0,
      attempts INT NOT NULL DEFAULT 0,
      completions INT NOT NULL DEFAULT 0,
      error TEXT NULL,
      worker VARCHAR(120) NULL,
      engine_version VARCHAR(40) NULL,
      reference_id VARCHAR(80) NULL,
      queued_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      started_at DATETIME(3) NULL,
      finished_at DATETIME(3) NULL,
      atoms INT NULL,
      protein_residues INT NULL,
      rama_favored INT NULL,
      rama_allowed INT NULL,
      rama_outliers INT NULL,
      rama_total INT NULL,
      rotamer_outliers INT NULL,
      rotamer_total INT NULL,
      bond_rmsd DOUBLE NULL,
      bond_rmsz DOUBLE NULL,
      angle_rmsd DOUBLE NULL,
      angle_rmsz DOUBLE NULL,
      overlaps_per_1000 DOUBLE NULL,
      cis_peptides INT NULL,
      twisted_peptides INT NULL,
      cb_outliers INT NULL,
      d_residues INT NULL,
      report_sha256 CHAR(64) NULL,
      report_gz LONGBLOB NULL,
      CONSTRAINT fk_analysis_version FOREIGN KEY (model_version_id) REFERENCES model_versions (id) ON DELETE CASCADE
    ) ${opts}`);
    await q.query(`CREATE TABLE comments (
      id CHAR(36) NOT NULL PRIMARY KEY,
      manuscript_id CHAR(36) NOT NULL,
      thread_id CHAR(36) NULL,
      model_version_id CHAR(36) NULL,
      anchor_type VARCHAR(16) NOT NULL,
      anchor_key VARCHAR(200) NOT NULL,
      author_id CHAR(36) NULL,
      body_md TEXT NOT NULL,
      body_html TEXT NOT NULL,
      resolved_at DATETIME(3) NULL,
      resolved_by CHAR(36) NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      KEY ix_comment_anchor (manuscript_id, anchor_type, anchor_key),
      KEY ix_comment_thread (thread_id),
      CONSTRAINT fk_comment_manuscript FOREIGN KEY (manuscript_id) REFERENCES manuscripts (id) ON DELETE CASCADE,
      CONSTRAINT fk_comment_thread FOREIGN KEY (thread_id) REFERENCES comments (id) ON DELETE CASCADE,
      CONSTRAINT fk_comment_version FOREIGN KEY (model_version_id) REFERENCES model_versions (id) ON DELETE CASCADE,
      CONSTRAINT fk_comment_author FOREIGN KEY (author_id) REFERENCES users (id) ON DELETE SET NULL
    ) ${opts}`);
    await q.query(`CREATE TABLE notification_mutes (
      manuscript_id CHAR(36) NOT NULL,
      user_id CHAR(36) NOT NULL,
      created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
      PRIMARY KEY (manuscript_id, user_id),
      CONSTRAINT fk_mute_manuscript FOREIGN KEY (manuscript_id) REFERENCES manuscripts (id) ON DELETE CASCADE,
      CONSTRAINT fk_mute_user FOREIGN KEY (user_id) REFERENCES users (id) ON DELETE CASCADE
    ) ${opts}`);
  }

  public async down(q: QueryRunner): Promise<void> {
    await q.query('DROP TABLE notification_mutes');
    await q.query('DROP TABLE comments');
    await q.query('DROP TABLE analyses');
    await q.query('DROP TABLE model_versions');
  }
}
